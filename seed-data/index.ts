/**
 * Loader for the demo seed data (Node only: reads files from disk).
 *
 * Every arm, maker, model code, value and scenario under seed-data/ is fictional, invented for the
 * demo (see seed-data/README.md). Files are read from `<cwd>/seed-data/arms/*.json` and
 * `<cwd>/seed-data/requirements/*.json` (scripts run from the repository root), in sorted file-name
 * order, and each one is validated with the shared zod schemas. An invalid file throws an error
 * naming the file and the first offending fields.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { z } from "zod";
import { armSchema, armSpecsSchema, type ArmDocument } from "@/shared/schemas/arm";
import { importUrdf, UrdfError } from "@/lib/urdf";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";
import { toFieldErrors } from "@/shared/schemas/common";

/** Folder of the seed data, resolved against the current working directory (the repository root). */
function seedDataDir(root: string = process.cwd()): string {
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

/**
 * Sorted list of the `.json` files of one seed folder, relative to the repository root
 * (`urdf`: the side files naming each URDF-authored arm's file, identity and specs).
 */
export function listSeedFiles(kind: "arms" | "requirements" | "urdf", root: string = process.cwd()): string[] {
  const dir = path.join(seedDataDir(root), kind);
  if (!fs.existsSync(dir)) return [];
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

/** A side file of a URDF-authored seed arm: the URDF file beside it, the chain, identity and specs. */
const urdfSeedSchema = z.object({
  file: z.string().regex(/^[\w.-]+\.urdf$/, "must name a .urdf file in the same folder"),
  base: z.string().optional(),
  tip: z.string().optional(),
  maker: z.string().optional(),
  modelCode: z.string().optional(),
  description: z.string(),
  specs: armSpecsSchema,
});

/**
 * One URDF-authored seed arm: the URDF file is imported exactly as the import dialog and the
 * command line do (lib/urdf), then the side file's identity and specs are added (URDF carries no
 * datasheet values). The arm records the URDF file's name and hash as its source.
 */
function loadUrdfSeed(relFile: string, root: string): ArmDocument {
  const side = loadFile(urdfSeedSchema, relFile, root);
  const urdfRel = path.join(path.dirname(relFile), side.file);
  const bytes = fs.readFileSync(path.join(root, urdfRel));
  let imported;
  try {
    imported = importUrdf(bytes.toString("utf8"), { base: side.base, tip: side.tip, fileName: side.file, sha256: createHash("sha256").update(bytes).digest("hex") });
  } catch (e) {
    if (e instanceof UrdfError) throw new SeedDataError(urdfRel, [{ path: e.element, message: e.reason }]);
    throw e;
  }
  const doc = { ...imported.arm, maker: side.maker, modelCode: side.modelCode, description: `${side.description}\n\n${imported.arm.description ?? ""}`.slice(0, 4000), specs: side.specs };
  const parsed = armSchema.safeParse(doc);
  if (!parsed.success) throw new SeedDataError(relFile, toFieldErrors(parsed.error));
  return parsed.data;
}

/**
 * All seed arms, validated with `armSchema`: the arm files in sorted file-name order, then the
 * URDF-authored arms (seed-data/urdf) in sorted side-file order.
 */
export function loadSeedArms(root: string = process.cwd()): ArmDocument[] {
  return [...listSeedFiles("arms", root).map((f) => loadFile(armSchema, f, root)), ...listSeedFiles("urdf", root).map((f) => loadUrdfSeed(f, root))];
}

/** All seed requirement sets, validated with `requirementSetSchema` (defaults applied), in sorted file-name order. */
export function loadSeedRequirementSets(root: string = process.cwd()): RequirementSet[] {
  return listSeedFiles("requirements", root).map((f) => loadFile(requirementSetSchema, f, root));
}
