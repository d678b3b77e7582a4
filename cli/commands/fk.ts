/** `fk`: tool-point pose (row-major 4×4, arm base frame) for one or many configurations. */
import { forwardKinematics } from "@/lib/kinematics";
import { parseOptions, round, type CliCommand } from "../io";
import { armAndConfigs } from "./shared";

export const command: CliCommand = {
  usage: "fk       --arm ARM.json (--q q1,q2,… | --configs Q.json)  → {pose} | {poses}",
  run(argv) {
    const { model, data, configs, batch } = armAndConfigs(parseOptions(argv, ["arm", "q", "configs"]));
    const poses = configs.map((q) => {
      forwardKinematics(model, data, q);
      return Array.from(data.toolPose, round);
    });
    return batch ? { poses } : { pose: poses[0] };
  },
};
