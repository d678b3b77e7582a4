/**
 * The layer rules of eslint.config.mjs, checked by linting small files that break them (and one
 * that keeps them) at the paths where they would live; plus the server-only mark of every module
 * of the data layer.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

const ROOT = path.resolve(__dirname, "../..");
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: ROOT });
});

/** The messages of the import rule for `code` placed at `file`. */
async function importErrors(file: string, code: string): Promise<string[]> {
  const [r] = await eslint.lintText(code, { filePath: path.join(ROOT, file) });
  return r.messages.filter((m) => m.ruleId === "no-restricted-imports").map((m) => m.message);
}

describe("layer rules (lint)", () => {
  it.each([
    ["a component reading the database through the barrel", "components/arm/Bad.tsx", 'import { listArms } from "@/lib/db";\nexport const x = listArms;\n', /never read the database/],
    ["a component reaching a module below lib/db", "components/Bad.tsx", 'import { getArm } from "@/lib/db/arms";\nexport const x = getArm;\n', /never read the database/],
    ["a component reaching lib/db by a relative path", "components/shortlist/Bad.tsx", 'import { getShortlist } from "../../lib/db";\nexport const x = getShortlist;\n', /never read the database/],
    ["a page reaching a module below lib/db", "app/arms/bad/page.tsx", 'import { getArm } from "@/lib/db/arms";\nexport const x = getArm;\n', /through its barrel/],
    ["a page reaching lib/db by a relative path", "app/arms/bad/page.tsx", 'import { getArm } from "../../../lib/db/arms";\nexport const x = getArm;\n', /through its barrel/],
    ["a script reaching the client module", "scripts/bad.ts", 'import { databaseUrl } from "../lib/db/client";\nexport const x = databaseUrl;\n', /through its barrel/],
    ["a lib module reaching lib/db relatively", "lib/http/bad.ts", 'import { getArm } from "../db/arms";\nexport const x = getArm;\n', /through its barrel/],
    ["a lib module reaching lib/db relatively, barrel", "lib/jobs/bad.ts", 'import { getRun } from "../db";\nexport const x = getRun;\n', /through its barrel/],
    ["a page using Prisma directly", "app/bad/page.tsx", 'import { PrismaClient } from "@prisma/client";\nexport const x = PrismaClient;\n', /Only lib\/db uses Prisma/],
    ["the data layer importing lib/auth", "lib/db/bad.ts", 'import { can } from "@/lib/auth/permissions";\nexport const x = can;\n', /bottom layer/],
    ["the data layer importing lib/auth relatively", "lib/db/bad.ts", 'import { can } from "../auth/permissions";\nexport const x = can;\n', /bottom layer/],
    ["the data layer importing a view", "lib/db/bad.ts", 'import { anchorOptions } from "@/lib/views/anchors";\nexport const x = anchorOptions;\n', /bottom layer/],
    ["pure analysis importing the database", "lib/analysis/bad.ts", 'import { getArm } from "@/lib/db";\nexport const x = getArm;\n', /pure/],
    ["pure kinematics importing React", "lib/kinematics/bad.ts", 'import { useState } from "react";\nexport const x = useState;\n', /pure/],
  ])("refuses %s", async (_what, file, code, message) => {
    const errors = await importErrors(file, code);
    expect(errors.length).toBe(1);
    expect(errors[0]).toMatch(message);
  });

  it.each([
    ["a page using the barrel", "app/arms/fine/page.tsx", 'import { getArm } from "@/lib/db";\nexport const x = getArm;\n'],
    ["a route handler module using the barrel", "lib/http/fine.ts", 'import { getArm } from "@/lib/db";\nexport const x = getArm;\n'],
    ["a module of the data layer using a sibling", "lib/db/fine.ts", 'import { db } from "./client";\nexport const x = db;\n'],
    ["a component importing a view type", "components/share/Fine.tsx", 'import type { AnchorOption } from "@/lib/views/anchors";\nexport type X = AnchorOption;\n'],
  ])("accepts %s", async (_what, file, code) => {
    expect(await importErrors(file, code)).toEqual([]);
  });
});

describe("the data layer", () => {
  it("marks every module server-only", () => {
    const dir = path.join(ROOT, "lib", "db");
    const modules = readdirSync(dir).filter((f) => f.endsWith(".ts"));
    expect(modules.length).toBeGreaterThan(10);
    const unmarked = modules.filter((f) => !/^import "server-only";$/m.test(readFileSync(path.join(dir, f), "utf8")));
    expect(unmarked).toEqual([]);
  });
});

describe("route handlers", () => {
  /** Every route.ts under app/api, relative to the repository root. */
  function routeFiles(dir = path.join(ROOT, "app", "api")): string[] {
    return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
      e.isDirectory() ? routeFiles(path.join(dir, e.name)) : e.name === "route.ts" ? [path.relative(ROOT, path.join(dir, e.name))] : [],
    );
  }

  it("live in lib/http/handlers: a route file only names its handlers", () => {
    const files = routeFiles();
    expect(files.length).toBeGreaterThan(30);
    const offenders = files.filter((f) => {
      const text = readFileSync(path.join(ROOT, f), "utf8");
      const imports = [...text.matchAll(/^import .* from "([^"]+)";$/gm)].map((m) => m[1]);
      const body = text.replace(/^import .*$/gm, "").replace(/^export const (dynamic = "force-dynamic"|[A-Z]+ = [\w.]+);$/gm, "").trim();
      return body !== "" || imports.length !== 1 || !imports[0].startsWith("@/lib/http/handlers/");
    });
    expect(offenders).toEqual([]);
  });
});
