/**
 * `place`: the best placement of one arm in the requirement set's mounting region
 * (docs/design.md#mount-placement, lib/analysis/placement.ts): the base pose found, what the arm
 * reaches and follows there, the goal's margins and how many placements the search evaluated.
 * Every target marked reached is reached (position error ≤ 1e-5 m, rotation error ≤ 1e-4 rad in
 * pose mode, joints within their limits) with no collision, at `base`, by its `q`.
 */
import { searchPlacement } from "@/lib/analysis/placement";
import { mountingAllowed, mountingClass, mountTilt } from "@/shared/schemas/mounting";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { CliError, parseOptions, readArm, readDocument, required, round, type CliCommand } from "../io";

export const command: CliCommand = {
  usage: "place    --arm A.json --requirements R.json  → {base, reached, total, followed, paths, worstMargin, minClearance, targets, evaluated}",
  run(argv) {
    const options = parseOptions(argv, ["arm", "requirements"]);
    const armFile = required(options, "arm");
    const arm = readArm(armFile);
    const reqFile = required(options, "requirements");
    const req = readDocument(requirementSetSchema, reqFile, "--requirements");
    if (!req.mounting) throw new CliError(`--requirements ${reqFile}: mounting`, "the requirement set has no mounting region to search");
    const cls = mountingClass(req.mounting.orientation);
    if (mountingAllowed(arm.specs?.mounting, cls) === false) {
      const tilt = (mountTilt(req.mounting.orientation) * 180) / Math.PI;
      throw new CliError(
        `--requirements ${reqFile}: mounting.orientation`,
        `a ${cls} mount (base z axis ${tilt.toFixed(1)}° from the cell's z) is not allowed by the arm's datasheet (--arm ${armFile}: specs.mounting lists ${arm.specs!.mounting!.join(", ")})`,
      );
    }
    const r = searchPlacement(arm, req);
    const finite = (v: number) => (Number.isFinite(v) ? round(v) : null);
    return {
      base: r.base.map(round),
      reached: r.goal.reached,
      total: r.targets.length,
      followed: r.goal.followed,
      paths: r.paths.length,
      worstMargin: finite(r.goal.worstMargin),
      minClearance: finite(r.goal.minClearance),
      targets: r.targets.map((t) => ({ name: t.name, reached: t.reached, q: t.q.map(round) })),
      evaluated: r.evaluated,
    };
  },
};
