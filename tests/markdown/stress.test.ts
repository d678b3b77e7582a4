// Bodies that stress the comment parser: deep quotes and lists (which exhausted the parser's
// stack), emphasis runs, link brackets, backtick runs. Each renders to sanitised text or is
// refused at input; none throws.
import { describe, expect, it } from "vitest";
import { STRESS_CORPUS } from "./corpus";
import { MAX_COMMENT_LENGTH, MAX_NESTING, nestingDepth, nestingProblem, renderComment, renderMarkdown, UNRENDERABLE } from "@/lib/markdown";

describe("comment parser under stress", () => {
  it.each(Object.entries(STRESS_CORPUS))("%s renders without throwing", (_name, body) => {
    const html = renderMarkdown(body);
    expect(typeof html).toBe("string");
    expect(html).not.toMatch(/<(script|iframe|img|style)/i);
    expect(renderComment(body).renderError).toBeNull();
  });

  it("every corpus body within the size limit is either refused for its nesting or renders as Markdown", () => {
    for (const [name, body] of Object.entries(STRESS_CORPUS)) {
      if (body.length > MAX_COMMENT_LENGTH) continue;
      const problem = nestingProblem(body);
      if (problem) expect(problem, name).toMatch(/nested more than 16 levels/);
    }
    expect(nestingProblem(STRESS_CORPUS["2 000 nested quotes"])).not.toBeNull();
    expect(nestingProblem(STRESS_CORPUS["2 000 nested bullet lists"])).not.toBeNull();
    expect(nestingProblem(STRESS_CORPUS["emphasis run *_"])).toBeNull();
  });

  it("deep nesting stored before the limit is shown as escaped plain text", () => {
    const html = renderMarkdown("> ".repeat(2000) + "<b>x</b>\nsecond line");
    expect(html.startsWith("<p>&gt; &gt; ")).toBe(true);
    expect(html).toContain("&lt;b&gt;x&lt;/b&gt;<br />second line");
    expect(html).not.toContain("<blockquote>");
  });

  it("counts nesting per line, outside fenced code, and allows the limit itself", () => {
    expect(nestingDepth("> > - 1. item")).toBe(4);
    expect(nestingDepth("plain\n> quote\n>> two")).toBe(2);
    expect(nestingDepth("```\n" + "> ".repeat(100) + "\n```\n> one")).toBe(1);
    expect(nestingDepth("-not a list, > not a quote")).toBe(0);
    expect(nestingProblem("> ".repeat(MAX_NESTING) + "x")).toBeNull();
    expect(nestingProblem("> ".repeat(MAX_NESTING + 1) + "x")).not.toBeNull();
    // Ordinary nesting still renders as Markdown.
    expect(renderMarkdown("> quoted\n> > twice")).toContain("<blockquote>");
  });

  it("a body the renderer fails on becomes 'could not be displayed' instead of an error", () => {
    const failing = () => {
      throw new RangeError("Maximum call stack size exceeded");
    };
    expect(renderComment("anything", {}, failing)).toEqual({ html: "", renderError: UNRENDERABLE });
  });
});
