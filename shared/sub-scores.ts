/**
 * The ranking's sub-scores, one row each: key, label, chart colour, default weight and what it
 * measures. This table is the only list of them. The ranking weights schema, the requirement-set
 * editor, the ranking panel and its chart, the exports, the share view and the export route's
 * `weights` query all read it; the computation of each row is the rule under the same key in
 * `lib/analysis/sub-scores.ts` (the type checker asks for one per row).
 *
 * Adding a sub-score: one row here plus its rule (docs/design.md#ranking). Extension point:
 * {@link defineSubScores} builds a table from rows, so a test can build an extended one.
 */

/** One sub-score as people see it. */
interface SubScoreRow {
  /** Stable key: the field name under `weights` in requirement-set files, and in results. */
  readonly key: string;
  /** Name on the page, in the editor and in export column headers. */
  readonly label: string;
  /** Chart colour (a muted palette; every segment is also labelled in the table and legend). */
  readonly colour: string;
  /** Weight of a new requirement set (≥ 0, any scale). */
  readonly defaultWeight: number;
  /** What the 0–1 value measures, one line (editor hint and documentation). */
  readonly measures: string;
}

/** The rows, in display order. */
export const SUB_SCORE_ROWS = [
  { key: "coverage", label: "Target coverage", colour: "#2f5d8a", defaultWeight: 4, measures: "reached targets / targets" },
  { key: "dexterity", label: "Worst dexterity margin", colour: "#6b8fb3", defaultWeight: 2, measures: "smallest dexterity margin over the reached targets and path samples" },
  { key: "payload", label: "Payload margin", colour: "#8a6d2f", defaultWeight: 1, measures: "1 − load / holdable load at the worst reached target" },
  { key: "force", label: "Force margin", colour: "#c2a36b", defaultWeight: 1, measures: "1 − 1 / (force capability ÷ required force) at the worst target" },
  { key: "pathSpeed", label: "Path speed", colour: "#4f7a5a", defaultWeight: 1, measures: "achievable fraction of the required tool speed on the worst path" },
  { key: "clearance", label: "Clearance", colour: "#7d6a8f", defaultWeight: 1, measures: "smallest clearance over the reached targets and followed paths ÷ twice the required clearance (at least 20 mm)" },
  { key: "cycleTime", label: "Cycle time", colour: "#a8705f", defaultWeight: 1, measures: "1 − cycle time ÷ twice the required time, on the worst sequence with a required time (½ at the required time)" },
  { key: "price", label: "Price", colour: "#9aa5b1", defaultWeight: 1, measures: "cheapest candidate's price / this arm's price (same currency)" },
] as const satisfies readonly SubScoreRow[];

export type SubScoreKey = (typeof SUB_SCORE_ROWS)[number]["key"];

/** A table of sub-scores and the look-ups everything else needs. */
interface SubScoreTable<K extends string = string> {
  readonly rows: readonly (SubScoreRow & { readonly key: K })[];
  /** Keys in display order. */
  readonly keys: readonly K[];
  readonly label: Readonly<Record<K, string>>;
  readonly colour: Readonly<Record<K, string>>;
  readonly defaultWeights: Readonly<Record<K, number>>;
  readonly measures: Readonly<Record<K, string>>;
}

/** Builds a table from rows (keys must be unique and non-empty, weights ≥ 0, colours #rrggbb). */
export function defineSubScores<K extends string>(rows: readonly (SubScoreRow & { readonly key: K })[]): SubScoreTable<K> {
  const seen = new Set<string>();
  for (const r of rows) {
    if (!/^[a-z][A-Za-z0-9]*$/.test(r.key)) throw new Error(`sub-score key ${JSON.stringify(r.key)}: use a camelCase word`);
    if (seen.has(r.key)) throw new Error(`sub-score key ${r.key} appears twice`);
    seen.add(r.key);
    if (!(Number.isFinite(r.defaultWeight) && r.defaultWeight >= 0)) throw new Error(`sub-score ${r.key}: default weight ${r.defaultWeight} must be ≥ 0`);
    if (!/^#[0-9a-f]{6}$/i.test(r.colour)) throw new Error(`sub-score ${r.key}: colour ${r.colour} must be #rrggbb`);
  }
  const by = <V>(f: (r: SubScoreRow) => V) => Object.freeze(Object.fromEntries(rows.map((r) => [r.key, f(r)]))) as Readonly<Record<K, V>>;
  return Object.freeze({
    rows: Object.freeze([...rows]),
    keys: Object.freeze(rows.map((r) => r.key)),
    label: by((r) => r.label),
    colour: by((r) => r.colour),
    defaultWeights: by((r) => r.defaultWeight),
    measures: by((r) => r.measures),
  });
}

/** The product's sub-scores. */
export const SUB_SCORES: SubScoreTable<SubScoreKey> = defineSubScores(SUB_SCORE_ROWS);
