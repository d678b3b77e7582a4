/**
 * The kinematic tree of a parsed URDF: unique names, every joint's parent and child link present,
 * one parent per link, no cycle, one root. Base and tip candidates for choosing the serial chain.
 */
import { quote, UrdfError } from "./errors";
import type { UrdfJoint, UrdfLink, UrdfRobot } from "./parse";

export const MOVING_TYPES = new Set(["revolute", "continuous", "prismatic"]);

export interface UrdfTree {
  robot: UrdfRobot;
  links: Map<string, UrdfLink>;
  /** The joint whose child is the link (absent for the root). */
  parentJoint: Map<string, UrdfJoint>;
  /** Joints whose parent is the link, in file order. */
  childJoints: Map<string, UrdfJoint[]>;
  root: string;
}

function list(names: string[], max = 5): string {
  const shown = names.slice(0, max).map(quote).join(", ");
  return names.length > max ? `${shown} and ${names.length - max} more` : shown;
}

/** Builds and checks the tree. @throws UrdfError naming the link or joint at fault. */
export function buildTree(robot: UrdfRobot): UrdfTree {
  const links = new Map<string, UrdfLink>();
  for (const l of robot.links) {
    if (links.has(l.name)) throw new UrdfError(`link ${quote(l.name)}`, "is defined twice; link names must be unique");
    links.set(l.name, l);
  }
  const jointNames = new Set<string>();
  const parentJoint = new Map<string, UrdfJoint>();
  const childJoints = new Map<string, UrdfJoint[]>();
  for (const j of robot.joints) {
    const where = `joint ${quote(j.name)}`;
    if (jointNames.has(j.name)) throw new UrdfError(where, "is defined twice; joint names must be unique");
    jointNames.add(j.name);
    if (!links.has(j.parent)) throw new UrdfError(`${where} <parent>`, `link ${quote(j.parent)} does not exist`);
    if (!links.has(j.child)) throw new UrdfError(`${where} <child>`, `link ${quote(j.child)} does not exist`);
    if (j.parent === j.child) throw new UrdfError(where, `connects link ${quote(j.child)} to itself (a cycle)`);
    const other = parentJoint.get(j.child);
    if (other) throw new UrdfError(`link ${quote(j.child)}`, `is the child of two joints, ${quote(other.name)} and ${quote(j.name)}; in a tree each link has one parent (closed chains are not supported)`);
    parentJoint.set(j.child, j);
    const c = childJoints.get(j.parent);
    if (c) c.push(j);
    else childJoints.set(j.parent, [j]);
  }
  // Cycles: with one parent per link, a loop is a walk upwards that comes back.
  const done = new Set<string>();
  for (const start of links.keys()) {
    const seen: string[] = [];
    const onPath = new Set<string>();
    let at: string | undefined = start;
    while (at !== undefined && !done.has(at)) {
      if (onPath.has(at)) {
        const loop = seen.slice(seen.indexOf(at)).map((l) => parentJoint.get(l)!.name);
        throw new UrdfError(`joint ${quote(parentJoint.get(at)!.name)}`, `closes a cycle through joints ${list(loop)}; a robot description must be a tree`);
      }
      onPath.add(at);
      seen.push(at);
      at = parentJoint.get(at)?.parent;
    }
    for (const l of seen) done.add(l);
  }
  const roots = [...links.keys()].filter((l) => !parentJoint.has(l));
  if (roots.length !== 1) {
    throw new UrdfError(`link ${quote(roots[1] ?? roots[0] ?? "")}`, roots.length === 0 ? "no root link" : `the description has ${roots.length} root links (${list(roots)}); link them with joints so that one root remains`);
  }
  return { robot, links, parentJoint, childJoints, root: roots[0] };
}

/** Joints from `base` down to `tip` (top first); null when `tip` is not below `base`. */
export function pathBetween(tree: UrdfTree, base: string, tip: string): UrdfJoint[] | null {
  const path: UrdfJoint[] = [];
  let at = tip;
  while (at !== base) {
    const j = tree.parentJoint.get(at);
    if (!j) return null;
    path.push(j);
    at = j.parent;
  }
  return path.reverse();
}

export interface TipCandidate {
  link: string;
  /** Moving joints (revolute, continuous, prismatic) between the base and this link. */
  movingJoints: number;
  /** All joints between the base and this link. */
  joints: number;
  /** True for a link with no child joint. */
  leaf: boolean;
  /** Why this link cannot be the tip (a floating, planar, mimic or unknown joint on the way), or null. */
  blockedBy: string | null;
}

/** Why a joint cannot be part of an arm chain, or null. */
function refusal(j: UrdfJoint): string | null {
  if (j.type === "floating" || j.type === "planar") return `${j.type} joint "${j.name}"`;
  if (!MOVING_TYPES.has(j.type) && j.type !== "fixed") return `joint "${j.name}" of unknown type "${j.type}"`;
  if (j.mimic !== null && MOVING_TYPES.has(j.type)) return `mimic joint "${j.name}"`;
  return null;
}

/** Every link below `base` reached through at least one moving joint, farthest first (then by name). */
export function tipCandidates(tree: UrdfTree, base: string): TipCandidate[] {
  const out: TipCandidate[] = [];
  const stack: { link: string; moving: number; joints: number; blockedBy: string | null }[] = [{ link: base, moving: 0, joints: 0, blockedBy: null }];
  while (stack.length) {
    const { link, moving, joints, blockedBy } = stack.pop()!;
    const kids = tree.childJoints.get(link) ?? [];
    if (moving > 0) out.push({ link, movingJoints: moving, joints, leaf: kids.length === 0, blockedBy });
    for (const j of kids) stack.push({ link: j.child, moving: moving + (MOVING_TYPES.has(j.type) ? 1 : 0), joints: joints + 1, blockedBy: blockedBy ?? refusal(j) });
  }
  // Usable tips first, then the farthest (most moving joints, then most joints), then by name.
  return out.sort((a, b) => Number(a.blockedBy !== null) - Number(b.blockedBy !== null) || b.movingJoints - a.movingJoints || b.joints - a.joints || (a.link < b.link ? -1 : a.link > b.link ? 1 : 0));
}

/** Links that have a moving joint somewhere below them: the root first, then by depth and name. */
export function baseCandidates(tree: UrdfTree): string[] {
  const depth = new Map<string, number>([[tree.root, 0]]);
  const order: string[] = [tree.root];
  for (let i = 0; i < order.length; i++) {
    for (const j of tree.childJoints.get(order[i]) ?? []) {
      depth.set(j.child, depth.get(order[i])! + 1);
      order.push(j.child);
    }
  }
  const hasMovingBelow = new Map<string, boolean>();
  for (let i = order.length - 1; i >= 0; i--) {
    const l = order[i];
    hasMovingBelow.set(l, (tree.childJoints.get(l) ?? []).some((j) => MOVING_TYPES.has(j.type) || hasMovingBelow.get(j.child)));
  }
  return order
    .filter((l) => hasMovingBelow.get(l))
    .sort((a, b) => depth.get(a)! - depth.get(b)! || (a < b ? -1 : a > b ? 1 : 0));
}
