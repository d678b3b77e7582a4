import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { listSeedFiles, loadSeedArms, loadSeedRequirementSets, SeedDataError } from "@/seed-data/index";
import {
  computeJacobian,
  computeLinkPointJacobian,
  createData,
  createModel,
  createRng,
  forwardKinematics,
  jointAxisWorld,
  randomConfiguration,
  type ArmData,
  type ArmModel,
} from "@/lib/kinematics";

const G = 9.80665; // standard gravity, as docs/design.md#gravity fixes it

const arms = loadSeedArms();
const reqs = loadSeedRequirementSets();

describe("seed files", () => {
  it("every arm and requirement file validates against the shared schemas", () => {
    for (const f of listSeedFiles("arms")) {
      const r = armSchema.safeParse(JSON.parse(fs.readFileSync(f, "utf8")));
      expect(r.success, `${f}: ${r.success ? "" : JSON.stringify(r.error.issues)}`).toBe(true);
    }
    for (const f of listSeedFiles("requirements")) {
      const r = requirementSetSchema.safeParse(JSON.parse(fs.readFileSync(f, "utf8")));
      expect(r.success, `${f}: ${r.success ? "" : JSON.stringify(r.error.issues)}`).toBe(true);
    }
  });

  it("loads in sorted file-name order", () => {
    const names = listSeedFiles("arms");
    const urdf = listSeedFiles("urdf");
    expect([...names].sort()).toEqual(names);
    expect([...urdf].sort()).toEqual(urdf);
    expect(arms).toHaveLength(names.length + urdf.length);
    expect(reqs.length).toBeGreaterThanOrEqual(2);
  });

  it("names the file and the field when a file is invalid", () => {
    const root = fs.mkdtempSync(path.join(fs.realpathSync("/tmp"), "armsift-seed-"));
    try {
      fs.mkdirSync(path.join(root, "seed-data", "arms"), { recursive: true });
      const bad: ArmDocument = structuredClone(arms[0]);
      bad.joints[1].max = bad.joints[1].min - 1;
      fs.writeFileSync(path.join(root, "seed-data", "arms", "b-bad.json"), JSON.stringify(bad));
      fs.writeFileSync(path.join(root, "seed-data", "arms", "a-good.json"), JSON.stringify(arms[0]));
      expect(() => loadSeedArms(root)).toThrow(SeedDataError);
      expect(() => loadSeedArms(root)).toThrow(/b-bad\.json.*joints\.1\.max/);
      fs.writeFileSync(path.join(root, "seed-data", "arms", "b-bad.json"), "{ not json");
      expect(() => loadSeedArms(root)).toThrow(/b-bad\.json.*not valid JSON/);
    } finally {
      fs.rmSync(root, { recursive: true, force: true });
    }
  });
});

describe("URDF-authored seed arms", () => {
  const fromUrdf = arms.filter((a) => a.source?.format === "urdf");

  it("at least two arms come from URDF files, each recording its file and hash", () => {
    expect(fromUrdf.length).toBeGreaterThanOrEqual(2);
    for (const a of fromUrdf) {
      expect(a.convention).toBe("chain");
      const bytes = fs.readFileSync(path.join("seed-data", "urdf", a.source!.file));
      expect(a.source!.sha256, a.name).toBe(createHash("sha256").update(bytes).digest("hex"));
    }
  });

  it("one has a non-spherical wrist: the last three joint axes never meet in one point", () => {
    // Distance between the lines of axes 4 and 6 at random configurations (skew-line distance,
    // or the offset of parallel lines): zero for a spherical wrist. Plain vector geometry.
    const gap = (arm: ArmDocument): number => {
      const model = createModel(arm), data = createData(model);
      const rng = createRng(9), q = new Float64Array(model.n);
      let least = Infinity;
      for (let k = 0; k < 20; k++) {
        randomConfiguration(model, rng, q);
        forwardKinematics(model, data, q);
        const a = jointAxisWorld(model, data, 4, new Float64Array(6)), b = jointAxisWorld(model, data, 6, new Float64Array(6));
        const n = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
        const d = [b[3] - a[3], b[4] - a[4], b[5] - a[5]];
        const nn = Math.hypot(n[0], n[1], n[2]);
        const dist = nn > 1e-9 ? Math.abs(d[0] * n[0] + d[1] * n[1] + d[2] * n[2]) / nn : Math.hypot(d[1] * a[2] - d[2] * a[1], d[2] * a[0] - d[0] * a[2], d[0] * a[1] - d[1] * a[0]);
        least = Math.min(least, dist);
      }
      return least;
    };
    const gaps = fromUrdf.map((a) => [a.name, gap(a)] as const);
    expect(gaps.some(([, g]) => g > 0.05), JSON.stringify(gaps)).toBe(true);
    expect(gaps.some(([, g]) => g < 1e-9), JSON.stringify(gaps)).toBe(true);
  });
});

describe("seed arms cover the common kinds", () => {
  it("has at least six arms with unique names and model codes", () => {
    expect(arms.length).toBeGreaterThanOrEqual(6);
    expect(new Set(arms.map((a) => a.name)).size).toBe(arms.length);
    expect(new Set(arms.map((a) => a.modelCode)).size).toBe(arms.length);
  });

  it("spans 4, 5, 6 and 7 axes, both conventions and a prismatic joint", () => {
    const axes = new Set(arms.map((a) => a.joints.length));
    for (const n of [4, 5, 6, 7]) expect(axes.has(n), `an arm with ${n} axes`).toBe(true);
    expect(arms.filter((a) => a.convention === "dh").length).toBeGreaterThanOrEqual(2);
    expect(arms.filter((a) => a.convention === "mdh").length).toBeGreaterThanOrEqual(2);
    expect(arms.some((a) => a.joints.some((j) => j.type === "prismatic"))).toBe(true);
    expect(arms.some((a) => a.specs?.collaborative === true)).toBe(true);
    expect(arms.some((a) => a.specs?.collaborative === false)).toBe(true);
  });

  it("every arm has complete specs and per-joint speed, torque, mass and CoM", () => {
    for (const a of arms) {
      const s = a.specs;
      expect(s, a.name).toBeDefined();
      for (const k of ["ratedPayload", "reach", "repeatability", "armMass", "ipCode", "mounting", "wristAllowables", "collaborative", "price", "currency", "leadTimeWeeks"] as const) {
        expect(s![k], `${a.name}: specs.${k}`).toBeDefined();
      }
      expect(s!.mounting!.length).toBeGreaterThan(0);
      expect(s!.wristAllowables!.length).toBeGreaterThan(0);
      for (const w of s!.wristAllowables!) {
        expect(w.moment, `${a.name}: wrist joint ${w.joint} moment`).toBeGreaterThan(0);
        expect(w.inertia, `${a.name}: wrist joint ${w.joint} inertia`).toBeGreaterThan(0);
        // The drive of a wrist axis must at least carry its allowable moment.
        expect(a.joints[w.joint - 1].maxTorque!, `${a.name}: joint ${w.joint} maxTorque vs allowable moment`).toBeGreaterThanOrEqual(w.moment!);
      }
      a.joints.forEach((j, i) => {
        expect(j.maxSpeed, `${a.name}: joint ${i + 1} maxSpeed`).toBeGreaterThan(0);
        expect(j.maxTorque, `${a.name}: joint ${i + 1} maxTorque`).toBeGreaterThan(0);
        expect(j.mass, `${a.name}: joint ${i + 1} mass`).toBeGreaterThan(0);
        expect(j.com, `${a.name}: joint ${i + 1} com`).toHaveLength(3);
      });
      // Moving links are part of the arm, so together they weigh less than the whole arm.
      const linkMass = a.joints.reduce((sum, j) => sum + (j.mass ?? 0), 0);
      expect(linkMass, `${a.name}: link masses vs armMass`).toBeLessThan(s!.armMass!);
    }
  });
});

// Well-known robot makers and model families (from memory). Seed data must be invented, so none
// of these may appear in any seed file, as a whole word, in any letter case.
const REAL_MAKERS = [
  "ABB", "KUKA", "FANUC", "Yaskawa", "Motoman", "Kawasaki", "Staubli", "Stäubli", "Universal Robots", "Denso",
  "Epson", "Mitsubishi", "Nachi", "Comau", "Omron", "Techman", "Doosan", "Franka", "Kinova", "Rethink",
  "Hanwha", "Aubo", "JAKA", "Dobot", "Flexiv", "Yamaha", "Toshiba", "Kassow", "Neura", "UFactory", "xArm",
  "Estun", "Efort", "Siasun", "Hyundai", "Adept", "Igus", "Rokae", "Elite Robots", "Precise Automation",
];
const REAL_MODEL_PATTERNS = [/\bIRB\s?\d/i, /\bKR\s?\d/i, /\bUR\s?\d/i, /\bLBR\b/i, /\biiwa\b/i, /\bCRX\b/i, /\bLR Mate\b/i, /\bM-\d+i[A-D]\b/i, /\bTX2\b/i, /\bGP\d{1,3}\b/];

describe("seed data is fictional", () => {
  const urdfFiles = fs.readdirSync(path.join("seed-data", "urdf")).filter((f) => f.endsWith(".urdf")).map((f) => path.join("seed-data", "urdf", f));
  const files = [...listSeedFiles("arms"), ...listSeedFiles("urdf"), ...urdfFiles, ...listSeedFiles("requirements"), path.join("seed-data", "README.md")];

  it("names no real robot maker or model family", () => {
    for (const f of files) {
      const text = fs.readFileSync(f, "utf8");
      for (const m of REAL_MAKERS) {
        const re = new RegExp(`(^|[^\\p{L}\\p{N}])${m.replace(/ /g, "\\s+")}($|[^\\p{L}\\p{N}])`, "iu");
        expect(re.test(text), `${f} mentions ${m}`).toBe(false);
      }
      for (const re of REAL_MODEL_PATTERNS) expect(re.test(text), `${f} matches ${re}`).toBe(false);
    }
  });

  it("says so in every arm and scenario description", () => {
    for (const a of arms) expect(a.description, a.name).toMatch(/fictional/i);
    for (const r of reqs) expect(r.description, r.name).toMatch(/fictional/i);
  });
});

/** Horizontal distance of the tool point from the joint-1 axis (the base frame's z axis through its origin). */
function toolRadius(model: ArmModel, data: ArmData, q: Float64Array): number {
  forwardKinematics(model, data, q);
  const b = model.base, t = data.toolPose;
  const ax = b[2], ay = b[6], az = b[10];
  const vx = t[3] - b[3], vy = t[7] - b[7], vz = t[11] - b[11];
  const along = vx * ax + vy * ay + vz * az;
  return Math.hypot(vx - along * ax, vy - along * ay, vz - along * az);
}

/** Largest tool-point radius over the joint range: seeded random samples, then coordinate search. */
function maxToolRadius(model: ArmModel, data: ArmData, seed: number): { radius: number; q: Float64Array } {
  const rng = createRng(seed);
  const q = new Float64Array(model.n);
  const starts: { r: number; q: Float64Array }[] = [];
  for (let k = 0; k < 3000; k++) {
    randomConfiguration(model, rng, q);
    starts.push({ r: toolRadius(model, data, q), q: Float64Array.from(q) });
  }
  starts.sort((x, y) => y.r - x.r);
  let best = starts[0];
  for (const s of starts.slice(0, 6)) {
    const x = Float64Array.from(s.q);
    let r = s.r;
    for (let step = 0.2; step > 1e-5; step /= 2) {
      let improved = true;
      while (improved) {
        improved = false;
        for (let i = 0; i < model.n; i++) {
          for (const dir of [1, -1]) {
            const old = x[i];
            const scale = model.types[i] === "prismatic" ? (model.upper[i] - model.lower[i]) / Math.PI : 1;
            x[i] = Math.min(model.upper[i], Math.max(model.lower[i], old + dir * step * scale));
            const rn = toolRadius(model, data, x);
            if (rn > r + 1e-12) {
              r = rn;
              improved = true;
            } else x[i] = old;
          }
        }
      }
    }
    if (r > best.r) best = { r, q: Float64Array.from(x) };
  }
  return { radius: best.r, q: best.q };
}

/** Holding torque τ = Σ J_ciᵀ (0, 0, m_i g) + J_toolᵀ (0, 0, m_p g) (docs/design.md#statics). */
function holdTorque(model: ArmModel, data: ArmData, q: Float64Array, payload: number): Float64Array {
  const n = model.n;
  const jac = new Float64Array(6 * n);
  const tau = new Float64Array(n);
  for (let l = 1; l <= n; l++) {
    const m = model.mass[l - 1];
    if (m <= 0) continue;
    computeLinkPointJacobian(model, data, q, l, model.com.subarray(3 * (l - 1), 3 * l), jac);
    for (let c = 0; c < n; c++) tau[c] += jac[2 * n + c] * m * G;
  }
  computeJacobian(model, data, q, jac);
  for (let c = 0; c < n; c++) tau[c] += jac[2 * n + c] * payload * G;
  return tau;
}

// Reach definition of seed-data/README.md: largest horizontal distance from the joint-1 axis to the
// arm's tool point (the flange centre), over the joint range. Datasheets state the reach to the wrist
// centre or to the flange (common practice, no source); 5 % is the agreed consistency band. The same
// check runs independently in numpy (tests/seed-data/check_seed.py).
describe("datasheet values agree with the DH tables", () => {
  for (const [k, arm] of arms.entries()) {
    it(`${arm.name}: reach within 5 % of sampled FK, rated payload held with margin`, () => {
      const model = createModel(arm);
      const data = createData(model);
      const { radius, q } = maxToolRadius(model, data, 1000 + k);
      const reach = arm.specs!.reach!;
      expect(Math.abs(reach - radius) / radius, `reach ${reach} m vs FK ${radius.toFixed(4)} m`).toBeLessThanOrEqual(0.05);

      // At the reach-maximising (stretched, horizontal) pose the rated payload at the flange must be
      // held by every joint, with a margin, and the most loaded joint must not be oversized.
      const tau = holdTorque(model, data, q, arm.specs!.ratedPayload!);
      const ratios = Array.from(tau, (t, i) => Math.abs(t) / model.maxTorque[i]);
      const worst = Math.max(...ratios);
      expect(worst, `torque ratios ${ratios.map((x) => x.toFixed(2)).join(" ")}`).toBeLessThanOrEqual(0.9);
      expect(worst, `torque ratios ${ratios.map((x) => x.toFixed(2)).join(" ")}`).toBeGreaterThanOrEqual(0.3);

      // And anywhere in the joint range.
      const rng = createRng(77 + k);
      const qr = new Float64Array(model.n);
      for (let s = 0; s < 500; s++) {
        randomConfiguration(model, rng, qr);
        const t = holdTorque(model, data, qr, arm.specs!.ratedPayload!);
        for (let i = 0; i < model.n; i++) expect(Math.abs(t[i])).toBeLessThanOrEqual(model.maxTorque[i]);
      }
    });
  }
});

describe("seed requirement sets make a useful demo", () => {
  it("each has targets in several modes, spec musts and wants, and a placed base and tool", () => {
    for (const r of reqs) {
      expect(r.targets.length, r.name).toBeGreaterThanOrEqual(5);
      const modes = new Set(r.targets.map((t) => t.mode));
      expect(modes.has("axis") && modes.has("pose"), `${r.name}: axis and pose targets`).toBe(true);
      expect(r.specs.some((s) => s.priority === "must")).toBe(true);
      expect(r.specs.some((s) => s.priority === "want")).toBe(true);
      expect(r.tool.mass).toBeGreaterThan(0);
      expect(r.base[11], `${r.name}: base raised above the cell floor`).toBeGreaterThan(0);
    }
    expect(reqs.some((r) => r.targets.some((t) => t.force !== undefined))).toBe(true);
    expect(reqs.some((r) => r.paths.length > 0)).toBe(true);
  });

  it("the spec musts separate the arms: some pass all, some fail one", () => {
    // A minimal reading of the musts, only to keep the data interesting (the analysis owns the verdicts).
    const ipDigits = (c: string) => [c[2], c[3]].map((d) => (d === "X" ? -1 : Number(d)));
    const passes = (a: ArmDocument, s: (typeof reqs)[number]["specs"][number]): boolean => {
      const sp = a.specs!;
      if (s.field === "mounting") return sp.mounting!.includes(s.value as never);
      if (s.field === "ipCode") {
        const [h, w] = ipDigits(sp.ipCode!), [rh, rw] = ipDigits(s.value as string);
        return h >= rh && w >= rw;
      }
      if (s.field === "collaborative") return sp.collaborative === s.value;
      const v = s.field === "axes" ? a.joints.length : (sp[s.field] as number);
      return s.comparator === "atLeast" ? v >= (s.value as number) : s.comparator === "atMost" ? v <= (s.value as number) : v === s.value;
    };
    for (const r of reqs) {
      const musts = r.specs.filter((s) => s.priority === "must");
      const ok = arms.filter((a) => musts.every((s) => passes(a, s)));
      expect(ok.length, `${r.name}: arms passing every must`).toBeGreaterThanOrEqual(2);
      expect(ok.length, `${r.name}: arms passing every must`).toBeLessThan(arms.length);
      const pal = arms.find((a) => a.joints.length === 5)!;
      expect(ok.includes(pal), `${r.name}: the palletiser fails a must`).toBe(false);
    }
  });
});
