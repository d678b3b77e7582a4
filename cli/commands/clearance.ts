/**
 * `clearance`: the collision check of one configuration of an arm in a requirement set's cell
 * (lib/analysis/cell.ts): every checked pair of bodies with its separation, the smallest, and
 * whether any pair touches or overlaps. The arm stands at the requirement set's `base`; body
 * names are "base", "link 1" … "link n", "tool", "payload" and the obstacles' names. `--target`
 * applies that target's contact list (the tool's and payload's pairs with the obstacles it
 * names are not checked).
 */
import { allPairDistances, contactMask, pairNames } from "@/lib/analysis/cell";
import { createArmContext } from "@/lib/analysis/context";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { CliError, parseNumberList, parseOptions, readArm, readDocument, required, round, type CliCommand } from "../io";

export const command: CliCommand = {
  usage: "clearance --arm A.json --requirements R.json --q q1,…,qn [--target NAME]  → {collisionFree, minDistance, closest, pairs}",
  run(argv) {
    const options = parseOptions(argv, ["arm", "requirements", "q", "target"]);
    const arm = readArm(required(options, "arm"));
    const req = readDocument(requirementSetSchema, required(options, "requirements"), "--requirements");
    const q = parseNumberList(required(options, "q"), "--q", arm.joints.length);
    let contact: string[] | undefined;
    if (options.has("target")) {
      const name = options.get("target")!;
      const target = req.targets.find((t) => t.name === name);
      if (!target) throw new CliError("--target", `the requirement set has no target "${name}" (targets: ${req.targets.map((t) => t.name).join(", ") || "none"})`);
      contact = target.contact;
    }
    const ctx = createArmContext(arm, req);
    const rows = allPairDistances(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, contactMask(ctx.cell, contact));
    const pairs = rows.map((r) => {
      const [a, b] = pairNames(ctx.cell, r.pair);
      return { a, b, distance: round(r.distance) };
    });
    let best = -1;
    pairs.forEach((p, i) => { if (best < 0 || p.distance < pairs[best].distance) best = i; });
    return {
      collisionFree: pairs.every((p) => p.distance > 0),
      minDistance: best < 0 ? null : pairs[best].distance,
      closest: best < 0 ? null : { a: pairs[best].a, b: pairs[best].b },
      pairs,
    };
  },
};
