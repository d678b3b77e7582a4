/**
 * The three.js side of the 3-D view: one WebGL canvas, an HTML label layer, orbit/pan/zoom by
 * mouse, touch and keyboard, preset views, a PNG screenshot, and a small read-only inspection
 * surface on the canvas element (`canvas.armsiftView`) that tests and the benchmark use to read
 * the scene back. Renders on demand only (after a change), so an idle view costs nothing.
 *
 * The world is z-up and in metres, exactly the frame of the content (scene.ts): poses go into
 * object matrices unchanged (row-major → three's column-major), so the drawn frames are the
 * kinematics library's numbers in double precision.
 */
import {
  AmbientLight, BoxGeometry, BufferGeometry, CapsuleGeometry, Color, ConeGeometry, CylinderGeometry, DirectionalLight, EdgesGeometry,
  Float32BufferAttribute, Group, InstancedMesh, Line, LineBasicMaterial, LineDashedMaterial, LineSegments, Matrix4, Mesh, MeshLambertMaterial,
  Object3D, PerspectiveCamera, Quaternion, Scene, SphereGeometry, TorusGeometry, Vector3, WebGLRenderer, type Material,
} from "three";
import { OrbitControls } from "three/addons/controls/OrbitControls.js";
import { CSS2DObject, CSS2DRenderer } from "three/addons/renderers/CSS2DRenderer.js";
import { mergeGeometries } from "three/addons/utils/BufferGeometryUtils.js";
import { VERDICT_SYMBOL } from "../shortlist/verdict";
import { bounds, contentPoints, focusPoints, gridStep, originOf, pairBodies, type ArmFigure, type ForceMark, type ObstacleMark, type PairMark, type PathMark, type Pose, type SceneContent, type TargetMark, type Vec3 } from "./scene";
import { magnitude } from "@/shared/format";

/** The palette of the view (our own): a warm drafting-paper ground with ink-like parts. */
const PALETTE = {
  background: "#f3f0e8",
  gridMinor: "#e1dccf",
  gridMajor: "#c9c0ad",
  x: "#c4513b",
  y: "#4f9653",
  z: "#3a69b0",
  link: "#27545d",
  capsule: "#4a8a90",
  joint: "#cf8a2e",
  ghost: "#8b81a6",
  target: "#3c3a36",
  reached: "#2f7448",
  missed: "#b0344a",
  path: "#6a4c9c",
  obstacle: "#a39379",
  body: "#5f7fa3",
  ellipsoid: "#e3a531",
  force: "#b0344a",
  payload: "#1d1c1a",
  cursor: "#6a4c9c",
  mount: "#6f6656",
  pair: "#c2376e",
} as const;

export type PresetView = "iso" | "top" | "front" | "side";
/** Direction from the point looked at to the camera, per preset (z up). */
const PRESET_DIRECTIONS: Record<PresetView, Vec3> = {
  iso: [1, -1.15, 0.85],
  top: [0, -1e-4, 1],
  front: [0, -1, 0],
  side: [1, 0, 0],
};
export const PRESET_LABEL: Record<PresetView, string> = { iso: "Iso", top: "Top (from +Z)", front: "Front (from −Y)", side: "Side (from +X)" };

/** Keyboard bindings, listed on screen beside the view. */
export const KEY_HELP: [string, string][] = [
  ["← → ↑ ↓", "orbit"],
  ["Shift + arrows", "pan"],
  ["+ / −", "zoom in / out"],
  ["R", "reset the view"],
  ["T, F, S, I", "top, front, side, iso view"],
];

const ORBIT_STEP = (10 * Math.PI) / 180;
const ZOOM_STEP = 0.8;

const UP = new Vector3(0, 0, 1);
const Y_AXIS = new Vector3(0, 1, 0);

/** Row-major pose → three Matrix4. */
function matrixOf(p: ArrayLike<number>, out = new Matrix4()): Matrix4 {
  return out.set(p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7], p[8], p[9], p[10], p[11], p[12], p[13], p[14], p[15]);
}
/** three Matrix4 → row-major pose. */
function poseOf(m: Matrix4): number[] {
  const e = m.elements;
  return [e[0], e[4], e[8], e[12], e[1], e[5], e[9], e[13], e[2], e[6], e[10], e[14], e[3], e[7], e[11], e[15]];
}

/** What tests and the benchmark can read from a live view (never changes the scene). */
interface ViewInspection {
  /** World pose (row-major) of the drawn tool-point frame, or null without an arm. */
  toolFrame(): number[] | null;
  /** World poses of the drawn joint frames. */
  jointFrames(): number[][];
  /** Ends of the drawn closest-pair gap (cell frame), or null. */
  pairEnds(): [Vec3, Vec3] | null;
  camera(): { position: Vec3; target: Vec3 };
  /** Canvas pixel (CSS px from the top left) after a fresh render: [r, g, b, a]. */
  pixel(x: number, y: number): number[];
  /** A world point projected to CSS px of the canvas. */
  project(p: Vec3): [number, number];
  /** Background colour as [r, g, b] (0–255). */
  background(): number[];
  /** Fraction of the canvas' pixels that differ from the background after a fresh render. */
  coverage(): number;
  /** Renders `frames` frames while orbiting, each finished on the GPU (a 1-pixel read); ms per frame. */
  frameTimes(frames: number): number[];
  stats(): { drawCalls: number; triangles: number; labels: number; width: number; height: number };
}

interface Owned {
  geometries: BufferGeometry[];
  materials: Material[];
}

function lambert(color: string, opacity = 1): MeshLambertMaterial {
  return new MeshLambertMaterial({ color, transparent: opacity < 1, opacity, depthWrite: opacity >= 1 });
}

export class Viewer {
  readonly canvas: HTMLCanvasElement;
  private readonly host: HTMLElement;
  private readonly renderer: WebGLRenderer;
  private readonly labels: CSS2DRenderer;
  private readonly scene = new Scene();
  private readonly camera = new PerspectiveCamera(38, 1, 0.001, 100);
  private readonly controls: OrbitControls;
  private readonly resize: ResizeObserver;
  private readonly groups = {
    grid: new Group(), world: new Group(), arm: new Group(), ghosts: new Group(), mount: new Group(),
    targets: new Group(), paths: new Group(), obstacles: new Group(), bodies: new Group(), force: new Group(), cursor: new Group(), pair: new Group(),
  };
  private readonly owned = new Map<keyof Viewer["groups"], Owned>();
  private content: SceneContent = {};
  private size = 1;
  private toolObject: Object3D | null = null;
  private jointObjects: Object3D[] = [];
  private pending = 0;
  /** The preset the camera sits at untouched (re-framed when the canvas is resized), or null once moved. */
  private framed: PresetView | null = null;
  private disposed = false;
  private readonly shared = {
    // Low triangle counts: software WebGL (no GPU) pays per triangle.
    rod: new CylinderGeometry(1, 1, 1, 8, 1),
    cone: new ConeGeometry(1, 1, 10, 1),
    sphere: new SphereGeometry(1, 12, 8),
    box: new BoxGeometry(1, 1, 1),
    boxEdges: new EdgesGeometry(new BoxGeometry(1, 1, 1)),
    ring: new TorusGeometry(1, 0.14, 3, 12),
  };
  private readonly mats = {
    x: lambert(PALETTE.x), y: lambert(PALETTE.y), z: lambert(PALETTE.z),
    link: lambert(PALETTE.link), capsule: lambert(PALETTE.capsule, 0.55), joint: lambert(PALETTE.joint),
    ghost: lambert(PALETTE.ghost, 0.35), reached: lambert(PALETTE.reached), missed: lambert(PALETTE.missed), target: lambert(PALETTE.target),
    path: lambert(PALETTE.path), obstacle: lambert(PALETTE.obstacle, 0.42), body: lambert(PALETTE.body, 0.5), ellipsoid: lambert(PALETTE.ellipsoid, 0.3),
    force: lambert(PALETTE.force), payload: lambert(PALETTE.payload), cursor: lambert(PALETTE.cursor), mount: lambert(PALETTE.mount),
    pair: lambert(PALETTE.pair, 0.6), pairSolid: lambert(PALETTE.pair),
  };

  /**
   * Throws when no WebGL context can be made (the caller shows the fallback). `antialias` off
   * halves the frame time of software WebGL (multisampling is done on the CPU there).
   */
  constructor(host: HTMLElement, canvas: HTMLCanvasElement, opts: { antialias?: boolean } = {}) {
    this.host = host;
    this.canvas = canvas;
    this.renderer = new WebGLRenderer({ canvas, antialias: opts.antialias ?? true, alpha: false, powerPreference: "low-power" });
    this.renderer.setPixelRatio(Math.min(2, window.devicePixelRatio || 1));
    this.renderer.setClearColor(new Color(PALETTE.background), 1);
    this.labels = new CSS2DRenderer();
    this.labels.domElement.className = "v3-labels";
    host.appendChild(this.labels.domElement);
    this.scene.background = new Color(PALETTE.background);
    this.camera.up.copy(UP);
    this.scene.add(new AmbientLight("#ffffff", 1.2));
    const head = new DirectionalLight("#ffffff", 1.6);
    head.position.set(0.3, 0.2, 1);
    this.camera.add(head);
    this.scene.add(this.camera);
    for (const g of Object.values(this.groups)) this.scene.add(g);
    this.controls = new OrbitControls(this.camera, canvas);
    this.controls.enableDamping = false;
    this.controls.screenSpacePanning = true;
    this.controls.addEventListener("change", () => this.requestRender());
    this.controls.addEventListener("start", () => (this.framed = null));
    this.resize = new ResizeObserver(() => this.fitCanvas());
    this.resize.observe(host);
    this.fitCanvas();
    (canvas as HTMLCanvasElement & { armsiftView?: ViewInspection }).armsiftView = this.inspection();
  }

  private fitCanvas(): void {
    const w = Math.max(1, this.host.clientWidth), h = Math.max(1, this.host.clientHeight);
    this.renderer.setSize(w, h, true);
    this.labels.setSize(w, h);
    this.camera.aspect = w / h;
    this.camera.updateProjectionMatrix();
    if (this.framed) this.frameView(bounds(focusPoints(this.content)), this.framed);
    this.requestRender();
  }

  /** Renders on the next animation frame (once, however often it is asked). */
  requestRender(): void {
    if (this.pending || this.disposed) return;
    this.pending = requestAnimationFrame(() => {
      this.pending = 0;
      this.render();
    });
  }

  render(): void {
    if (this.disposed) return;
    this.renderer.render(this.scene, this.camera);
    this.labels.render(this.scene, this.camera);
  }

  /** Replaces what is drawn; parts that are the same object as before are kept. */
  setContent(c: SceneContent, opts: { frame?: boolean } = {}): void {
    const prev = this.content;
    this.content = c;
    // Marks are sized by what the camera frames (the arm and its targets); the grid spans everything.
    const b = bounds(contentPoints(c));
    const focus = bounds(focusPoints(c));
    const resized = Math.abs(focus.size - this.size) / this.size > 0.25 || opts.frame;
    this.size = focus.size;
    if (c.arm !== prev.arm || c.toolLabel !== prev.toolLabel) this.rebuild("arm", () => this.buildArm(c.arm ?? null, false, c.toolLabel ?? "tool point"));
    if (c.ghosts !== prev.ghosts) this.rebuild("ghosts", () => (c.ghosts ?? []).flatMap((g) => this.buildArm(g, true, "")));
    if (c.mount !== prev.mount) this.rebuild("mount", () => (c.mount ? [this.frameMark(c.mount, this.size * 0.08, "arm base", true)] : []));
    if (c.targets !== prev.targets || resized) this.rebuild("targets", () => this.buildTargets(c.targets ?? []));
    if (c.paths !== prev.paths || resized) this.rebuild("paths", () => (c.paths ?? []).map((p) => this.buildPath(p)));
    if (c.obstacles !== prev.obstacles) this.rebuild("obstacles", () => (c.obstacles ?? []).map((o) => this.buildObstacle(o, this.mats.obstacle, "obstacle")));
    if (c.bodies !== prev.bodies) this.rebuild("bodies", () => (c.bodies ?? []).map((o) => this.buildObstacle(o, this.mats.body, "body")));
    if (c.force !== prev.force) this.rebuild("force", () => (c.force ? [this.buildForce(c.force)] : []));
    if (c.pair !== prev.pair || c.arm !== prev.arm || c.obstacles !== prev.obstacles || c.bodies !== prev.bodies || resized) {
      this.rebuild("pair", () => (c.pair ? [this.buildPair(c.pair, c)] : []));
    }
    if (c.cursor !== prev.cursor || resized) this.rebuild("cursor", () => (c.cursor ? [this.buildCursor(c.cursor)] : []));
    if (resized || this.groups.grid.children.length === 0 || c.floorZ !== prev.floorZ || c.originLabel !== prev.originLabel) {
      this.rebuild("grid", () => [this.buildGrid(b, c.floorZ ?? 0)]);
      const origin = c.originLabel === undefined ? "cell origin" : c.originLabel;
      this.rebuild("world", () => (origin === null ? [] : [this.frameMark(IDENTITY_POSE, focus.size * 0.1, origin, true)]));
    }
    if (opts.frame) this.frameView(focus, "iso");
    this.requestRender();
  }

  /** The grid step in use (m), for the legend. */
  gridStep(): number {
    return gridStep(this.size);
  }

  private rebuild(key: keyof Viewer["groups"], make: () => Object3D[]): void {
    const g = this.groups[key];
    const old = this.owned.get(key);
    for (const child of [...g.children]) {
      child.traverse((o) => {
        if (o instanceof CSS2DObject) o.element.remove();
        if (o instanceof InstancedMesh) o.dispose();
      });
      g.remove(child);
    }
    old?.geometries.forEach((x) => x.dispose());
    old?.materials.forEach((x) => x.dispose());
    const own: Owned = { geometries: [], materials: [] };
    this.owned.set(key, own);
    this.building = own;
    for (const o of make()) g.add(o);
    this.batch(g);
    this.building = null;
  }

  /**
   * Merges the group's plain meshes that share a material into one mesh each (vertices moved to
   * where the meshes were), so a group costs a few draw calls instead of one per rod: software
   * WebGL pays dearly per call. Objects that carry a pose (frames) stay, without their meshes.
   */
  private batch(g: Group): void {
    g.updateMatrixWorld(true);
    const byMaterial = new Map<Material, BufferGeometry[]>();
    const drop: Mesh[] = [];
    g.traverse((o) => {
      if (!(o instanceof Mesh) || o instanceof InstancedMesh || Array.isArray(o.material) || !o.geometry.index) return;
      const geo = o.geometry.clone().applyMatrix4(o.matrixWorld);
      const list = byMaterial.get(o.material) ?? [];
      list.push(geo);
      byMaterial.set(o.material, list);
      drop.push(o);
    });
    for (const m of drop) m.removeFromParent();
    for (const [mat, list] of byMaterial) {
      const merged = list.length === 1 ? list[0] : mergeGeometries(list, false);
      if (list.length > 1) list.forEach((x) => x.dispose());
      if (!merged) continue;
      this.own(merged);
      g.add(new Mesh(merged, mat));
    }
  }
  private building: Owned | null = null;
  private own<T extends BufferGeometry>(geo: T): T {
    this.building?.geometries.push(geo);
    return geo;
  }
  private ownMat<T extends Material>(m: T): T {
    this.building?.materials.push(m);
    return m;
  }

  private label(text: string, at: Vec3, cls: string): CSS2DObject {
    const el = document.createElement("div");
    el.className = `v3-label ${cls}`;
    el.textContent = text;
    const o = new CSS2DObject(el);
    o.position.set(at[0], at[1], at[2]);
    return o;
  }

  /** A rod from a to b (m) of radius r. */
  private rod(a: Vec3, b: Vec3, r: number, mat: Material): Mesh {
    const va = new Vector3(...a), vb = new Vector3(...b);
    const d = vb.clone().sub(va);
    const len = d.length();
    const m = new Mesh(this.shared.rod, mat);
    m.position.copy(va).addScaledVector(d, 0.5);
    if (len > 0) m.quaternion.setFromUnitVectors(Y_AXIS, d.normalize());
    m.scale.set(r, Math.max(len, 1e-9), r);
    return m;
  }

  private arrow(from: Vec3, vec: Vec3, r: number, mat: Material): Group {
    const g = new Group();
    const v = new Vector3(...vec);
    const len = v.length();
    if (len <= 0) return g;
    const head = Math.min(len * 0.35, r * 6);
    const dir = v.clone().normalize();
    const neck: Vec3 = [from[0] + dir.x * (len - head), from[1] + dir.y * (len - head), from[2] + dir.z * (len - head)];
    g.add(this.rod(from, neck, r, mat));
    const c = new Mesh(this.shared.cone, mat);
    c.position.set(neck[0] + dir.x * head / 2, neck[1] + dir.y * head / 2, neck[2] + dir.z * head / 2);
    c.quaternion.setFromUnitVectors(Y_AXIS, dir);
    c.scale.set(r * 2.6, head, r * 2.6);
    g.add(c);
    return g;
  }

  /** A frame (x, y, z rods) at a pose; its matrix is the pose itself. */
  private frameMark(pose: ArrayLike<number>, len: number, name: string, letters: boolean, cls = "frame"): Object3D {
    const o = new Object3D();
    o.matrixAutoUpdate = false;
    matrixOf(pose, o.matrix);
    const r = len * 0.045;
    o.add(this.rod([0, 0, 0], [len, 0, 0], r, this.mats.x));
    o.add(this.rod([0, 0, 0], [0, len, 0], r, this.mats.y));
    o.add(this.rod([0, 0, 0], [0, 0, len], r, this.mats.z));
    if (letters) {
      o.add(this.label("x", [len * 1.15, 0, 0], "axis x"));
      o.add(this.label("y", [0, len * 1.15, 0], "axis y"));
      o.add(this.label("z", [0, 0, len * 1.15], "axis z"));
    }
    if (name) o.add(this.label(name, [-len * 0.25, -len * 0.25, -len * 0.2], cls));
    return o;
  }

  private buildArm(a: ArmFigure | null, ghost: boolean, toolLabel: string): Object3D[] {
    if (!ghost) {
      this.toolObject = null;
      this.jointObjects = [];
    }
    if (!a) return [];
    const out: Object3D[] = [];
    const s = a.size;
    const r = s * 0.008;
    const linkMat = ghost ? this.mats.ghost : this.mats.link;
    for (const [p, q] of a.segments) out.push(this.rod(p, q, r, linkMat));
    for (const c of a.capsules) {
      const len = Math.hypot(c.to[0] - c.from[0], c.to[1] - c.from[1], c.to[2] - c.from[2]);
      const m = new Mesh(this.own(new CapsuleGeometry(c.radius, len, 3, 10)), ghost ? this.mats.ghost : this.mats.capsule);
      m.position.set((c.from[0] + c.to[0]) / 2, (c.from[1] + c.to[1]) / 2, (c.from[2] + c.to[2]) / 2);
      if (len > 0) m.quaternion.setFromUnitVectors(Y_AXIS, new Vector3(c.to[0] - c.from[0], c.to[1] - c.from[1], c.to[2] - c.from[2]).normalize());
      out.push(m);
    }
    const jr = s * 0.016;
    for (const j of a.joints) {
      const axis = new Vector3(...j.axis);
      const body = new Mesh(j.type === "revolute" ? this.shared.rod : this.shared.box, ghost ? this.mats.ghost : this.mats.joint);
      body.position.set(...j.origin);
      body.quaternion.setFromUnitVectors(Y_AXIS, axis);
      if (j.type === "revolute") body.scale.set(jr, jr * 3, jr);
      else body.scale.set(jr * 1.6, jr * 3.4, jr * 1.6);
      out.push(body);
      if (!ghost) {
        const f = this.frameMark(j.frame, s * 0.075, "", false);
        f.add(this.label(String(j.number), [0, 0, s * 0.09], "joint-number"));
        this.jointObjects.push(f);
        out.push(f);
      }
    }
    if (!ghost) {
      out.push(this.frameMark(a.mount, s * 0.07, "base", false, "frame"));
      const plinth = new Mesh(this.shared.rod, this.mats.mount);
      plinth.matrixAutoUpdate = false;
      plinth.matrix.copy(matrixOf(a.mount)).multiply(new Matrix4().makeRotationX(Math.PI / 2)).multiply(new Matrix4().makeScale(s * 0.06, s * 0.012, s * 0.06)).multiply(new Matrix4().makeTranslation(0, -0.5, 0));
      out.push(plinth);
      const tool = this.frameMark(a.tool, s * 0.08, toolLabel, true, "frame tool");
      this.toolObject = tool;
      out.push(tool);
    } else {
      out.push(this.frameMark(a.tool, s * 0.05, "", false));
    }
    return out;
  }

  private buildTargets(ts: TargetMark[]): Object3D[] {
    if (ts.length === 0) return [];
    const len = this.size * 0.045;
    const m = new Matrix4();
    const out: Object3D[] = [];
    // Every target's frame as thin lines in one draw call; the selected one also as solid rods.
    const pos: number[] = [], col: number[] = [];
    const colors = [new Color(PALETTE.x), new Color(PALETTE.y), new Color(PALETTE.z)];
    const rings: TargetMark[] = [], crosses: TargetMark[] = [];
    ts.forEach((t) => {
      const o = originOf(t.pose);
      for (let k = 0; k < 3; k++) {
        pos.push(o[0], o[1], o[2], o[0] + t.pose[k] * len, o[1] + t.pose[4 + k] * len, o[2] + t.pose[8 + k] * len);
        col.push(colors[k].r, colors[k].g, colors[k].b, colors[k].r, colors[k].g, colors[k].b);
      }
      if (t.selected) out.push(this.frameMark(t.pose, len * 1.6, "", false));
      if (!t.status || t.status.reached) rings.push(t);
      else crosses.push(t);
      if (t.label !== false) {
        const word = t.status ? ` ${VERDICT_SYMBOL[t.status.verdict]} ${t.status.verdict}${t.status.reached ? "" : " (not reached)"}` : "";
        const cls = `target${t.selected ? " selected" : ""}${t.status ? (t.status.reached ? " reached" : " missed") : ""}`;
        const l = this.label(`${t.name}${word}`, o, cls);
        l.center.set(0, 0.5);
        out.push(l);
      }
    });
    const geo = this.own(new BufferGeometry());
    geo.setAttribute("position", new Float32BufferAttribute(pos, 3));
    geo.setAttribute("color", new Float32BufferAttribute(col, 3));
    out.push(new LineSegments(geo, this.ownMat(new LineBasicMaterial({ vertexColors: true }))));
    // Reached (or not yet analysed) targets: a ring about the tool z axis; missed ones: a cross.
    // The selected target's mark is solid; the others are drawn as lines (no triangles to pay for).
    const ringPts: number[] = [], crossPts: number[] = [];
    const at = (t: TargetMark, x: number, y: number, out3: number[]) => {
      const p = t.pose;
      out3.push(p[0] * x + p[1] * y + p[3], p[4] * x + p[5] * y + p[7], p[8] * x + p[9] * y + p[11]);
    };
    const SEG = 12;
    for (const t of rings) {
      const rr = (t.selected ? 0.5 : 0.3) * len;
      if (t.selected) {
        const mesh = new Mesh(this.shared.ring, t.status ? this.mats.reached : this.mats.target);
        mesh.matrixAutoUpdate = false;
        mesh.matrix.copy(matrixOf(t.pose, m).multiply(new Matrix4().makeScale(rr, rr, rr)));
        out.push(mesh);
        continue;
      }
      for (let k = 0; k < SEG; k++) {
        const a0 = (2 * Math.PI * k) / SEG, a1 = (2 * Math.PI * (k + 1)) / SEG;
        at(t, rr * Math.cos(a0), rr * Math.sin(a0), ringPts);
        at(t, rr * Math.cos(a1), rr * Math.sin(a1), ringPts);
      }
    }
    for (const t of crosses) {
      const rr = ((t.selected ? 0.9 : 0.6) * len) / 2;
      if (t.selected) {
        for (let k = 0; k < 2; k++) {
          const bar = new Mesh(this.shared.box, this.mats.missed);
          bar.matrixAutoUpdate = false;
          bar.matrix.copy(matrixOf(t.pose, new Matrix4()).multiply(new Matrix4().makeRotationZ(Math.PI / 4 + (k * Math.PI) / 2)).multiply(new Matrix4().makeScale(2 * rr, rr * 0.32, rr * 0.32)));
          out.push(bar);
        }
        continue;
      }
      at(t, -rr, -rr, crossPts); at(t, rr, rr, crossPts);
      at(t, -rr, rr, crossPts); at(t, rr, -rr, crossPts);
    }
    for (const [pts, color] of [[ringPts, rings.some((t) => t.status) ? PALETTE.reached : PALETTE.target], [crossPts, PALETTE.missed]] as const) {
      if (!pts.length) continue;
      const lg = this.own(new BufferGeometry());
      lg.setAttribute("position", new Float32BufferAttribute(pts, 3));
      out.push(new LineSegments(lg, this.ownMat(new LineBasicMaterial({ color }))));
    }
    return out;
  }

  private buildPath(p: PathMark): Object3D {
    const g = new Group();
    const geo = this.own(new BufferGeometry());
    geo.setAttribute("position", new Float32BufferAttribute(p.points.flat(), 3));
    g.add(new Line(geo, this.ownMat(new LineBasicMaterial({ color: PALETTE.path }))));
    const r = this.size * (p.selected ? 0.005 : 0.0035);
    for (let k = 0; k + 1 < p.points.length; k++) g.add(this.rod(p.points[k], p.points[k + 1], r, this.mats.path));
    if (p.marks.length) {
      const cones = new InstancedMesh(this.shared.cone, this.mats.path, p.marks.length);
      const m = new Matrix4(), q = new Quaternion(), pos = new Vector3(), sc = new Vector3(), dir = new Vector3();
      const h = this.size * 0.022;
      p.marks.forEach((mk, i) => {
        dir.set(...mk.dir);
        q.setFromUnitVectors(Y_AXIS, dir);
        cones.setMatrixAt(i, m.compose(pos.set(...mk.at), q, sc.set(h * 0.4, h, h * 0.4)));
      });
      cones.instanceMatrix.needsUpdate = true;
      g.add(cones);
    }
    if (p.points.length) {
      g.add(this.label(`${p.name}: start`, p.points[0], "path"));
      g.add(this.label("end", p.points[p.points.length - 1], "path"));
    }
    return g;
  }

  private buildObstacle(o: ObstacleMark, material: Material, cls: string | null): Object3D {
    const g = new Group();
    let labelAt: Vec3;
    if (o.shape === "box") {
      const m = matrixOf(o.pose).multiply(new Matrix4().makeScale(...o.size));
      const mesh = new Mesh(this.shared.box, material);
      const edges = new LineSegments(this.shared.boxEdges, this.ownMat(new LineBasicMaterial({ color: "#6d6150" })));
      for (const x of [mesh, edges]) {
        x.matrixAutoUpdate = false;
        x.matrix.copy(m);
        g.add(x);
      }
      const c = originOf(o.pose);
      labelAt = [c[0], c[1], c[2] + o.size[2] / 2];
    } else if (o.shape === "sphere") {
      const mesh = new Mesh(this.shared.sphere, material);
      mesh.position.set(...o.center);
      mesh.scale.setScalar(o.radius);
      g.add(mesh);
      labelAt = [o.center[0], o.center[1], o.center[2] + o.radius];
    } else if (o.shape === "cylinder") {
      const mesh = new Mesh(this.shared.rod, material);
      mesh.matrixAutoUpdate = false;
      mesh.matrix.copy(matrixOf(o.pose)).multiply(new Matrix4().makeRotationX(Math.PI / 2)).multiply(new Matrix4().makeScale(o.radius, o.length, o.radius));
      g.add(mesh);
      const c = originOf(o.pose);
      labelAt = [c[0], c[1], c[2] + o.length / 2];
    } else {
      const d = new Vector3(o.to[0] - o.from[0], o.to[1] - o.from[1], o.to[2] - o.from[2]);
      const mesh = new Mesh(this.own(new CapsuleGeometry(o.radius, d.length(), 3, 10)), material);
      mesh.position.set((o.from[0] + o.to[0]) / 2, (o.from[1] + o.to[1]) / 2, (o.from[2] + o.to[2]) / 2);
      if (d.length() > 0) mesh.quaternion.setFromUnitVectors(Y_AXIS, d.normalize());
      g.add(mesh);
      labelAt = [mesh.position.x, mesh.position.y, mesh.position.z + o.radius];
    }
    if (cls) g.add(this.label(o.name, labelAt, cls));
    return g;
  }

  private buildForce(f: ForceMark): Object3D {
    const g = new Group();
    const k = f.metresPerNewton;
    const finite = f.axes.map((a) => a.radius).filter((r): r is number => r !== null);
    const cap = Math.max(this.size * 0.6, ...finite.map((r) => r * k * 1.5));
    const r = this.size * 0.003;
    const sphere = new Mesh(this.shared.sphere, this.mats.payload);
    sphere.position.set(...f.point);
    sphere.scale.setScalar(this.size * 0.008);
    g.add(sphere);
    g.add(this.label("payload point", [f.point[0], f.point[1], f.point[2] + this.size * 0.02], "payload"));
    if (k > 0 && f.axes.length === 3) {
      const semi = f.axes.map((a) => (a.radius === null ? cap : a.radius * k));
      const basis = new Matrix4().makeBasis(
        new Vector3(...f.axes[0].dir).multiplyScalar(Math.max(semi[0], 1e-6)),
        new Vector3(...f.axes[1].dir).multiplyScalar(Math.max(semi[1], 1e-6)),
        new Vector3(...f.axes[2].dir).multiplyScalar(Math.max(semi[2], 1e-6)),
      );
      basis.setPosition(...f.point);
      const ell = new Mesh(this.shared.sphere, this.mats.ellipsoid);
      ell.matrixAutoUpdate = false;
      ell.matrix.copy(basis);
      g.add(ell);
      f.axes.forEach((a, i) => {
        const d = a.dir, s = semi[i];
        const p: Vec3 = [f.point[0] + d[0] * s, f.point[1] + d[1] * s, f.point[2] + d[2] * s];
        const n: Vec3 = [f.point[0] - d[0] * s, f.point[1] - d[1] * s, f.point[2] - d[2] * s];
        if (a.radius === null) {
          const geo = this.own(new BufferGeometry());
          geo.setAttribute("position", new Float32BufferAttribute([...n, ...p], 3));
          const line = new Line(geo, this.ownMat(new LineDashedMaterial({ color: "#8a5d10", dashSize: this.size * 0.02, gapSize: this.size * 0.012 })));
          line.computeLineDistances();
          g.add(line);
          g.add(this.label("unbounded", p, "ellipsoid"));
        } else {
          g.add(this.rod(n, p, r, this.mats.ellipsoid));
          g.add(this.label(`${magnitude(a.radius)} ${f.weighted ? "N" : "N per N·m"}`, p, "ellipsoid"));
        }
      });
    }
    if (f.force && f.forceAt && k > 0) {
      const v: Vec3 = [f.force[0] * k, f.force[1] * k, f.force[2] * k];
      g.add(this.arrow(f.forceAt, v, this.size * 0.005, this.mats.force));
      const n = Math.hypot(...f.force);
      g.add(this.label(`required force ${magnitude(n)} N`, [f.forceAt[0] + v[0], f.forceAt[1] + v[1], f.forceAt[2] + v[2]], "force"));
    }
    return g;
  }

  /** The closest pair: both bodies drawn over in the pair colour, the gap as a rod between the closest points, and its words. */
  private buildPair(p: PairMark, c: SceneContent): Object3D {
    const g = new Group();
    const hit = pairBodies(p, c.arm ?? null, c.obstacles ?? [], c.bodies ?? []);
    const s = this.size;
    for (const [a, b] of hit.segments) g.add(this.rod(a, b, s * 0.016, this.mats.pair));
    for (const cap of hit.capsules) {
      const len = Math.hypot(cap.to[0] - cap.from[0], cap.to[1] - cap.from[1], cap.to[2] - cap.from[2]);
      const m = new Mesh(this.own(new CapsuleGeometry(cap.radius * 1.06, len, 3, 10)), this.mats.pair);
      m.position.set((cap.from[0] + cap.to[0]) / 2, (cap.from[1] + cap.to[1]) / 2, (cap.from[2] + cap.to[2]) / 2);
      if (len > 0) m.quaternion.setFromUnitVectors(Y_AXIS, new Vector3(cap.to[0] - cap.from[0], cap.to[1] - cap.from[1], cap.to[2] - cap.from[2]).normalize());
      g.add(m);
    }
    for (const o of hit.shapes) g.add(this.buildObstacle(o, this.mats.pair, null));
    let at: Vec3 | null = null;
    if (p.pointA && p.pointB) {
      g.add(this.rod(p.pointA, p.pointB, s * 0.003, this.mats.pairSolid));
      for (const q of [p.pointA, p.pointB]) {
        const dot = new Mesh(this.shared.sphere, this.mats.pairSolid);
        dot.position.set(...q);
        dot.scale.setScalar(s * 0.007);
        g.add(dot);
      }
      at = [(p.pointA[0] + p.pointB[0]) / 2, (p.pointA[1] + p.pointB[1]) / 2, (p.pointA[2] + p.pointB[2]) / 2];
    } else if (hit.segments.length) {
      const [a, b] = hit.segments[0];
      at = [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2, (a[2] + b[2]) / 2];
    } else if (hit.shapes.length) at = contentPoints({ obstacles: [hit.shapes[0]] })[0];
    if (at) {
      const l = this.label(p.text, at, "pair");
      l.center.set(0, 1.2);
      g.add(l);
    }
    this.pairEnds = p.pointA && p.pointB ? [p.pointA, p.pointB] : null;
    return g;
  }
  private pairEnds: [Vec3, Vec3] | null = null;

  private buildCursor(c: { at: Vec3; text: string }): Object3D {
    const g = new Group();
    const s = new Mesh(this.shared.sphere, this.mats.cursor);
    s.position.set(...c.at);
    s.scale.setScalar(this.size * 0.01);
    g.add(s);
    g.add(this.label(c.text, [c.at[0], c.at[1], c.at[2] + this.size * 0.025], "cursor"));
    return g;
  }

  private buildGrid(b: ReturnType<typeof bounds>, z: number): Object3D {
    const step = gridStep(b.size);
    const half = Math.ceil((Math.max(b.max[0] - b.min[0], b.max[1] - b.min[1]) / 2 + b.size * 0.25) / step) * step;
    const cx = Math.round(b.center[0] / step) * step, cy = Math.round(b.center[1] / step) * step;
    const minor: number[] = [], major: number[] = [];
    const count = Math.round(half / step);
    for (let i = -count; i <= count; i++) {
      const x = cx + i * step, y = cy + i * step;
      const dst = Math.round(x / step) % 5 === 0 ? major : minor;
      dst.push(x, cy - half, z, x, cy + half, z);
      const dst2 = Math.round(y / step) % 5 === 0 ? major : minor;
      dst2.push(cx - half, y, z, cx + half, y, z);
    }
    const g = new Group();
    for (const [pts, color] of [[minor, PALETTE.gridMinor], [major, PALETTE.gridMajor]] as const) {
      const geo = this.own(new BufferGeometry());
      geo.setAttribute("position", new Float32BufferAttribute(pts, 3));
      g.add(new LineSegments(geo, this.ownMat(new LineBasicMaterial({ color }))));
    }
    return g;
  }

  /** Points the camera at the content from a preset direction. */
  private frameView(b: ReturnType<typeof bounds>, preset: PresetView): void {
    const d = new Vector3(...PRESET_DIRECTIONS[preset]).normalize();
    const fov = (this.camera.fov * Math.PI) / 180;
    const fit = Math.min(1, this.camera.aspect);
    const dist = (b.size * 0.52) / Math.sin(fov / 2) / fit;
    this.controls.target.set(...b.center);
    this.camera.position.copy(this.controls.target).addScaledVector(d, dist);
    this.camera.near = Math.max(1e-4, b.size / 1000);
    this.camera.far = b.size * 200 + dist;
    this.camera.updateProjectionMatrix();
    this.camera.lookAt(this.controls.target);
    this.controls.update();
    this.framed = preset;
  }

  /** A preset view framing the current content; `reset` is the iso view the view opens with. */
  view(preset: PresetView | "reset"): void {
    this.frameView(bounds(focusPoints(this.content)), preset === "reset" ? "iso" : preset);
    this.requestRender();
  }

  /** Orbits about the point looked at (rad): azimuth about the cell z axis, then elevation. */
  orbit(dAzimuth: number, dElevation: number): void {
    this.framed = null;
    const t = this.controls.target;
    const off = this.camera.position.clone().sub(t);
    const r = off.length();
    let az = Math.atan2(off.y, off.x) + dAzimuth;
    let el = Math.asin(Math.max(-1, Math.min(1, off.z / r))) + dElevation;
    const lim = Math.PI / 2 - 1e-3;
    el = Math.max(-lim, Math.min(lim, el));
    if (!Number.isFinite(az)) az = 0;
    this.camera.position.set(t.x + r * Math.cos(el) * Math.cos(az), t.y + r * Math.cos(el) * Math.sin(az), t.z + r * Math.sin(el));
    this.camera.lookAt(t);
    this.controls.update();
    this.requestRender();
  }

  /** Pans by fractions of the view height (right, up on screen). */
  pan(right: number, up: number): void {
    this.framed = null;
    const t = this.controls.target;
    const dist = this.camera.position.distanceTo(t);
    const h = 2 * dist * Math.tan((this.camera.fov * Math.PI) / 360);
    const fwd = t.clone().sub(this.camera.position).normalize();
    const rightV = fwd.clone().cross(this.camera.up).normalize();
    const upV = rightV.clone().cross(fwd).normalize();
    const move = rightV.multiplyScalar(right * h).add(upV.multiplyScalar(up * h));
    this.camera.position.add(move);
    t.add(move);
    this.controls.update();
    this.requestRender();
  }

  /** Moves the camera towards (factor < 1) or away from the point looked at. */
  zoom(factor: number): void {
    this.framed = null;
    const t = this.controls.target;
    const off = this.camera.position.clone().sub(t).multiplyScalar(factor);
    this.camera.position.copy(t).add(off);
    this.controls.update();
    this.requestRender();
  }

  /** Keyboard bindings of KEY_HELP; true when the key was used. */
  handleKey(key: string, shift: boolean): boolean {
    const arrows: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, 1], ArrowDown: [0, -1] };
    if (key in arrows) {
      const [x, y] = arrows[key];
      if (shift) this.pan(-x * 0.08, -y * 0.08);
      else this.orbit(-x * ORBIT_STEP, -y * ORBIT_STEP);
      return true;
    }
    switch (key) {
      case "+": case "=": this.zoom(ZOOM_STEP); return true;
      case "-": case "_": case "−": this.zoom(1 / ZOOM_STEP); return true;
      case "r": case "R": this.view("reset"); return true;
      case "t": case "T": this.view("top"); return true;
      case "f": case "F": this.view("front"); return true;
      case "s": case "S": this.view("side"); return true;
      case "i": case "I": this.view("iso"); return true;
      default: return false;
    }
  }

  /** A PNG of the view with its labels drawn in and a caption line (units, scales) below. */
  screenshot(caption: string): Promise<Blob> {
    this.render();
    const src = this.canvas;
    const dpr = src.width / Math.max(1, src.clientWidth);
    const lines = wrap(caption, Math.max(40, Math.floor(src.clientWidth / 7)));
    const strip = Math.round((10 + 16 * lines.length) * dpr);
    const out = document.createElement("canvas");
    out.width = src.width;
    out.height = src.height + strip;
    const ctx = out.getContext("2d");
    if (!ctx) return Promise.reject(new Error("no 2-D canvas for the screenshot"));
    ctx.fillStyle = "#ffffff";
    ctx.fillRect(0, 0, out.width, out.height);
    ctx.drawImage(src, 0, 0);
    ctx.font = `${Math.round(12 * dpr)}px system-ui, sans-serif`;
    ctx.textBaseline = "middle";
    ctx.lineJoin = "round";
    this.scene.traverseVisible((o) => {
      if (!(o instanceof CSS2DObject)) return;
      const p = new Vector3().setFromMatrixPosition(o.matrixWorld).project(this.camera);
      if (p.z < -1 || p.z > 1) return;
      const x = ((p.x + 1) / 2) * src.width, y = ((1 - p.y) / 2) * src.height;
      const text = o.element.textContent ?? "";
      const w = ctx.measureText(text).width;
      ctx.lineWidth = 3 * dpr;
      ctx.strokeStyle = "rgba(255,255,255,0.9)";
      const left = o.center.x === 0 ? x + 6 * dpr : x - w * o.center.x;
      ctx.strokeText(text, left, y);
      ctx.fillStyle = "#1d1c1a";
      ctx.fillText(text, left, y);
    });
    ctx.fillStyle = "#1d1c1a";
    lines.forEach((l, i) => ctx.fillText(l, 8 * dpr, src.height + (13 + 16 * i) * dpr));
    return new Promise((resolve, reject) => out.toBlob((b) => (b ? resolve(b) : reject(new Error("the browser made no PNG"))), "image/png"));
  }

  private inspection(): ViewInspection {
    const gl = () => this.renderer.getContext();
    const read = (x: number, y: number) => {
      const buf = new Uint8Array(4);
      const g = gl();
      g.readPixels(x, y, 1, 1, g.RGBA, g.UNSIGNED_BYTE, buf);
      return Array.from(buf);
    };
    return {
      toolFrame: () => {
        if (!this.toolObject) return null;
        this.scene.updateMatrixWorld(true);
        return poseOf(this.toolObject.matrixWorld);
      },
      jointFrames: () => {
        this.scene.updateMatrixWorld(true);
        return this.jointObjects.map((o) => poseOf(o.matrixWorld));
      },
      pairEnds: () => (this.groups.pair.children.length ? this.pairEnds : null),
      camera: () => ({ position: this.camera.position.toArray() as Vec3, target: this.controls.target.toArray() as Vec3 }),
      pixel: (x, y) => {
        this.render();
        const dpr = this.canvas.width / Math.max(1, this.canvas.clientWidth);
        return read(Math.round(x * dpr), Math.round(this.canvas.height - y * dpr - 1));
      },
      project: (p) => {
        this.scene.updateMatrixWorld(true);
        const v = new Vector3(...p).project(this.camera);
        return [((v.x + 1) / 2) * this.canvas.clientWidth, ((1 - v.y) / 2) * this.canvas.clientHeight];
      },
      background: () => hexRgb(PALETTE.background),
      coverage: () => {
        this.render();
        const g = gl();
        const w = g.drawingBufferWidth, h = g.drawingBufferHeight;
        const buf = new Uint8Array(w * h * 4);
        g.readPixels(0, 0, w, h, g.RGBA, g.UNSIGNED_BYTE, buf);
        const bg = hexRgb(PALETTE.background);
        let differ = 0;
        for (let i = 0; i < buf.length; i += 4) if (Math.abs(buf[i] - bg[0]) + Math.abs(buf[i + 1] - bg[1]) + Math.abs(buf[i + 2] - bg[2]) > 12) differ++;
        return differ / (w * h);
      },
      frameTimes: (frames) => {
        const times: number[] = [];
        for (let i = 0; i < frames; i++) {
          this.orbit((2 * Math.PI) / frames, 0);
          const t0 = performance.now();
          this.render();
          read(0, 0);
          times.push(performance.now() - t0);
        }
        return times;
      },
      stats: () => {
        this.render();
        let labels = 0;
        this.scene.traverse((o) => { if (o instanceof CSS2DObject) labels++; });
        return { drawCalls: this.renderer.info.render.calls, triangles: this.renderer.info.render.triangles, labels, width: this.canvas.width, height: this.canvas.height };
      },
    };
  }

  dispose(): void {
    this.disposed = true;
    if (this.pending) cancelAnimationFrame(this.pending);
    this.resize.disconnect();
    this.controls.dispose();
    for (const k of Object.keys(this.groups) as (keyof Viewer["groups"])[]) this.rebuild(k, () => []);
    Object.values(this.shared).forEach((g) => g.dispose());
    Object.values(this.mats).forEach((m) => m.dispose());
    this.labels.domElement.remove();
    this.renderer.dispose();
    this.renderer.forceContextLoss();
    delete (this.canvas as HTMLCanvasElement & { armsiftView?: ViewInspection }).armsiftView;
  }
}

const IDENTITY_POSE: Pose = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];


/** "#rrggbb" → [r, g, b] (0–255), as the canvas shows it. */
const hexRgb = (h: string): number[] => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16));

function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/)) {
    if (line && line.length + word.length + 1 > width) {
      out.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) out.push(line);
  return out;
}
