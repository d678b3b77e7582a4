/**
 * Rewrites a standard-DH arm as the same arm in modified DH (Craig's table layout), by regrouping
 * the product Π Rz(θᵢ)Tz(dᵢ)Tx(aᵢ)Rx(αᵢ) into Rz(θ₁)Tz(d₁) · Π [Rx(αᵢ₋₁)Tx(aᵢ₋₁)Rz(θᵢ)Tz(dᵢ)] ·
 * Tx(aₙ)Rx(αₙ) (Rx and Tx commute); the last factor joins the tool. Craig, "Introduction to
 * Robotics", §3.4 (the two conventions), common practice.
 */
import type { DhArmKinematics } from "@/lib/kinematics";
import { mat4MulRigid } from "@/lib/kinematics";

export function dhToMdh(arm: DhArmKinematics): DhArmKinematics {
  if (arm.convention !== "dh") throw new Error("expects a dh arm");
  const n = arm.joints.length;
  const joints = arm.joints.map((j, i) => ({
    ...j,
    a: i === 0 ? 0 : arm.joints[i - 1].a,
    alpha: i === 0 ? 0 : arm.joints[i - 1].alpha,
  }));
  const last = arm.joints[n - 1];
  const ca = Math.cos(last.alpha), sa = Math.sin(last.alpha);
  const txRx = [1, 0, 0, last.a, 0, ca, -sa, 0, 0, sa, ca, 0, 0, 0, 0, 1];
  const tool = arm.tool ?? [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  const newTool = Array.from(mat4MulRigid(new Float64Array(16), txRx, tool));
  return { ...arm, name: `${arm.name} (mdh)`, convention: "mdh", joints, tool: newTool };
}
