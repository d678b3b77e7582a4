/** `jacobian`: 6×n geometric Jacobian at the tool point (rows vx vy vz wx wy wz, base frame). */
import { computeJacobian } from "@/lib/kinematics";
import { parseOptions, rows, type CliCommand } from "../io";
import { armAndConfigs } from "./shared";

export const command: CliCommand = {
  usage: "jacobian --arm ARM.json (--q q1,q2,… | --configs Q.json)  → {jacobian} | {jacobians}",
  run(argv) {
    const { model, data, configs, batch } = armAndConfigs(parseOptions(argv, ["arm", "q", "configs"]));
    const J = new Float64Array(6 * model.n);
    const jacobians = configs.map((q) => rows(computeJacobian(model, data, q, J), 6, model.n));
    return batch ? { jacobians } : { jacobian: jacobians[0] };
  },
};
