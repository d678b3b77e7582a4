/**
 * `statics`: gravity torque, force capability along a direction and payload capacity at a point
 * of the last link (docs/cli.md#statics; gravity along −z of the arm's base frame).
 */
import { computeJacobian, createData, createModel } from "@/lib/kinematics";
import { capacityAlong, gravityTorque, payloadCapacity, transposeTimes } from "@/lib/analysis";
import { CliError, parseNumberList, parseOptions, readArm, required, round, type CliCommand } from "../io";

export const command: CliCommand = {
  usage: "statics  --arm ARM.json --q q1,q2,… --direction dx,dy,dz [--point x,y,z] [--payload kg]  → {gravityTorque, forceCapacity, payloadCapacity, limitingJoint}",
  run(argv) {
    const options = parseOptions(argv, ["arm", "q", "direction", "point", "payload"]);
    const arm = readArm(required(options, "arm"));
    const model = createModel(arm);
    const data = createData(model);
    const q = parseNumberList(required(options, "q"), "--q", model.n);
    const d = parseNumberList(required(options, "direction"), "--direction", 3);
    const norm = Math.hypot(d[0], d[1], d[2]);
    if (!(norm > 0)) throw new CliError("--direction", "must not be the zero vector");
    const dir = d.map((v) => v / norm);
    const point = options.has("point") ? parseNumberList(options.get("point")!, "--point", 3) : [0, 0, 0];
    let payload = 0;
    if (options.has("payload")) {
      payload = parseNumberList(options.get("payload")!, "--payload", 1)[0];
      if (payload < 0) throw new CliError("--payload", `must be ≥ 0 kg, got ${payload}`);
    }
    const jac = new Float64Array(6 * model.n);
    const links = gravityTorque(model, data, q, [], jac);
    const hold = gravityTorque(model, data, q, payload > 0 ? [{ mass: payload, pointInTool: point }] : [], jac);
    computeJacobian(model, data, q, jac, point);
    const force = capacityAlong(hold, transposeTimes(jac, 3, model.n, dir), model.maxTorque);
    const pay = payloadCapacity(links, jac, model.n, model.maxTorque);
    return {
      gravityTorque: Array.from(hold, round),
      forceCapacity: force.capacity === null ? null : round(force.capacity),
      payloadCapacity: pay.extraMass === null ? null : round(pay.extraMass),
      limitingJoint: force.limitingJoint,
    };
  },
};
