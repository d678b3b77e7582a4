// Every citation in code, tests, scripts and documents points at a document and a section that
// exist in this repository (the rules are in tests/helpers/citations.ts and DEVELOPERS.md,
// "Citations"). The first tests show the checker fails on the mistakes it is meant to catch.
import { existsSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { anchorsOf, checkCitations, docsOf, headingAnchor, repositoryFiles } from "../helpers/citations";

const ROOT = path.resolve(__dirname, "..", "..");
// Written in pieces so that this file does not itself hold the citations it tests.
const D = "docs/";
const docs = new Map([
  [`${D}design.md`, "# Design\n\n## Frames and conventions\n\n### Jacobians\n\n```\n## not a heading\n```\n"],
  [`${D}references.md`, "# References\n\n## Yoshikawa, IJRR 1985 (manipulability)\n\nSee [frames](design.md#frames-and-conventions) and [here](#references).\n"],
]);
const exists = (p: string) => ["README.md", "lib/analysis/statics.ts"].includes(p) || docs.has(p);
const check = (text: string, file = "lib/x.ts") => checkCitations([{ path: file, text }], exists, docs);

describe("the citation checker", () => {
  it("derives GitHub-style anchors from headings, skipping fenced code", () => {
    expect(headingAnchor("Yoshikawa, IJRR 1985 (manipulability)")).toBe("yoshikawa-ijrr-1985-manipulability");
    expect(headingAnchor("`fk` and ISO/TS 15066")).toBe("fk-and-isots-15066");
    expect(anchorsOf(docs.get(`${D}design.md`)!)).toEqual(["design", "frames-and-conventions", "jacobians"]);
  });

  it("accepts citations of existing documents and sections", () => {
    expect(check(`// see ${D}design.md#jacobians and ${D}references.md`)).toEqual([]);
    expect(checkCitations([{ path: `${D}references.md`, text: docs.get(`${D}references.md`)! }], exists, docs)).toEqual([]);
  });

  it("fails on a missing document, a missing section and a broken link inside docs", () => {
    expect(check(`// ${D}missing.md#x`).map((p) => p.problem)).toEqual([`${D}missing.md does not exist`]);
    expect(check(`/* ${D}design.md#no-such-section */`).map((p) => p.problem)).toEqual([`${D}design.md has no heading with the anchor #no-such-section`]);
    const broken = checkCitations([{ path: `${D}design.md`, text: "[a](references.md#nope) [b](../../outside.md) [c](../lib/nothere.ts)" }], exists, docs);
    expect(broken.map((p) => p.problem)).toEqual([`${D}references.md has no heading with the anchor #nope`, "points outside the repository", "lib/nothere.ts does not exist"]);
    expect(checkCitations([{ path: `${D}design.md`, text: "an example: `[t](#nowhere)`" }], exists, docs)).toEqual([]);
    const inRepo = checkCitations([{ path: `${D}design.md`, text: "[code](../lib/analysis/statics.ts) [gone](../lib/gone.ts)" }], exists, docs);
    expect(inRepo.map((p) => p.citation)).toEqual(["../lib/gone.ts"]);
  });

  it("fails on upper-case documents that are not in the repository, bare rule-book names and outside paths", () => {
    const upper = "NOT-HERE" + ".md";
    expect(check(`// as ${upper} says`).map((p) => p.citation)).toEqual([upper]);
    expect(check("// README.md is fine")).toEqual([]);
    expect(check(`// per the ${"RU" + "LES"}`)).toHaveLength(1);
    expect(check(`// see ${"/wo" + "rk/"}somewhere/file.md`)).toHaveLength(1);
    expect(check("// SUB_SCORE_RULES is a name, not a citation")).toEqual([]);
  });
});

describe("the repository", () => {
  const files = repositoryFiles(ROOT);
  const repoDocs = docsOf(ROOT);

  it("has its design documents", () => {
    for (const f of ["design.md", "formats.md", "cli.md", "references.md", "README.md"]) expect(repoDocs.has(`${D}${f}`), f).toBe(true);
    // Every document is listed in the docs index.
    const index = repoDocs.get(`${D}README.md`)!;
    for (const p of repoDocs.keys()) if (p !== `${D}README.md`) expect(index, p).toContain(`(${path.posix.basename(p)})`);
    expect(files.length).toBeGreaterThan(200);
  });

  it("has no duplicate section headings within a document (anchors must be unambiguous)", () => {
    for (const [p, text] of repoDocs) {
      const anchors = anchorsOf(text);
      const dupes = anchors.filter((a, i) => anchors.indexOf(a) !== i);
      expect(dupes, p).toEqual([]);
    }
  });

  it("cites only documents and sections that exist", () => {
    const problems = checkCitations(files, (p) => existsSync(path.join(ROOT, p)), repoDocs);
    expect(problems.map((p) => `${p.file}:${p.line}: ${p.citation}: ${p.problem}`)).toEqual([]);
  });
});
