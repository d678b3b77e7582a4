/**
 * Reading a URDF file (the open robot description format: an XML `<robot>` of `<link>` and
 * `<joint>` elements) into plain typed data, with every hostile or malformed input refused by a
 * `UrdfError` that names the element.
 *
 * Defences, in this order, each cheap enough to run before the next:
 * 1. size: at most `URDF_LIMITS.bytes` (2 MiB) of UTF-8, not empty;
 * 2. any DOCTYPE or ENTITY declaration is refused outright (entity expansion, external
 *    entities), and xacro macros are refused with the advice to expand them first;
 * 3. counts before parsing, in linear passes: text runs without markup, tags and comments,
 *    attributes per element, `<link>` and `<joint>` tags, elements (the XML library's cost grows
 *    faster than linearly with some of these);
 * 4. XML well-formedness (fast-xml-parser's validator, with line and column);
 * 5. parsing with entity processing off (only XML's five predefined entities and character
 *    references are decoded, in attribute values) and a nesting limit;
 * 6. every number strict (no NaN, no text), every required attribute present.
 */
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { quote, UrdfError } from "./errors";
import { count } from "@/shared/format";

export const URDF_LIMITS = Object.freeze({
  /** Largest file (UTF-8 bytes). */
  bytes: 2 * 1024 * 1024,
  /** Most links in a robot description. */
  links: 200,
  /** Most XML elements of any kind (a 200-link description with geometry needs a few thousand). */
  elements: 10_000,
  /** Most "<" of any kind: tags, closing tags, comments, processing instructions. */
  markup: 15_000,
  /** Most attributes in one element (URDF's have at most 6). */
  attributes: 64,
  /** Deepest element nesting (URDF needs 5). */
  depth: 32,
  /** Longest stretch of text without markup (characters). */
  textRun: 64 * 1024,
});

export type Vec3 = [number, number, number];

/** `<origin xyz rpy>`: Trans(xyz)·Rz(yaw)·Ry(pitch)·Rx(roll), rpy = [roll, pitch, yaw] (m, rad). */
export interface UrdfPose {
  xyz: Vec3;
  rpy: Vec3;
  /** True when the element had no `<origin>` (identity). */
  absent: boolean;
}

type UrdfGeometry =
  | { kind: "box"; size: Vec3 }
  | { kind: "cylinder"; radius: number; length: number }
  | { kind: "sphere"; radius: number }
  | { kind: "mesh"; filename: string }
  | { kind: "other"; tag: string };

export interface UrdfCollision {
  name: string | null;
  origin: UrdfPose;
  geometry: UrdfGeometry;
}

interface UrdfInertial {
  origin: UrdfPose;
  /** kg */
  mass: number;
  /** About the centre of mass, axes of the inertial origin frame (kg·m²): ixx, iyy, izz, ixy, ixz, iyz. */
  inertia: [number, number, number, number, number, number];
}

export interface UrdfLink {
  name: string;
  inertial: UrdfInertial | null;
  collisions: UrdfCollision[];
  visuals: number;
}

interface UrdfLimit {
  lower: number | null;
  upper: number | null;
  effort: number | null;
  velocity: number | null;
}

export interface UrdfJoint {
  name: string;
  /** As written: revolute, continuous, prismatic, fixed, floating, planar (others are kept for the message). */
  type: string;
  origin: UrdfPose;
  parent: string;
  child: string;
  /** `<axis xyz>`, default (1, 0, 0) as in the URDF specification. */
  axis: Vec3;
  limit: UrdfLimit | null;
  /** Name of the joint this one mimics, if any. */
  mimic: string | null;
}

export interface UrdfRobot {
  name: string;
  links: UrdfLink[];
  joints: UrdfJoint[];
  /** Top-level elements not used by the import (transmission, gazebo, material, …) with counts. */
  ignored: Record<string, number>;
}

type Node = Record<string, unknown>;

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

const utf8Length = (text: string): number => new TextEncoder().encode(text).length;

function lineOf(text: string, index: number): number {
  let line = 1;
  for (let i = 0; i < index && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

function countMatches(text: string, re: RegExp, stopAt: number): number {
  let n = 0;
  re.lastIndex = 0;
  while (re.exec(text) !== null) if (++n > stopAt) break;
  return n;
}

interface MarkupScan {
  /** Number of "<" (tags, closing tags, comments, instructions). */
  markup: number;
  /** Most attributes in one tag, and where that tag starts. */
  maxAttributes: number;
  maxAttributesAt: number;
  /** Start of the first run of more than `URDF_LIMITS.textRun` characters without < or > (or of a comment, CDATA section or instruction that long), or −1. */
  longRunAt: number;
}

/**
 * One linear pass over the text (quote-aware inside tags; comments, CDATA and processing
 * instructions skipped whole), so that the limits are known before any XML library sees the text.
 */
function scanMarkup(text: string): MarkupScan {
  let markup = 0, maxAttributes = 0, maxAttributesAt = 0, longRunAt = -1, runStart = 0;
  const n = text.length;
  const skipTo = (from: number, end: string): number => {
    const k = text.indexOf(end, from);
    return k < 0 ? n : k + end.length - 1;
  };
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 62 /* > */) runStart = i + 1;
    else if (c !== 60 /* < */) {
      if (longRunAt < 0 && i - runStart >= URDF_LIMITS.textRun) longRunAt = runStart;
      continue;
    }
    if (c !== 60) continue;
    markup++;
    const skipped = text.startsWith("<!--", i) ? "-->" : text.startsWith("<![CDATA[", i) ? "]]>" : text.startsWith("<?", i) ? "?>" : null;
    if (skipped) {
      const start = i;
      i = skipTo(i + 2, skipped);
      if (i - start > URDF_LIMITS.textRun && longRunAt < 0) longRunAt = start;
      runStart = i + 1;
      continue;
    }
    // A tag: count "=" outside quotes up to the closing ">".
    const start = i;
    let attributes = 0, quote = 0;
    for (i++; i < n; i++) {
      const d = text.charCodeAt(i);
      if (quote) { if (d === quote) quote = 0; }
      else if (d === 34 || d === 39) quote = d;
      else if (d === 61 /* = */) attributes++;
      else if (d === 62 /* > */ || d === 60 /* < */) break;
    }
    if (attributes > maxAttributes) { maxAttributes = attributes; maxAttributesAt = start; }
    if (i - start > URDF_LIMITS.textRun && longRunAt < 0) longRunAt = start;
    if (i < n && text.charCodeAt(i) === 60) i--;
    runStart = i + 1;
  }
  return { markup, maxAttributes, maxAttributesAt, longRunAt };
}

/** Steps 1–3 of the defences (no XML parsing yet). */
function prescan(text: string): void {
  if (typeof text !== "string") throw new UrdfError("file", "must be text");
  // Exact size up to 8 × the limit (a UTF-8 character is at least one byte, so longer text is surely over).
  const bytes = text.length > 8 * URDF_LIMITS.bytes ? Infinity : utf8Length(text);
  if (bytes > URDF_LIMITS.bytes) {
    const size = Number.isFinite(bytes) ? `${count(bytes)} bytes` : `more than ${count(URDF_LIMITS.bytes)} bytes`;
    throw new UrdfError("file", `is ${size}; the limit is 2 MiB (${count(URDF_LIMITS.bytes)} bytes)`);
  }
  if (text.trim() === "") throw new UrdfError("file", "is empty");
  const doctype = /<!DOCTYPE|<!ENTITY/i.exec(text);
  if (doctype) {
    throw new UrdfError(`<!${doctype[0].slice(2).toUpperCase()}> (line ${lineOf(text, doctype.index)})`, "DOCTYPE and entity declarations are refused: a robot description needs none, and they can expand without bound or read other files");
  }
  const xacro = /xmlns:xacro|<xacro:|\$\{|\$\(/.exec(text);
  if (xacro) {
    throw new UrdfError(`${quote(xacro[0])} (line ${lineOf(text, xacro.index)})`, "this is a xacro file: macros are not expanded here; expand it first (run xacro on it) and import the resulting URDF");
  }
  const links = countMatches(text, /<link[\s/>]/g, URDF_LIMITS.links);
  if (links > URDF_LIMITS.links) throw new UrdfError("<link>", `the file has more than ${URDF_LIMITS.links} links; the limit is ${URDF_LIMITS.links}`);
  // <joint> also appears inside <transmission>, so allow two per link.
  const joints = countMatches(text, /<joint[\s/>]/g, 2 * URDF_LIMITS.links);
  if (joints > 2 * URDF_LIMITS.links) throw new UrdfError("<joint>", `the file has more than ${2 * URDF_LIMITS.links} joint elements; a robot of at most ${URDF_LIMITS.links} links has fewer than ${URDF_LIMITS.links} joints`);
  const scan = scanMarkup(text);
  if (scan.longRunAt >= 0) throw new UrdfError(`file (line ${lineOf(text, scan.longRunAt)})`, `has more than ${URDF_LIMITS.textRun / 1024} KiB of text without markup: not a robot description`);
  if (scan.markup > URDF_LIMITS.markup) throw new UrdfError("file", `has more than ${count(URDF_LIMITS.markup)} tags and comments; a robot description of at most ${URDF_LIMITS.links} links needs far fewer`);
  if (scan.maxAttributes > URDF_LIMITS.attributes) throw new UrdfError(`file (line ${lineOf(text, scan.maxAttributesAt)})`, `an element has ${scan.maxAttributes} attributes; URDF elements have at most 6 (the limit is ${URDF_LIMITS.attributes})`);
  const elements = countMatches(text, /<[A-Za-z_]/g, URDF_LIMITS.elements);
  if (elements > URDF_LIMITS.elements) throw new UrdfError("file", `has more than ${count(URDF_LIMITS.elements)} XML elements; a robot description of at most ${URDF_LIMITS.links} links needs far fewer`);
}

const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: "@",
  processEntities: false,
  htmlEntities: false,
  parseTagValue: false,
  parseAttributeValue: false,
  ignoreDeclaration: true,
  ignorePiTags: true,
  trimValues: true,
  maxNestedTags: URDF_LIMITS.depth,
  isArray: (_name: string, _path: unknown, _leaf: boolean, isAttribute: boolean) => !isAttribute,
});

/** Child elements with this tag (an empty element such as `<origin/>` is read as text: an empty node). */
function children(node: Node, tag: string): Node[] {
  if (!Object.prototype.hasOwnProperty.call(node, tag)) return [];
  const v = node[tag];
  return Array.isArray(v) ? v.map((x) => (x !== null && typeof x === "object" ? (x as Node) : { "#text": String(x ?? "") })) : [];
}

function one(node: Node, tag: string, where: string): Node | null {
  const list = children(node, tag);
  if (list.length > 1) throw new UrdfError(`${where} <${tag}>`, `appears ${list.length} times; at most once`);
  return list[0] ?? null;
}

const PREDEFINED: Record<string, string> = { lt: "<", gt: ">", amp: "&", quot: '"', apos: "'" };

/**
 * Attribute text with XML's five predefined entities and character references decoded (entity
 * processing of the parser is off; these need no declaration and cannot expand).
 */
function decode(v: string): string {
  if (!v.includes("&")) return v;
  return v.replace(/&(lt|gt|amp|quot|apos|#\d{1,7}|#x[0-9a-fA-F]{1,6});/g, (m, e: string) => {
    if (e[0] !== "#") return PREDEFINED[e];
    const code = e[1] === "x" ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
    return code > 0 && code <= 0x10ffff && !(code >= 0xd800 && code <= 0xdfff) ? String.fromCodePoint(code) : m;
  });
}

function attr(node: Node, name: string): string | null {
  const v = node[`@${name}`];
  return typeof v === "string" ? decode(v) : null;
}

function requiredAttr(node: Node, name: string, where: string): string {
  const v = attr(node, name);
  if (v === null || v.trim() === "") throw new UrdfError(`${where} ${name}`, "is required");
  return v.trim();
}

function number(text: string, where: string): number {
  const t = text.trim();
  // The length check keeps the pattern test linear (a double needs at most about 25 characters).
  if (t.length > 64 || !NUMBER.test(t)) throw new UrdfError(where, `${quote(t)} is not a number`);
  const v = Number(t);
  if (!Number.isFinite(v)) throw new UrdfError(where, `${quote(t)} is not a finite number`);
  return v;
}

function optionalNumber(node: Node, name: string, where: string): number | null {
  const v = attr(node, name);
  return v === null ? null : number(v, `${where} ${name}`);
}

function vector(text: string, where: string): Vec3 {
  const parts = text.trim().split(/\s+/).filter((p) => p !== "");
  if (parts.length !== 3) throw new UrdfError(where, `${quote(text.trim())} must be 3 numbers separated by spaces`);
  return [number(parts[0], where), number(parts[1], where), number(parts[2], where)];
}

function pose(node: Node, where: string): UrdfPose {
  const o = one(node, "origin", where);
  if (!o) return { xyz: [0, 0, 0], rpy: [0, 0, 0], absent: true };
  const xyz = attr(o, "xyz"), rpy = attr(o, "rpy");
  return {
    xyz: xyz === null ? [0, 0, 0] : vector(xyz, `${where} <origin> xyz`),
    rpy: rpy === null ? [0, 0, 0] : vector(rpy, `${where} <origin> rpy`),
    absent: false,
  };
}

function positive(v: number, where: string): number {
  if (!(v > 0)) throw new UrdfError(where, `${v} must be > 0`);
  return v;
}

function geometry(node: Node, where: string): UrdfGeometry {
  const g = one(node, "geometry", where);
  if (!g) throw new UrdfError(`${where} <geometry>`, "is required");
  const kinds = Object.keys(g).filter((k) => !k.startsWith("@") && k !== "#text");
  if (kinds.length !== 1) throw new UrdfError(`${where} <geometry>`, kinds.length === 0 ? "is empty: give a box, cylinder, sphere or mesh" : `holds ${kinds.length} shapes (${kinds.join(", ")}); one is allowed`);
  const kind = kinds[0];
  const s = children(g, kind)[0] ?? {};
  const at = `${where} <${kind}>`;
  switch (kind) {
    case "box": {
      const size = vector(requiredAttr(s, "size", at), `${at} size`);
      size.forEach((v) => positive(v, `${at} size`));
      return { kind, size };
    }
    case "cylinder":
      return { kind, radius: positive(number(requiredAttr(s, "radius", at), `${at} radius`), `${at} radius`), length: positive(number(requiredAttr(s, "length", at), `${at} length`), `${at} length`) };
    case "sphere":
      return { kind, radius: positive(number(requiredAttr(s, "radius", at), `${at} radius`), `${at} radius`) };
    case "mesh":
      return { kind, filename: attr(s, "filename") ?? "" };
    default:
      return { kind: "other", tag: kind };
  }
}

function inertial(node: Node, where: string): UrdfInertial | null {
  const n = one(node, "inertial", where);
  if (!n) return null;
  const at = `${where} <inertial>`;
  const m = one(n, "mass", at);
  if (!m) throw new UrdfError(`${at} <mass>`, "is required");
  const mass = number(requiredAttr(m, "value", `${at} <mass>`), `${at} <mass> value`);
  if (mass < 0) throw new UrdfError(`${at} <mass> value`, `${mass} must be ≥ 0`);
  const i = one(n, "inertia", at);
  const ii = (k: string): number => (i ? optionalNumber(i, k, `${at} <inertia>`) ?? 0 : 0);
  const inertia: UrdfInertial["inertia"] = [ii("ixx"), ii("iyy"), ii("izz"), ii("ixy"), ii("ixz"), ii("iyz")];
  for (const [k, v] of [["ixx", inertia[0]], ["iyy", inertia[1]], ["izz", inertia[2]]] as const) {
    if (v < 0) throw new UrdfError(`${at} <inertia> ${k}`, `${v} must be ≥ 0`);
  }
  return { origin: pose(n, at), mass, inertia };
}

function link(node: Node): UrdfLink {
  const name = requiredAttr(node, "name", "<link>");
  const where = `link ${quote(name)}`;
  const collisions = children(node, "collision").map((c, k) => {
    const at = `${where} <collision> ${k + 1}`;
    return { name: attr(c, "name"), origin: pose(c, at), geometry: geometry(c, at) };
  });
  return { name, inertial: inertial(node, where), collisions, visuals: children(node, "visual").length };
}

function joint(node: Node): UrdfJoint {
  const name = requiredAttr(node, "name", "<joint>");
  const where = `joint ${quote(name)}`;
  const type = requiredAttr(node, "type", where);
  const parentEl = one(node, "parent", where);
  const childEl = one(node, "child", where);
  if (!parentEl) throw new UrdfError(`${where} <parent>`, "is required");
  if (!childEl) throw new UrdfError(`${where} <child>`, "is required");
  const axisEl = one(node, "axis", where);
  const axisText = axisEl ? attr(axisEl, "xyz") : null;
  const axis = axisText === null ? ([1, 0, 0] as Vec3) : vector(axisText, `${where} <axis> xyz`);
  const limitEl = one(node, "limit", where);
  const at = `${where} <limit>`;
  const limit = limitEl
    ? { lower: optionalNumber(limitEl, "lower", at), upper: optionalNumber(limitEl, "upper", at), effort: optionalNumber(limitEl, "effort", at), velocity: optionalNumber(limitEl, "velocity", at) }
    : null;
  const mimicEl = one(node, "mimic", where);
  return {
    name,
    type,
    origin: pose(node, where),
    parent: requiredAttr(parentEl, "link", `${where} <parent>`),
    child: requiredAttr(childEl, "link", `${where} <child>`),
    axis,
    limit,
    mimic: mimicEl ? attr(mimicEl, "joint") ?? "" : null,
  };
}

/**
 * Parses URDF text into a `UrdfRobot` (links, joints, the top-level elements it does not use).
 * Checks the file and each element on its own; the tree (parents, cycles, roots) is checked by
 * `buildTree`. @throws UrdfError naming the element.
 */
export function parseUrdf(text: string): UrdfRobot {
  prescan(text);
  const valid = XMLValidator.validate(text, { allowBooleanAttributes: false });
  if (valid !== true) {
    throw new UrdfError(`file (line ${valid.err.line}, column ${valid.err.col})`, `is not well-formed XML: ${valid.err.msg}`);
  }
  let doc: Node;
  try {
    doc = parser.parse(text) as Node;
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    throw new UrdfError("file", /nested/i.test(msg) ? `elements are nested more than ${URDF_LIMITS.depth} deep` : `cannot be read as XML: ${msg.slice(0, 160)}`);
  }
  const tops = Object.keys(doc).filter((k) => !k.startsWith("@") && k !== "#text");
  const robots = children(doc, "robot");
  if (robots.length !== 1 || tops.length !== 1) {
    throw new UrdfError(tops.length ? `<${tops.find((t) => t !== "robot") ?? "robot"}>` : "file", robots.length === 0 ? "the root element must be <robot>" : "a file holds exactly one <robot> and nothing else");
  }
  const robot = robots[0];
  const name = (attr(robot, "name") ?? "").trim();
  const ignored: Record<string, number> = {};
  for (const k of Object.keys(robot)) {
    if (k.startsWith("@") || k === "#text" || k === "link" || k === "joint") continue;
    ignored[k] = children(robot, k).length;
  }
  const links = children(robot, "link").map(link);
  const joints = children(robot, "joint").map(joint);
  if (links.length === 0) throw new UrdfError("<robot>", "has no <link>");
  if (links.length > URDF_LIMITS.links) throw new UrdfError("<link>", `the robot has ${links.length} links; the limit is ${URDF_LIMITS.links}`);
  return { name, links, joints, ignored };
}
