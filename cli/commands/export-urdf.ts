/** `export-urdf`: an arm file (any convention) as URDF text on stdout. */
import { exportUrdf } from "@/lib/urdf";
import { parseOptions, readArm, required, type CliCommand } from "../io";

export const command: CliCommand = {
  usage: "export-urdf --arm ARM.json  → URDF text",
  run(argv) {
    const options = parseOptions(argv, ["arm"]);
    return exportUrdf(readArm(required(options, "arm")));
  },
};
