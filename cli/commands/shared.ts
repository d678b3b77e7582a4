/** Pieces shared by the fk and jacobian commands: the arm and the list of configurations. */
import { createData, createModel, type ArmData, type ArmModel } from "@/lib/kinematics";
import { CliError, parseNumberList, readArm, readConfigs, required, type ParsedOptions } from "../io";

interface ArmAndConfigs {
  model: ArmModel;
  data: ArmData;
  /** The configurations to evaluate, and whether the batch form (--configs) was used. */
  configs: number[][];
  batch: boolean;
}

/** Reads --arm and exactly one of --q / --configs. */
export function armAndConfigs(options: ParsedOptions): ArmAndConfigs {
  const arm = readArm(required(options, "arm"));
  const model = createModel(arm);
  const data = createData(model);
  const q = options.get("q");
  const file = options.get("configs");
  if ((q === undefined) === (file === undefined)) throw new CliError("--q", "give either --q or --configs");
  const configs = q !== undefined ? [parseNumberList(q, "--q", model.n)] : readConfigs(file!, model.n);
  return { model, data, configs, batch: file !== undefined };
}
