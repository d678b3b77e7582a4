/**
 * URDF → Armsift arm (`chain` convention): the serial chain from a base link to a tip link.
 *
 * Frames and conversions (URDF specification semantics; the details are ours):
 * - The arm's base frame is the base link's frame. Joint i's origin is the URDF joint origin,
 *   with any fixed joints since the previous moving joint (or since the base) multiplied in front
 *   of it; fixed joints after the last moving joint become the arm's `tool` (tool point = tip link
 *   frame). Link frame i is the URDF child link frame of moving joint i, so link data carries over.
 * - `continuous` joints become revolute joints with the widest range the arm format allows,
 *   −360° … +360°, to be narrowed by the user. `<limit>` lower/upper → min/max (rad or m),
 *   velocity → maxSpeed, effort → maxTorque (values of 0 mean "not stated").
 * - Mass: every link rigidly attached to link i (through fixed joints, on or off the chain) adds
 *   to link i. The centre of mass is expressed in link frame i: com = T_i←L · inertial origin xyz.
 *   The inertia tensor about the combined centre of mass, in link frame i's axes, is
 *   Σ R Iₗ Rᵀ + mₗ(|d|²E − d dᵀ) (rotation R of the inertial frame into link frame i, d the offset
 *   of each part's centre from the combined one: the parallel-axis theorem). Mass fixed to the base
 *   does not move and is dropped (reported).
 * - Collision shapes become capsules in the owning link's frame: a sphere is the capsule with
 *   from = to (exact); a cylinder the capsule around its axis segment with the same radius
 *   (contains it; rounded ends reach `radius` past the flat faces); a box the capsule along its
 *   longest edge with radius half the diagonal of the cross-section (contains it). Meshes are
 *   skipped, each link with only meshes gets a suggested capsule from its frame origin to the next
 *   joint's origin (the tool point for the last link) that the user may accept.
 * - Refused, naming the joint: floating and planar joints, mimic joints and unknown joint types on
 *   the chain; more than 12 moving joints. Parts off the chain behind a moving joint (a gripper,
 *   a second arm) are skipped and listed.
 */
import { MAX_JOINTS, armSchema, type ArmDocument, type Capsule, type ChainJointSpec } from "@/shared/schemas/arm";
import { MAX_BODY_SHAPES } from "@/shared/schemas/cell";
import { mulRigid, originFromMatrix, originMatrix, transformPointRigid } from "@/lib/kinematics/chain";
import { quote, UrdfError } from "./errors";
import { parseUrdf, type UrdfCollision, type UrdfJoint, type UrdfLink, type UrdfPose, type Vec3 } from "./parse";
import { baseCandidates, buildTree, MOVING_TYPES, pathBetween, tipCandidates, type TipCandidate, type UrdfTree } from "./tree";
import { fixed } from "@/shared/format";

/** Range given to a continuous joint (rad): the widest the arm format accepts (720° in all). */
export const CONTINUOUS_RANGE = Object.freeze({ min: -2 * Math.PI, max: 2 * Math.PI });

interface UrdfImportOptions {
  /** Base link (default: the root link). */
  base?: string;
  /** Tip link (default: the end of the longest chain below the base). */
  tip?: string;
  /** File name as given (recorded in the arm's `source`). */
  fileName?: string;
  /** SHA-256 of the file's bytes, lowercase hex (recorded in the arm's `source`). */
  sha256?: string;
}

/** One row of the joint table shown before saving. */
interface ImportedJointRow {
  /** 1-based joint number in the arm. */
  joint: number;
  name: string;
  /** Type in the file (revolute, continuous, prismatic). */
  urdfType: string;
  type: "revolute" | "prismatic";
  parent: string;
  child: string;
  /** Fixed joints merged into this joint's origin. */
  mergedFixed: string[];
}

interface SuggestedCapsule {
  /** 0 = the base, i = link i. */
  body: number;
  link: string;
  capsule: Capsule;
}

export interface UrdfImportReport {
  robotName: string;
  fileName: string | null;
  sha256: string | null;
  baseLink: string;
  tipLink: string;
  /** Links that can be chosen as base (the root first). */
  baseCandidates: string[];
  /** Links below the chosen base that can be chosen as tip (farthest first). */
  tipCandidates: TipCandidate[];
  joints: ImportedJointRow[];
  /** Fixed joints and links merged, in words ("joint "tool0_joint" merged into the tool"). */
  merged: string[];
  /** Conversions made (continuous joint, cylinder → capsule, …). */
  converted: string[];
  /** What was left out, and why. */
  skipped: string[];
  /** Capsules suggested for links whose collision geometry is only meshes. */
  suggestions: SuggestedCapsule[];
  /** Other remarks (missing speed or torque limits, dropped base mass, ignored elements). */
  notes: string[];
}

interface UrdfImport {
  arm: ArmDocument;
  report: UrdfImportReport;
}

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

function isIdentity(m: readonly number[]): boolean {
  return m.every((v, i) => v === I4[i]);
}

function poseMatrix(p: UrdfPose): number[] {
  return p.absent ? I4.slice() : originMatrix({ xyz: p.xyz, rpy: p.rpy });
}

function rotateSym(R: number[], I: number[]): number[] {
  // I as 3×3 [ixx ixy ixz; ixy iyy iyz; ixz iyz izz]; returns R·I·Rᵀ in the same 6-vector order.
  const M = [I[0], I[3], I[4], I[3], I[1], I[5], I[4], I[5], I[2]];
  const r = (i: number, j: number) => R[4 * i + j];
  const out = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) {
    let s = 0;
    for (let k = 0; k < 3; k++) for (let l = 0; l < 3; l++) s += r(i, k) * M[3 * k + l] * r(j, l);
    out[3 * i + j] = s;
  }
  return [out[0], out[4], out[8], out[1], out[2], out[5]];
}

interface Body {
  mass: number;
  com: Vec3;
  /** About its own centre, owner axes: ixx iyy izz ixy ixz iyz. */
  inertia: number[];
  link: string;
}

/** Combined mass, centre and inertia of rigidly joined parts (parallel-axis theorem). */
function combine(bodies: Body[]): { mass: number; com: Vec3; inertia: number[] } {
  const mass = bodies.reduce((s, b) => s + b.mass, 0);
  const com: Vec3 = mass > 0
    ? [0, 1, 2].map((k) => bodies.reduce((s, b) => s + b.mass * b.com[k], 0) / mass) as Vec3
    : [...bodies[0].com];
  if (bodies.length === 1) return { mass, com: [...bodies[0].com], inertia: bodies[0].inertia.slice() };
  const inertia = [0, 0, 0, 0, 0, 0];
  for (const b of bodies) {
    const d = [b.com[0] - com[0], b.com[1] - com[1], b.com[2] - com[2]];
    const dd = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    inertia[0] += b.inertia[0] + b.mass * (dd - d[0] * d[0]);
    inertia[1] += b.inertia[1] + b.mass * (dd - d[1] * d[1]);
    inertia[2] += b.inertia[2] + b.mass * (dd - d[2] * d[2]);
    inertia[3] += b.inertia[3] - b.mass * d[0] * d[1];
    inertia[4] += b.inertia[4] - b.mass * d[0] * d[2];
    inertia[5] += b.inertia[5] - b.mass * d[1] * d[2];
  }
  return { mass, com, inertia };
}

const round = (v: number) => (Math.abs(v) < 1e-15 ? 0 : v);
const mm = (m: number) => `${fixed(m * 1000, 0)} mm`;

/** The capsule of one collision element in the owner's frame, or a reason it is skipped. */
function capsuleOf(c: UrdfCollision, ownerToLink: number[]): { capsule: Capsule; converted?: string } | { skip: string } {
  const T = mulRigid(ownerToLink, poseMatrix(c.origin));
  const at = (p: Vec3) => transformPointRigid(T, p).map(round) as Vec3;
  const g = c.geometry;
  switch (g.kind) {
    case "sphere":
      return { capsule: { from: at([0, 0, 0]), to: at([0, 0, 0]), radius: g.radius } };
    case "cylinder":
      return { capsule: { from: at([0, 0, -g.length / 2]), to: at([0, 0, g.length / 2]), radius: g.radius }, converted: `cylinder (radius ${mm(g.radius)}, length ${mm(g.length)}) → capsule around its axis, reaching ${mm(g.radius)} beyond each end face` };
    case "box": {
      const k = g.size[0] >= g.size[1] && g.size[0] >= g.size[2] ? 0 : g.size[1] >= g.size[2] ? 1 : 2;
      const others = [0, 1, 2].filter((i) => i !== k).map((i) => g.size[i]);
      const e: Vec3 = [0, 0, 0];
      e[k] = g.size[k] / 2;
      return {
        capsule: { from: at([-e[0], -e[1], -e[2]]), to: at(e), radius: Math.hypot(others[0], others[1]) / 2 },
        converted: `box ${g.size.map(mm).join(" × ")} → capsule along its longest edge (contains the box)`,
      };
    }
    case "mesh":
      return { skip: `mesh${g.filename ? ` ${quote(g.filename)}` : ""}` };
    default:
      return { skip: `<${g.tag}> geometry (only box, cylinder, sphere and mesh are read)` };
  }
}

/** Rough capsule for a link known only by meshes: frame origin to `end`, radius 20 % of the length within 25–100 mm. */
function suggestedCapsule(end: Vec3): Capsule {
  const len = Math.hypot(end[0], end[1], end[2]);
  if (len < 1e-6) return { from: [0, 0, 0], to: [0, 0, 0], radius: 0.05 };
  return { from: [0, 0, 0], to: [...end], radius: Math.min(0.1, Math.max(0.025, 0.2 * len)) };
}

function jointLimits(j: UrdfJoint, report: UrdfImportReport): { type: "revolute" | "prismatic"; min: number; max: number; maxSpeed?: number; maxTorque?: number } {
  const where = `joint ${quote(j.name)}`;
  const type = j.type === "prismatic" ? "prismatic" : "revolute";
  const lim = j.limit;
  let min: number, max: number;
  if (j.type === "continuous") {
    min = CONTINUOUS_RANGE.min;
    max = CONTINUOUS_RANGE.max;
    report.converted.push(`continuous joint ${quote(j.name)} → revolute joint with range −360° … +360°: narrow it to the real range in the editor`);
  } else {
    if (!lim) throw new UrdfError(`${where} <limit>`, `is required for a ${j.type} joint (lower, upper, effort and velocity, as the URDF specification says)`);
    min = lim.lower ?? 0;
    max = lim.upper ?? 0;
    if (lim.lower === null || lim.upper === null) report.notes.push(`joint ${quote(j.name)}: <limit> without ${lim.lower === null ? "lower" : "upper"}; taken as 0 as the URDF specification says`);
    if (min > max) throw new UrdfError(`${where} <limit>`, `lower (${min}) is above upper (${max})`);
    if (type === "revolute" && max - min > 4 * Math.PI + 1e-9) throw new UrdfError(`${where} <limit>`, `range ${fixed(((max - min) * 180) / Math.PI, 0)}° exceeds 720°`);
  }
  const out: ReturnType<typeof jointLimits> = { type, min, max };
  const speedUnit = type === "revolute" ? "rad/s" : "m/s";
  if (lim?.velocity !== null && lim?.velocity !== undefined) {
    if (lim.velocity < 0) throw new UrdfError(`${where} <limit> velocity`, `${lim.velocity} must be ≥ 0`);
    if (lim.velocity > 0) out.maxSpeed = lim.velocity;
  }
  if (out.maxSpeed === undefined) report.notes.push(`joint ${quote(j.name)}: no velocity limit (${speedUnit}) in the file; max speed not set`);
  if (lim?.effort !== null && lim?.effort !== undefined) {
    if (lim.effort < 0) throw new UrdfError(`${where} <limit> effort`, `${lim.effort} must be ≥ 0`);
    if (lim.effort > 0) out.maxTorque = lim.effort;
  }
  if (out.maxTorque === undefined) report.notes.push(`joint ${quote(j.name)}: no effort limit in the file; max ${type === "revolute" ? "torque" : "force"} not set`);
  return out;
}

function checkMovingJoint(j: UrdfJoint): void {
  const where = `joint ${quote(j.name)}`;
  if (j.type === "floating" || j.type === "planar") {
    throw new UrdfError(where, `is a ${j.type} joint: an arm is a chain of revolute, continuous, prismatic and fixed joints (choose a base link below it)`);
  }
  if (!MOVING_TYPES.has(j.type) && j.type !== "fixed") {
    throw new UrdfError(`${where} type`, `${quote(j.type)} is not a URDF joint type (revolute, continuous, prismatic, fixed, floating, planar)`);
  }
  if (j.mimic !== null && MOVING_TYPES.has(j.type)) {
    throw new UrdfError(`${where} <mimic>`, `the joint follows joint ${quote(j.mimic)}: coupled (mimic) joints are not supported in an arm chain`);
  }
  if (MOVING_TYPES.has(j.type) && Math.hypot(...j.axis) < 1e-9) throw new UrdfError(`${where} <axis> xyz`, "must not be zero: the axis needs a direction");
}

/** Reads the chain of `text` between the chosen base and tip links. @throws UrdfError naming the element. */
export function importUrdf(text: string, options: UrdfImportOptions = {}): UrdfImport {
  const robot = parseUrdf(text);
  const tree: UrdfTree = buildTree(robot);
  const linkNames = [...tree.links.keys()];
  const base = options.base?.trim() || tree.root;
  if (!tree.links.has(base)) throw new UrdfError(`base link ${quote(base)}`, `does not exist (links: ${linkNames.slice(0, 8).map(quote).join(", ")}${linkNames.length > 8 ? ", …" : ""})`);
  const tips = tipCandidates(tree, base);
  if (tips.length === 0) {
    // Say which joint is the problem when one below the base can never be part of an arm.
    const todo = [base];
    while (todo.length) for (const j of tree.childJoints.get(todo.pop()!) ?? []) { checkMovingJoint(j); todo.push(j.child); }
    throw new UrdfError(`base link ${quote(base)}`, "has no moving joint below it");
  }
  const tip = options.tip?.trim() || (tips.find((t) => t.blockedBy === null && t.movingJoints <= MAX_JOINTS) ?? tips[0]).link;
  if (!tree.links.has(tip)) throw new UrdfError(`tip link ${quote(tip)}`, "does not exist");
  const path = pathBetween(tree, base, tip);
  if (path === null) throw new UrdfError(`tip link ${quote(tip)}`, `is not below base link ${quote(base)}`);
  path.forEach(checkMovingJoint);
  const movingCount = path.filter((j) => MOVING_TYPES.has(j.type)).length;
  if (movingCount === 0) throw new UrdfError(`tip link ${quote(tip)}`, `no moving joint between base link ${quote(base)} and it`);
  if (movingCount > MAX_JOINTS) throw new UrdfError(`tip link ${quote(tip)}`, `the chain from ${quote(base)} has ${movingCount} moving joints; an arm has at most ${MAX_JOINTS}: choose a nearer tip`);

  const report: UrdfImportReport = {
    robotName: robot.name,
    fileName: options.fileName ?? null,
    sha256: options.sha256 ?? null,
    baseLink: base,
    tipLink: tip,
    baseCandidates: baseCandidates(tree),
    tipCandidates: tips,
    joints: [],
    merged: [],
    converted: [],
    skipped: [],
    suggestions: [],
    notes: [],
  };

  // Walk the chain: owner body (0 = base, i = link i) and owner ← link transform of every chain link.
  const owner = new Map<string, { body: number; T: number[] }>([[base, { body: 0, T: I4.slice() }]]);
  const joints: ChainJointSpec[] = [];
  let pending = I4.slice();
  let pendingNames: string[] = [];
  let body = 0;
  const onPath = new Set(path.map((j) => j.name));
  for (const j of path) {
    if (j.type === "fixed") {
      pending = mulRigid(pending, poseMatrix(j.origin));
      pendingNames.push(j.name);
      owner.set(j.child, { body, T: mulRigid(owner.get(j.parent)!.T, poseMatrix(j.origin)) });
      continue;
    }
    body++;
    const lim = jointLimits(j, report);
    const origin = isIdentity(pending) ? { xyz: [...j.origin.xyz] as Vec3, rpy: [...j.origin.rpy] as Vec3 } : originFromMatrix(mulRigid(pending, poseMatrix(j.origin)));
    const spec: ChainJointSpec = { type: lim.type, origin, axis: [...j.axis], min: lim.min, max: lim.max };
    if (lim.maxSpeed !== undefined) spec.maxSpeed = lim.maxSpeed;
    if (lim.maxTorque !== undefined) spec.maxTorque = lim.maxTorque;
    joints.push(spec);
    report.joints.push({ joint: body, name: j.name, urdfType: j.type, type: lim.type, parent: j.parent, child: j.child, mergedFixed: pendingNames });
    for (const f of pendingNames) report.merged.push(`fixed joint ${quote(f)} merged into the origin of joint ${body} (${quote(j.name)})`);
    owner.set(j.child, { body, T: I4.slice() });
    pending = I4.slice();
    pendingNames = [];
  }
  const tool = pendingNames.length > 0 ? pending : null;
  for (const f of pendingNames) report.merged.push(`fixed joint ${quote(f)} merged into the tool transform (tool point = link ${quote(tip)})`);

  // Parts hanging off the chain: fixed joints join the owner, moving joints are skipped with their subtree.
  const chainLinks = [...owner.keys()];
  const skippedParts: string[] = [];
  const stack = chainLinks.slice();
  while (stack.length) {
    const l = stack.pop()!;
    for (const j of tree.childJoints.get(l) ?? []) {
      if (onPath.has(j.name) || owner.has(j.child)) continue;
      if (j.type === "fixed") {
        const o = owner.get(l)!;
        owner.set(j.child, { body: o.body, T: mulRigid(o.T, poseMatrix(j.origin)) });
        report.merged.push(`link ${quote(j.child)} (fixed joint ${quote(j.name)}, off the chain) merged into ${o.body === 0 ? "the base" : `link ${o.body}`}`);
        stack.push(j.child);
      } else {
        let count = 0;
        const sub = [j.child];
        while (sub.length) {
          const s = sub.pop()!;
          count++;
          for (const k of tree.childJoints.get(s) ?? []) sub.push(k.child);
        }
        skippedParts.push(`link ${quote(j.child)}${count > 1 ? ` and ${count - 1} link${count > 2 ? "s" : ""} below it` : ""} (behind ${j.type} joint ${quote(j.name)}, off the chain)`);
      }
    }
  }
  if (skippedParts.length) report.skipped.push(...skippedParts.map((s) => `${s}: not part of the arm; its mass is not counted`));
  if (base !== tree.root) {
    const below = new Set([base]);
    const todo = [base];
    while (todo.length) for (const j of tree.childJoints.get(todo.pop()!) ?? []) if (!below.has(j.child)) { below.add(j.child); todo.push(j.child); }
    const above = linkNames.length - below.size;
    if (above > 0) report.skipped.push(`${above} link${above > 1 ? "s" : ""} above the base link ${quote(base)} (not part of the arm)`);
  }

  // Mass and collision per body.
  const bodies: Body[][] = Array.from({ length: body + 1 }, () => []);
  const capsules: Capsule[][] = Array.from({ length: body + 1 }, () => []);
  const meshOnly: { body: number; link: string; meshes: string[] }[] = [];
  const ordered = [...owner.entries()].sort((a, b) => a[1].body - b[1].body);
  for (const [name, { body: b, T }] of ordered) {
    const link: UrdfLink = tree.links.get(name)!;
    if (link.inertial) {
      const P = mulRigid(T, poseMatrix(link.inertial.origin));
      bodies[b].push({ mass: link.inertial.mass, com: [P[3], P[7], P[11]].map(round) as Vec3, inertia: rotateSym(P, link.inertial.inertia).map(round), link: name });
    }
    const meshes: string[] = [];
    for (const c of link.collisions) {
      const r = capsuleOf(c, T);
      if ("skip" in r) {
        (c.geometry.kind === "mesh" ? meshes : report.skipped).push(c.geometry.kind === "mesh" ? r.skip : `link ${quote(name)}: ${r.skip} collision shape`);
        continue;
      }
      if (capsules[b].length >= MAX_BODY_SHAPES) {
        report.skipped.push(`link ${quote(name)}: collision shape beyond ${MAX_BODY_SHAPES} for ${b === 0 ? "the base" : `link ${b}`}`);
        continue;
      }
      capsules[b].push(r.capsule);
      if (r.converted) report.converted.push(`link ${quote(name)}: ${r.converted}`);
    }
    if (meshes.length) meshOnly.push({ body: b, link: name, meshes });
  }
  for (const m of meshOnly) {
    report.skipped.push(`link ${quote(m.link)}: ${m.meshes.length} mesh collision shape${m.meshes.length > 1 ? "s" : ""} (${m.meshes.slice(0, 3).join(", ")}${m.meshes.length > 3 ? ", …" : ""}): meshes are not read`);
    if (capsules[m.body].length === 0 && !report.suggestions.some((s) => s.body === m.body)) {
      const end: Vec3 = m.body < joints.length ? joints[m.body].origin.xyz : tool ? [tool[3], tool[7], tool[11]] : [0, 0, 0];
      report.suggestions.push({ body: m.body, link: m.link, capsule: suggestedCapsule(end) });
    }
  }
  const baseMass = bodies[0].reduce((s, b) => s + b.mass, 0);
  if (baseMass > 0) report.notes.push(`mass of the base and the links fixed to it (${fixed(baseMass, 3)} kg) is not used: the base does not move`);
  for (let i = 1; i <= body; i++) {
    const parts = bodies[i];
    const j = joints[i - 1];
    if (parts.length === 0) continue;
    const c = combine(parts);
    j.mass = c.mass;
    j.com = c.com.map(round) as Vec3;
    if (c.inertia.some((v) => v !== 0)) j.inertia = c.inertia.map(round) as ChainJointSpec["inertia"];
    if (parts.length > 1) report.merged.push(`link ${i}: masses of ${parts.map((p) => quote(p.link)).join(", ")} combined (${fixed(c.mass, 3)} kg)`);
  }
  for (let i = 1; i <= body; i++) if (capsules[i].length) joints[i - 1].collision = capsules[i];
  const ignored = Object.entries(robot.ignored).map(([k, n]) => `${n} <${k}>`);
  const visuals = robot.links.reduce((s, l) => s + l.visuals, 0);
  if (visuals) ignored.push(`${visuals} <visual>`);
  if (ignored.length) report.notes.push(`not used by the analysis: ${ignored.join(", ")}`);

  const name = (robot.name || (options.fileName ?? "").replace(/\.[^.]*$/, "") || "Imported arm").slice(0, 120);
  const arm: Record<string, unknown> = {
    name,
    description: describe(report),
    convention: "chain",
    joints,
  };
  if (tool && !isIdentity(tool)) arm.tool = tool.map((v, i) => (i >= 12 ? I4[i] : round(v)));
  if (capsules[0].length) arm.baseCollision = capsules[0];
  if (options.fileName && options.sha256) {
    arm.source = { format: "urdf", file: options.fileName.split(/[\\/]/).pop()!.slice(0, 255), sha256: options.sha256, baseLink: base.slice(0, 255), tipLink: tip.slice(0, 255) };
  }
  const parsed = armSchema.safeParse(arm);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const p = issue.path;
    const where = p[0] === "joints" && typeof p[1] === "number" ? `joint ${quote(report.joints[p[1]]?.name ?? String(p[1]))} (${p.slice(2).join(".")})` : p.join(".") || "robot";
    throw new UrdfError(where, issue.message);
  }
  return { arm: parsed.data, report };
}

/** The arm's description: where it came from and what the import did. */
function describe(r: UrdfImportReport): string {
  const lines = [
    `Imported from ${r.fileName ? quote(r.fileName) : "a URDF file"}${r.robotName ? ` (robot ${quote(r.robotName)})` : ""}: chain from link ${quote(r.baseLink)} to link ${quote(r.tipLink)}, ${r.joints.length} moving joints (${r.joints.map((j) => j.name).join(", ")}).`,
  ];
  if (r.merged.length) lines.push(`Merged: ${r.merged.join("; ")}.`);
  if (r.converted.length) lines.push(`Converted: ${r.converted.join("; ")}.`);
  if (r.skipped.length) lines.push(`Skipped: ${r.skipped.join("; ")}.`);
  const text = lines.join("\n");
  return text.length > 4000 ? `${text.slice(0, 3990)} …` : text;
}
