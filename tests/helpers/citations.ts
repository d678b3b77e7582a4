/**
 * The citation rules of the repository (DEVELOPERS.md, "Citations"), as a checker the tooling test
 * runs over every source, test, script and document:
 *
 * - `docs/<name>.md` or `docs/<name>.md#<anchor>` written anywhere must name a file under docs/
 *   and, with an anchor, a heading of that file;
 * - inside docs/, Markdown links `[text](<file>.md#<anchor>)`, `[text](#<anchor>)` and links to
 *   other repository files must resolve the same way (examples in code spans are not links);
 * - a document named in upper case (like DEVELOPERS.md) must exist in the repository (the root or
 *   the folder it is written in), so no comment cites a document that is not there;
 * - no citation of a rule book by a bare upper-case name and no absolute path outside the
 *   repository.
 *
 * Anchors follow GitHub's rule for headings: lower case; everything except letters, digits,
 * spaces, hyphens and underscores removed; each space becomes a hyphen.
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

/** The anchor of a Markdown heading's text. */
export function headingAnchor(text: string): string {
  const plain = text.replace(/`([^`]*)`/g, "$1").replace(/\[([^\]]*)\]\([^)]*\)/g, "$1").trim().toLowerCase();
  return plain.replace(/[^\p{L}\p{N}\s_-]/gu, "").replace(/\s/g, "-");
}

/** The anchors of a Markdown text's headings (outside fenced code blocks). */
export function anchorsOf(markdown: string): string[] {
  const out: string[] = [];
  let fenced = false;
  for (const line of markdown.split("\n")) {
    if (/^\s*```/.test(line)) fenced = !fenced;
    if (fenced) continue;
    const m = /^(#{1,6})\s+(.+?)\s*#*\s*$/.exec(line);
    if (m) out.push(headingAnchor(m[2]));
  }
  return out;
}

export interface SourceFile {
  /** Path relative to the repository root, with forward slashes. */
  path: string;
  text: string;
}

export interface CitationProblem {
  file: string;
  line: number;
  citation: string;
  problem: string;
}

/** Where a text position is (1-based line). */
const lineOf = (text: string, index: number) => text.slice(0, index).split("\n").length;

/**
 * Checks the citations of `files` against the documents they can see: `exists(p)` says whether a
 * repository path exists, `docs` maps each docs/*.md path to its text.
 */
export function checkCitations(files: readonly SourceFile[], exists: (repoPath: string) => boolean, docs: ReadonlyMap<string, string>): CitationProblem[] {
  const problems: CitationProblem[] = [];
  const anchors = new Map([...docs].map(([p, text]) => [p, new Set(anchorsOf(text))]));
  const checkTarget = (file: SourceFile, index: number, citation: string, target: string, anchor: string | undefined) => {
    const line = lineOf(file.text, index);
    if (target.endsWith(".md") && target.startsWith("docs/")) {
      const set = anchors.get(target);
      if (!set) return problems.push({ file: file.path, line, citation, problem: `${target} does not exist` });
      if (anchor !== undefined && !set.has(anchor)) return problems.push({ file: file.path, line, citation, problem: `${target} has no heading with the anchor #${anchor}` });
      return;
    }
    if (!exists(target)) problems.push({ file: file.path, line, citation, problem: `${target} does not exist` });
  };

  for (const file of files) {
    // 1. docs/… citations anywhere.
    for (const m of file.text.matchAll(/(?<![\w./-])docs\/([\w./-]+?\.md)(?:#([\w-]+))?/g)) {
      checkTarget(file, m.index, m[0], `docs/${m[1]}`, m[2]);
    }
    // 2. Relative Markdown links inside docs/.
    if (file.path.startsWith("docs/") && file.path.endsWith(".md")) {
      // Examples in code spans and fenced blocks are not links (blanked, keeping positions).
      const prose = file.text.replace(/```[\s\S]*?```|`[^`\n]*`/g, (c) => c.replace(/[^\n]/g, " "));
      for (const m of prose.matchAll(/\]\(([^)\s]*)\)/g)) {
        const link = m[1];
        if (/^[a-z]+:/i.test(link) || link === "") continue;
        const [rel, anchor] = link.split("#");
        const target = rel === "" ? file.path : path.posix.normalize(path.posix.join(path.posix.dirname(file.path), rel));
        if (target.startsWith("../")) { problems.push({ file: file.path, line: lineOf(file.text, m.index), citation: link, problem: "points outside the repository" }); continue; }
        checkTarget(file, m.index, link, target, anchor);
      }
    }
    // 3. Upper-case document names must exist (root or the citing file's folder).
    for (const m of file.text.matchAll(/(?<![\w/.-])([A-Z][A-Z0-9_-]*\.md)\b/g)) {
      const dir = path.posix.dirname(file.path);
      if (!exists(m[1]) && !exists(path.posix.join(dir, m[1]))) {
        problems.push({ file: file.path, line: lineOf(file.text, m.index), citation: m[1], problem: "cites a document that is not in the repository" });
      }
    }
    // 4. Rule books by bare name, and absolute paths outside the repository.
    for (const m of file.text.matchAll(/\bRULES\b|(?<![\w.])\/work\/[\w./-]+/g)) {
      problems.push({ file: file.path, line: lineOf(file.text, m.index), citation: m[0], problem: "cites something outside the repository; cite docs/<file>.md#<section>" });
    }
  }
  return problems;
}

/** Folders and files of the repository whose text is checked (generated code and fixtures left out). */
const SCANNED = ["app", "components", "lib", "shared", "cli", "scripts", "bench", "seed-data", "tests", "docs", "prisma", ".ci"];
const ROOT_FILES = ["README.md", "DEVELOPERS.md", "package.json", "eslint.config.mjs", "vitest.config.mts", "next.config.mjs", "prisma.config.ts"];
const SKIPPED = [/^lib\/db\/generated(-pg)?\//, /^dist\//, /^tests\/reference\/fixtures\//, /(^|\/)node_modules\//, /\.(png|jpe?g|gif|ico|db|sqlite|xlsx|pdf|woff2?)$/i];

/** Every checked file of the repository at `root`, with its text. */
export function repositoryFiles(root: string): SourceFile[] {
  const out: SourceFile[] = [];
  const walk = (rel: string) => {
    const abs = path.join(root, rel);
    if (!existsSync(abs) || SKIPPED.some((re) => re.test(rel))) return;
    const st = statSync(abs);
    if (st.isDirectory()) {
      for (const entry of readdirSync(abs).sort()) walk(rel ? `${rel}/${entry}` : entry);
      return;
    }
    if (st.size > 2_000_000) return;
    out.push({ path: rel, text: readFileSync(abs, "utf8") });
  };
  for (const dir of SCANNED) walk(dir);
  for (const f of ROOT_FILES) walk(f);
  return out;
}

/** The docs/*.md files of the repository at `root`. */
export function docsOf(root: string): Map<string, string> {
  const dir = path.join(root, "docs");
  const out = new Map<string, string>();
  if (!existsSync(dir)) return out;
  for (const entry of readdirSync(dir).sort()) if (entry.endsWith(".md")) out.set(`docs/${entry}`, readFileSync(path.join(dir, entry), "utf8"));
  return out;
}
