/**
 * The per-arm setup of an analysis: the arm placed in the cell with the requirement set's tool
 * attached, its loads, and its structural Jacobian ranks.
 *
 * Frames: the model's world is the CELL frame. model.base = T_cell_base · arm.base and
 * model.tool = arm.tool · tool.tcp, so the model's tool point is the requirement set's TCP and
 * every Jacobian is expressed in the cell frame with gravity along −z of the cell (a tilted or
 * hanging base therefore gets the right gravity direction).
 */
import { kinematicsOf, type ArmDocument, type ArmKinematics } from "@/shared/schemas/arm";
import type { RequirementSet } from "@/shared/schemas/requirements";
import { computeJacobian, createData, createModel, createRng, randomConfiguration, transformPointRigid, type ArmData, type ArmModel } from "@/lib/kinematics";
import { structuralRanksFromJacobians, type StructuralRanks } from "./dexterity";
import { IDENTITY_4, invertRigid, mul4 } from "./geometry";
import type { PointLoad } from "./statics";
import { createCellCheck, createCellData, createCellModel, type CellCheck, type CellData, type CellModel } from "./cell";

export interface ArmContext {
  model: ArmModel;
  data: ArmData;
  /** 6n scratch Jacobian. */
  jac: Float64Array;
  ranks: StructuralRanks;
  /** Tool CoG in the TCP frame (m). */
  toolCogInTcp: [number, number, number];
  /** Loads carried at the flange side: tool and payload, points in the TCP frame. */
  loads: PointLoad[];
  /** Tool + payload mass (kg). */
  loadMass: number;
  /** Tool mass (at the tool CoG) and payload mass (at the payload CoG), kg. */
  toolMass: number;
  payloadMass: number;
  /** tool.tcp (arm tool point → TCP) and its inverse. */
  tcp: Float64Array;
  tcpInverse: Float64Array;
  /** True when at least one joint has a maxTorque / maxSpeed. */
  hasTorqueLimits: boolean;
  hasSpeedLimits: boolean;
  /** The cell: bodies, obstacles, checked pairs (cell.ts), its buffers and a reusable check result. */
  cell: CellModel;
  cellData: CellData;
  check: CellCheck;
}

/**
 * The arm as the analysis sees it in the cell: base = T_cell_base · arm.base and
 * tool = arm.tool · tool.tcp, so the model's world is the cell frame and its tool point is the
 * requirement set's TCP. The analysis and the 3-D view both build their model from this.
 */
export function placedArmKinematics(arm: ArmKinematics, req: Pick<RequirementSet, "base" | "tool">): ArmKinematics {
  const base = mul4(req.base, arm.base ?? IDENTITY_4);
  const tool = mul4(arm.tool ?? IDENTITY_4, req.tool.tcp);
  return { name: arm.name, convention: arm.convention, joints: arm.joints, base: Array.from(base), tool: Array.from(tool) } as ArmKinematics;
}

/** Builds the context; throws RangeError (from createModel) on an invalid arm. */
export function createArmContext(arm: ArmDocument, req: RequirementSet, seed = 1): ArmContext {
  const tcp = Float64Array.from(req.tool.tcp);
  const model = createModel(placedArmKinematics(kinematicsOf(arm), req));
  const data = createData(model);
  const jac = new Float64Array(6 * model.n);
  const tcpInverse = invertRigid(tcp);
  const toolCogInTcp = transformPointRigid(tcpInverse, req.tool.cog);
  const loads: PointLoad[] = [];
  if (req.tool.mass > 0) loads.push({ mass: req.tool.mass, pointInTool: toolCogInTcp });
  if (req.payload.mass > 0) loads.push({ mass: req.payload.mass, pointInTool: req.payload.cog });
  const rng = createRng(seed);
  const q = new Float64Array(model.n);
  const jacs: Float64Array[] = [], toolPoses: Float64Array[] = [];
  for (let i = 0; i < 6; i++) {
    randomConfiguration(model, rng, q);
    jacs.push(Float64Array.from(computeJacobian(model, data, q, jac)));
    toolPoses.push(Float64Array.from(data.toolPose));
  }
  let hasTorqueLimits = false, hasSpeedLimits = false;
  for (let i = 0; i < model.n; i++) {
    if (model.maxTorque[i] > 0) hasTorqueLimits = true;
    if (model.maxSpeed[i] > 0) hasSpeedLimits = true;
  }
  const cell = createCellModel(arm, req, model);
  return {
    model, data, jac, ranks: structuralRanksFromJacobians(jacs, model.n, toolPoses), toolCogInTcp, loads,
    loadMass: req.tool.mass + req.payload.mass, toolMass: req.tool.mass, payloadMass: req.payload.mass, tcp, tcpInverse, hasTorqueLimits, hasSpeedLimits,
    cell, cellData: createCellData(cell, req.base), check: createCellCheck(),
  };
}

/**
 * The same arm and cell at another base pose T_C_B (`base`, row-major 4×4), for the placement
 * search: a new model, its buffers and the cell's buffers at that base; the cell model, the
 * structural ranks and the loads are shared with `ctx` (none of them depends on where the base
 * stands: the cell's shapes are in the links' frames, its obstacles in the cell frame, the ranks
 * are rotation-invariant).
 */
export function placedContext(ctx: ArmContext, arm: ArmDocument, req: Pick<RequirementSet, "tool">, base: ArrayLike<number>): ArmContext {
  const model = createModel(placedArmKinematics(kinematicsOf(arm), { base: Array.from(base), tool: req.tool }));
  return {
    ...ctx, model, data: createData(model), jac: new Float64Array(6 * model.n),
    cellData: createCellData(ctx.cell, base), check: createCellCheck(),
  };
}
