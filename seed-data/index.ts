/**
 * Loader for the demo seed data (Node only: reads files from disk).
 *
 * Every arm, maker, model code, value and scenario under seed-data/ is fictional, invented for the
 * demo (see seed-data/README.md). Files are read from `<cwd>/seed-data/arms/*.json` and
 * `<cwd>/seed-data/requirements/*.json` (scripts run from the repository root), in sorted file-name
 * order, and each one is validated with the shared zod schemas. An invalid file throws an error
 * naming the file and the first offending fields.
 */
import fs from "node:fs";
import path from "node:path";
import type { z } from "zod";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";
import { toFieldErrors } from "@/shared/schemas/common";

/** Folder of the seed data, resolved against the current working directory (the repository root). */
export function seedDataDir(root: string = process.cwd()): string {
  return path.join(root, "seed-data");
}

/** Error thrown for a seed file that is not valid JSON or does not match its schema. */
export class SeedDataError extends Error {
  constructor(
    readonly file: string,
    readonly fieldErrors: { path: string; message: string }[],
  ) {
    super(
      `seed file ${file} is invalid: ` +
        fieldErrors.map((e) => `${e.path === "" ? "(root)" : e.path}: ${e.message}`).join("; "),
    );
    this.name = "SeedDataError";
  }
}

/** Sorted list of the `.json` files of one seed folder, relative to the repository root. */
export function listSeedFiles(kind: "arms" | "requirements", root: string = process.cwd()): string[] {
  const dir = path.join(seedDataDir(root), kind);
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => path.join("seed-data", kind, f));
}

function loadFile<S extends z.ZodType>(schema: S, relFile: string, root: string): z.output<S> {
  const text = fs.readFileSync(path.join(root, relFile), "utf8");
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new SeedDataError(relFile, [{ path: "", message: `not valid JSON (${(e as Error).message})` }]);
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) throw new SeedDataError(relFile, toFieldErrors(parsed.error));
  return parsed.data;
}

/** All seed arms, validated with `armSchema`, in sorted file-name order. */
export function loadSeedArms(root: string = process.cwd()): ArmDocument[] {
  return listSeedFiles("arms", root).map((f) => loadFile(armSchema, f, root));
}

/** All seed requirement sets, validated with `requirementSetSchema` (defaults applied), in sorted file-name order. */
export function loadSeedRequirementSets(root: string = process.cwd()): RequirementSet[] {
  return listSeedFiles("requirements", root).map((f) => loadFile(requirementSetSchema, f, root));
}
