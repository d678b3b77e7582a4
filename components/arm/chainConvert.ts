/**
 * "Convert this DH table to a chain" in the arm editor: the arm as typed (dh or mdh) is rewritten
 * as its equivalent general joint chain (lib/kinematics dhToChain, one way), and the forward
 * kinematics of both are compared at seeded random configurations within the joint limits, so the
 * editor can show the check before anything is saved.
 */
import { createData, createModel, createRng, dhToChain, forwardKinematics, randomConfiguration } from "@/lib/kinematics";
import type { ArmDocument, DhArmDocument, FieldError } from "@/shared/schemas";
import { armFormFromDoc, validateArmForm, type ArmForm } from "./armForm";

const CONVERSION_CHECK_CONFIGS = 50;

type ChainConversion =
  | { ok: true; patch: Pick<ArmForm, "convention" | "joints" | "tool" | "toolOrig" | "capsules">; maxDifference: number; configs: number }
  | { ok: false; errors: FieldError[] };

/** Largest entry difference of the tool poses of two arms over seeded configurations within the first's limits. */
export function fkDifference(a: ArmDocument, b: ArmDocument, configs = CONVERSION_CHECK_CONFIGS): number {
  const ma = createModel(a), mb = createModel(b);
  const da = createData(ma), db = createData(mb);
  const rng = createRng(20261202);
  const q = new Float64Array(ma.n);
  let worst = 0;
  for (let k = 0; k < configs; k++) {
    randomConfiguration(ma, rng, q);
    forwardKinematics(ma, da, q);
    forwardKinematics(mb, db, q);
    for (let i = 0; i < 16; i++) worst = Math.max(worst, Math.abs(da.toolPose[i] - db.toolPose[i]));
  }
  return worst;
}

/** The form's DH arm as a chain (the form patch to apply) with the forward-kinematics check. */
export function convertFormToChain(form: ArmForm): ChainConversion {
  if (form.convention === "chain") return { ok: false, errors: [{ path: "convention", message: "the arm is already a joint chain" }] };
  const { doc, errors } = validateArmForm(form);
  if (errors.length) return { ok: false, errors };
  const chain = dhToChain(doc as DhArmDocument) as ArmDocument;
  const next = armFormFromDoc(chain);
  return {
    ok: true,
    patch: { convention: "chain", joints: next.joints, tool: next.tool, toolOrig: next.toolOrig, capsules: next.capsules },
    maxDifference: fkDifference(doc, chain),
    configs: CONVERSION_CHECK_CONFIGS,
  };
}
