// Comment bodies that stress a Markdown parser (shared by the unit and API tests).

/** Parser-stressing bodies, each within the 5 000-character limit unless named otherwise. */
export const STRESS_CORPUS: Record<string, string> = {
  "2 000 nested quotes": "> ".repeat(2000) + "x",
  "4 000 quote markers without spaces": ">".repeat(4000) + "x",
  "2 000 nested bullet lists": "- ".repeat(2000) + "x",
  "1 300 nested numbered lists": "1. ".repeat(1300) + "x",
  "quotes inside lists, 1 000 levels": "> - ".repeat(1000) + "x",
  "70 lines of indented lists": Array.from({ length: 70 }, (_, i) => " ".repeat(i * 2) + "- a").join("\n"),
  "growing quote depth over 1 000 lines": Array.from({ length: 1000 }, (_, i) => ">".repeat(i % 50) + " a").join("\n").slice(0, 5000),
  "emphasis run *_": "*_".repeat(2000) + "x" + "_*".repeat(500),
  "2 500 strong markers": "**".repeat(2500),
  "4 900 open link brackets": "[".repeat(4900) + "x](y)",
  "1 600 empty links": "[](".repeat(1600),
  "2 500 image brackets": "![".repeat(2500),
  "5 000 tildes": "~".repeat(5000),
  "backtick pairs": "` ".repeat(2500),
  "code span runs": "``a`".repeat(1250),
  "1 600 raw tags": "<a>".repeat(1600),
  "5 000 angle brackets": "<".repeat(5000),
  "a 2 500-column table": "|a".repeat(1250) + "\n" + "|-".repeat(1250),
  "2 500 setext underlines": "a\n" + "=\n".repeat(2499),
  "entity starts": "&#".repeat(2500),
  "50 000 backticks (beyond the limit)": "`".repeat(50_000),
};
