/**
 * Arm → URDF text. A DH arm is first rewritten as its equivalent chain (`dhToChain`), so every
 * arm exports the same way:
 * - links `base_link` (the arm's base frame, with `baseCollision`), `mount` when the arm has a
 *   `base` transform (fixed joint `mount_joint`), `link_1` … `link_n` (the link frames), and
 *   `tool` when the arm has a `tool` transform (fixed joint `tool_joint`);
 * - joint i: `joint_i`, revolute or prismatic, origin xyz/rpy, axis, limit lower/upper from
 *   min/max, effort from maxTorque and velocity from maxSpeed (0 where not stated, which the
 *   import reads back as "not stated");
 * - inertial from mass and com (the stored inertia tensor, or zeros when none is known);
 * - each collision capsule as a cylinder along its segment with its radius (the import turns a
 *   cylinder back into exactly this capsule), or a sphere when the capsule is a ball.
 * Numbers are written in the shortest form that reads back to the same double, so the exported
 * file imports back to the same forward kinematics, limits, masses and shapes.
 */
import type { ArmDocument, Capsule, ChainJointSpec } from "@/shared/schemas/arm";
import { dhToChain, originFromMatrix } from "@/lib/kinematics/chain";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&apos;");
}

/** Comment text cannot hold "--". */
function commentText(s: string): string {
  return s.replace(/-{2,}/g, "-").replace(/[<>]/g, "");
}

const num = (v: number): string => (Object.is(v, -0) ? "0" : String(v));
const vec = (v: readonly number[]): string => v.map(num).join(" ");

function originTag(xyz: readonly number[], rpy: readonly number[], indent: string): string {
  return `${indent}<origin xyz="${vec(xyz)}" rpy="${vec(rpy)}"/>`;
}

/** Origin of a cylinder whose z-axis runs from `from` to `to`, centred between them. */
function segmentOrigin(c: Capsule): { xyz: number[]; rpy: number[]; length: number } {
  const d = [c.to[0] - c.from[0], c.to[1] - c.from[1], c.to[2] - c.from[2]];
  const length = Math.hypot(d[0], d[1], d[2]);
  const xyz = [(c.from[0] + c.to[0]) / 2, (c.from[1] + c.to[1]) / 2, (c.from[2] + c.to[2]) / 2];
  const z = d.map((v) => v / length);
  // Any x ⟂ z: cross z with the frame axis least aligned with it.
  const k = Math.abs(z[0]) <= Math.abs(z[1]) && Math.abs(z[0]) <= Math.abs(z[2]) ? 0 : Math.abs(z[1]) <= Math.abs(z[2]) ? 1 : 2;
  const e = [0, 0, 0];
  e[k] = 1;
  let x = [e[1] * z[2] - e[2] * z[1], e[2] * z[0] - e[0] * z[2], e[0] * z[1] - e[1] * z[0]];
  const nx = Math.hypot(x[0], x[1], x[2]);
  x = x.map((v) => v / nx);
  const y = [z[1] * x[2] - z[2] * x[1], z[2] * x[0] - z[0] * x[2], z[0] * x[1] - z[1] * x[0]];
  const m = [x[0], y[0], z[0], xyz[0], x[1], y[1], z[1], xyz[1], x[2], y[2], z[2], xyz[2], 0, 0, 0, 1];
  return { xyz, rpy: originFromMatrix(m).rpy, length };
}

function collisionTags(capsules: readonly Capsule[] | undefined, indent: string): string[] {
  const out: string[] = [];
  (capsules ?? []).forEach((c, k) => {
    const ball = c.from[0] === c.to[0] && c.from[1] === c.to[1] && c.from[2] === c.to[2];
    out.push(`${indent}<collision name="capsule_${k + 1}">`);
    if (ball) {
      out.push(originTag(c.from, [0, 0, 0], `${indent}  `), `${indent}  <geometry><sphere radius="${num(c.radius)}"/></geometry>`);
    } else {
      const o = segmentOrigin(c);
      out.push(originTag(o.xyz, o.rpy, `${indent}  `), `${indent}  <geometry><cylinder radius="${num(c.radius)}" length="${num(o.length)}"/></geometry>`);
    }
    out.push(`${indent}</collision>`);
  });
  return out;
}

function inertialTags(j: ChainJointSpec, indent: string): string[] {
  if (j.mass === undefined && j.com === undefined) return [];
  const I = j.inertia ?? [0, 0, 0, 0, 0, 0];
  const lines = [`${indent}<inertial>`];
  if (!j.inertia) lines.push(`${indent}  <!-- inertia tensor not known: zeros -->`);
  lines.push(
    originTag(j.com ?? [0, 0, 0], [0, 0, 0], `${indent}  `),
    `${indent}  <mass value="${num(j.mass ?? 0)}"/>`,
    `${indent}  <inertia ixx="${num(I[0])}" ixy="${num(I[3])}" ixz="${num(I[4])}" iyy="${num(I[1])}" iyz="${num(I[5])}" izz="${num(I[2])}"/>`,
    `${indent}</inertial>`,
  );
  return lines;
}

function link(name: string, body: string[]): string[] {
  return body.length ? [`  <link name="${name}">`, ...body, "  </link>"] : [`  <link name="${name}"/>`];
}

function fixedJoint(name: string, parent: string, child: string, m: readonly number[]): string[] {
  const o = originFromMatrix(m);
  return [`  <joint name="${name}" type="fixed">`, originTag(o.xyz, o.rpy, "    "), `    <parent link="${parent}"/>`, `    <child link="${child}"/>`, "  </joint>"];
}

const isIdentity = (m: readonly number[] | undefined) => !m || m.every((v, i) => v === I4[i]);

/** URDF text of the arm (see the file comment). */
export function exportUrdf(arm: ArmDocument): string {
  const chain = arm.convention === "chain" ? arm : dhToChain(arm);
  const lines = [
    '<?xml version="1.0"?>',
    `<!-- ${commentText(`Exported by Armsift from arm "${arm.name}" (convention ${arm.convention}${arm.convention === "chain" ? "" : ", written as the equivalent joint chain"}).`)} -->`,
    "<!-- Kinematics, joint limits, link masses and collision capsules (as cylinders along their segments); datasheet specs are not part of URDF. -->",
    `<robot name="${esc(arm.name)}">`,
    ...link("base_link", collisionTags(arm.baseCollision, "    ")),
  ];
  let parent = "base_link";
  if (!isIdentity(chain.base)) {
    lines.push(...link("mount", []), ...fixedJoint("mount_joint", "base_link", "mount", chain.base!));
    parent = "mount";
  }
  chain.joints.forEach((j, i) => {
    const child = `link_${i + 1}`;
    lines.push(
      `  <joint name="joint_${i + 1}" type="${j.type}">`,
      originTag(j.origin.xyz, j.origin.rpy, "    "),
      `    <parent link="${parent}"/>`,
      `    <child link="${child}"/>`,
      `    <axis xyz="${vec(j.axis)}"/>`,
      `    <limit lower="${num(j.min)}" upper="${num(j.max)}" effort="${num(j.maxTorque ?? 0)}" velocity="${num(j.maxSpeed ?? 0)}"/>`,
      "  </joint>",
      ...link(child, [...inertialTags(j, "    "), ...collisionTags(j.collision, "    ")]),
    );
    parent = child;
  });
  if (chain.tool) lines.push(...link("tool", []), ...fixedJoint("tool_joint", parent, "tool", chain.tool));
  lines.push("</robot>", "");
  return lines.join("\n");
}
