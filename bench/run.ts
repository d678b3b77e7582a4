/**
 * `npm run bench`: runs the kinematics and distance-query benchmarks, then the analysis benchmark when
 * bench/analysis.ts exists, then the placement search benchmark, then the cycle-time benchmark, then the URDF import/export
 * benchmark, then the shortlist page benchmark and the large-shortlist benchmark (analysis, stored
 * size, page, exports and another user's latency meanwhile, for the demo shortlists and an
 * invented large one), the 3-D view benchmark (chunk sizes, frame time) and the team set-up
 * benchmark (PostgreSQL, queue workers; each module exports `async function run()`).
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { run as runGeometry } from "./geometry";
import { run as runKinematics } from "./kinematics";

async function main(): Promise<void> {
  await runKinematics();
  await runGeometry();
  const analysis = path.join(__dirname, "analysis.ts");
  if (existsSync(analysis)) {
    const mod = (await import(pathToFileURL(analysis).href)) as { run?: () => Promise<void> };
    if (typeof mod.run === "function") await mod.run();
  }
  await (await import("./placement")).run();
  await (await import("./cycle")).run();
  await (await import("./urdf")).run();
  await (await import("./page")).run();
  await (await import("./large")).run();
  await (await import("./view")).run();
  await (await import("./team")).run();
}

main().catch((e: unknown) => {
  console.error(e);
  process.exitCode = 1;
});
