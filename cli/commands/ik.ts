/** `ik`: inverse kinematics for a list of target poses, with a timing summary. */
import { createData, createModel, solveIk, type IkMode } from "@/lib/kinematics";
import { CliError, parseInteger, parseOptions, readArm, readPoses, required, round, type CliCommand } from "../io";

const MODES: readonly IkMode[] = ["pose", "axis", "point"];

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return 0;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1))];
}

export const command: CliCommand = {
  usage: "ik       --arm ARM.json --targets T.json [--mode pose|axis|point] [--seed N]  → {results, summary}",
  run(argv) {
    const options = parseOptions(argv, ["arm", "targets", "mode", "seed"]);
    const arm = readArm(required(options, "arm"));
    const targets = readPoses(required(options, "targets"));
    const mode = (options.get("mode") ?? "pose") as IkMode;
    if (!MODES.includes(mode)) throw new CliError("--mode", `must be pose, axis or point, got "${mode}"`);
    const seed = options.has("seed") ? parseInteger(options.get("seed")!, "--seed") : 1;
    const model = createModel(arm);
    const data = createData(model);
    const times: number[] = [];
    const results = targets.map((t) => {
      const start = performance.now();
      const r = solveIk(model, data, t, { mode, seed });
      times.push(performance.now() - start);
      return {
        status: r.status,
        q: Array.from(r.q, round),
        positionError: round(r.positionError),
        rotationError: round(r.rotationError),
      };
    });
    times.sort((a, b) => a - b);
    return {
      results,
      summary: {
        reached: results.filter((r) => r.status === "reached").length,
        total: results.length,
        medianMs: round(percentile(times, 0.5)),
        p95Ms: round(percentile(times, 0.95)),
      },
    };
  },
};
