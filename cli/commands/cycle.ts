/**
 * `cycle`: the cycle time of each task sequence of a requirement set for one arm
 * (docs/design.md#cycle-time), from the same analysis the server runs: its reached branches of
 * each target, its paths and the moves checked in the cell.
 */
import { analyzeShortlist } from "@/lib/analysis";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { CliError, parseOptions, readArm, readJsonFile, required, round, type CliCommand } from "../io";

const num = (v: number | null) => (v === null ? null : round(v));

export const command: CliCommand = {
  usage: "cycle    --arm A.json --requirements R.json  → the cycle time of each sequence, per step with its limiting joint",
  run(argv) {
    const options = parseOptions(argv, ["arm", "requirements"]);
    const arm = readArm(required(options, "arm"));
    const reqFile = required(options, "requirements");
    const parsed = requirementSetSchema.safeParse(readJsonFile(reqFile, "--requirements"));
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const where = issue.path.length ? issue.path.map(String).join(".") : "(root)";
      throw new CliError(`--requirements ${reqFile}: ${where}`, issue.message);
    }
    const req = parsed.data;
    if (!req.sequences?.length) throw new CliError(`--requirements ${reqFile}: sequences`, "the requirement set has no sequences");
    const analysis = analyzeShortlist([{ id: "1", revision: 1, arm }], req).arms[0];
    if (analysis.error) throw new CliError("--arm", analysis.error);
    const cycles = analysis.cycles;
    return {
      sequences: cycles.map((c) => ({
        name: c.name,
        time: num(c.time),
        steps: c.steps.map((s) => ({ kind: s.kind, name: s.name, q: s.q.map(round), time: round(s.time), limitingJoint: s.limitingJoint })),
        partsPerHour: num(c.partsPerHour),
        required: c.required,
        verdict: c.verdict,
        estimate: c.estimate,
        assumedAcceleration: c.assumedAcceleration,
        blocked: c.blocked,
        reason: c.reason,
      })),
    };
  },
};
