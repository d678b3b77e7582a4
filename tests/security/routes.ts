// Discovery of every HTTP entry point: route handler files under app/api (with the HTTP methods
// each exports) and server actions ("use server" modules under app/, components/, lib/).
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

export const ROOT = path.resolve(__dirname, "..", "..");
export const METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;
export type Method = (typeof METHODS)[number];

function walk(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) {
      if (name !== "node_modules" && name !== "generated") walk(p, out);
    } else out.push(p);
  }
  return out;
}

/** "arms/[id]" for app/api/arms/[id]/route.ts. */
export const routeKey = (file: string): string => path.relative(path.join(ROOT, "app", "api"), path.dirname(file)).split(path.sep).join("/");

/** Every route file with its exported HTTP methods (imported for real, so re-exports count). */
export async function discoverRoutes(): Promise<{ key: string; file: string; methods: Method[]; module: Record<string, unknown> }[]> {
  const files = walk(path.join(ROOT, "app", "api")).filter((f) => /[/\\]route\.(ts|tsx|js)$/.test(f)).sort();
  const out = [];
  for (const file of files) {
    const module = (await import(file)) as Record<string, unknown>;
    const methods = METHODS.filter((m) => typeof module[m] === "function");
    out.push({ key: routeKey(file), file, methods, module });
  }
  return out;
}

/** Exported names of modules that start with "use server" (server actions), by file. */
export function discoverServerActions(): { file: string; name: string }[] {
  const out: { file: string; name: string }[] = [];
  for (const dir of ["app", "components", "lib"]) {
    for (const file of walk(path.join(ROOT, dir)).filter((f) => /\.(ts|tsx)$/.test(f))) {
      const text = readFileSync(file, "utf8");
      const moduleLevel = /^\s*(?:\/\/[^\n]*\n|\/\*[\s\S]*?\*\/\s*)*\s*["']use server["']/.test(text);
      const inline = /["']use server["']/.test(text);
      if (!moduleLevel && !inline) continue;
      const rel = path.relative(ROOT, file).split(path.sep).join("/");
      const names = [...text.matchAll(/export\s+(?:async\s+)?(?:function|const)\s+([A-Za-z0-9_$]+)/g)].map((m) => m[1]);
      if (moduleLevel) for (const name of names) out.push({ file: rel, name });
      else out.push({ file: rel, name: "(inline server action)" });
    }
  }
  return out;
}
