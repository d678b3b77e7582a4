/**
 * Shared command-line helpers: option parsing, reading and validating JSON files (arms with the
 * shared armSchema), and the one error type every command throws for bad input. Any `CliError`
 * ends the program with exit status 2 and one stderr line naming the field and the reason.
 */
import { readFileSync } from "node:fs";
import type { z } from "zod";
import { armSchema, mat4, toFieldErrors, type ArmDocument } from "@/shared/schemas";

/** Bad input: `field` names the option, file or JSON path at fault. */
export class CliError extends Error {
  constructor(
    readonly field: string,
    reason: string,
  ) {
    super(`${field}: ${reason}`);
    this.name = "CliError";
  }
}

/** What a command prints: an object (printed as one line of JSON) or ready text (printed as is). */
type CliOutput = Record<string, unknown> | string;

/** One entry of the dispatch table in cli/armsift.ts. */
export interface CliCommand {
  /** One-line usage shown by `help`. */
  usage: string;
  run(argv: readonly string[]): CliOutput | Promise<CliOutput>;
}

export type ParsedOptions = Map<string, string>;

/**
 * Parses `--name value` and `--name=value` pairs. `allowed` lists the option names (without
 * dashes); anything else, a missing value or a repeated option is a CliError.
 */
export function parseOptions(argv: readonly string[], allowed: readonly string[]): ParsedOptions {
  const out: ParsedOptions = new Map();
  for (let i = 0; i < argv.length; i++) {
    const token = argv[i];
    if (!token.startsWith("--")) throw new CliError(token, "unexpected argument (options look like --name value)");
    let name = token.slice(2);
    let value: string | undefined;
    const eq = name.indexOf("=");
    if (eq >= 0) {
      value = name.slice(eq + 1);
      name = name.slice(0, eq);
    } else {
      value = argv[i + 1];
      if (value === undefined || (value.startsWith("--") && !/^--?\d/.test(value))) throw new CliError(`--${name}`, "needs a value");
      i++;
    }
    if (!allowed.includes(name)) throw new CliError(`--${name}`, `unknown option (allowed: ${allowed.map((a) => `--${a}`).join(", ")})`);
    if (out.has(name)) throw new CliError(`--${name}`, "given twice");
    out.set(name, value);
  }
  return out;
}

/** The value of a required option. */
export function required(options: ParsedOptions, name: string): string {
  const v = options.get(name);
  if (v === undefined || v === "") throw new CliError(`--${name}`, "is required");
  return v;
}

/** Comma-separated finite numbers, e.g. "0.1,-0.2,0.3"; `count` checks the length if given. */
export function parseNumberList(text: string, field: string, count?: number): number[] {
  const parts = text.split(",").map((s) => s.trim());
  const values = parts.map((p, i) => {
    const v = p === "" ? NaN : Number(p);
    if (!Number.isFinite(v)) throw new CliError(field, `item ${i + 1} ("${p}") is not a finite number`);
    return v;
  });
  if (count !== undefined && values.length !== count) throw new CliError(field, `expected ${count} numbers, got ${values.length}`);
  return values;
}

/** An integer option value. */
export function parseInteger(text: string, field: string): number {
  const v = Number(text);
  if (!Number.isInteger(v)) throw new CliError(field, `must be an integer, got "${text}"`);
  return v;
}

/** Reads and parses a JSON file; unreadable or malformed files are CliErrors naming the option. */
export function readJsonFile(path: string, field: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new CliError(field, `cannot read ${path} (${(e as NodeJS.ErrnoException).code ?? "error"})`);
  }
  try {
    return JSON.parse(text) as unknown;
  } catch (e) {
    throw new CliError(field, `${path} is not valid JSON (${(e as Error).message.split("\n")[0]})`);
  }
}

/** Reads an arm file and validates it with the shared armSchema; the first problem names its JSON path. */
export function readArm(path: string, field = "--arm"): ArmDocument {
  return readDocument(armSchema, path, field);
}

/** Reads a JSON file and validates it with `schema`; the first field error names its JSON path. */
export function readDocument<S extends z.ZodType>(schema: S, path: string, field: string): z.output<S> {
  const parsed = schema.safeParse(readJsonFile(path, field));
  if (!parsed.success) {
    const first = toFieldErrors(parsed.error)[0];
    throw new CliError(`${field} ${path}: ${first.path || "(root)"}`, first.message);
  }
  return parsed.data;
}

/** A JSON list of number lists of length `n` (configurations). */
export function readConfigs(path: string, n: number, field = "--configs"): number[][] {
  const doc = readJsonFile(path, field);
  if (!Array.isArray(doc)) throw new CliError(`${field} ${path}`, "must be a JSON list of configurations");
  return doc.map((q, i) => {
    if (!Array.isArray(q) || q.length !== n) {
      throw new CliError(`${field} ${path}: [${i}]`, `expected a list of ${n} numbers, got ${Array.isArray(q) ? q.length + " items" : typeof q}`);
    }
    q.forEach((v, k) => {
      if (typeof v !== "number" || !Number.isFinite(v)) throw new CliError(`${field} ${path}: [${i}][${k}]`, "must be a finite number");
    });
    return q as number[];
  });
}

/** A JSON list of row-major 4×4 poses (16 numbers, rigid), validated with the shared mat4 schema. */
export function readPoses(path: string, field = "--targets"): number[][] {
  const doc = readJsonFile(path, field);
  if (!Array.isArray(doc)) throw new CliError(`${field} ${path}`, "must be a JSON list of row-major 4×4 poses");
  return doc.map((m, i) => {
    const r = mat4.safeParse(m);
    if (!r.success) throw new CliError(`${field} ${path}: [${i}]`, toFieldErrors(r.error)[0].message);
    return r.data;
  });
}

/** Rounds to 12 significant digits for output (keeps files readable; far below any tolerance). */
export function round(v: number): number {
  return Number.isFinite(v) ? Number(v.toPrecision(12)) : v;
}

/** Rows of a row-major m×n matrix as nested lists. */
export function rows(values: ArrayLike<number>, m: number, n: number): number[][] {
  const out: number[][] = [];
  for (let r = 0; r < m; r++) {
    const row: number[] = [];
    for (let c = 0; c < n; c++) row.push(round(values[r * n + c]));
    out.push(row);
  }
  return out;
}
