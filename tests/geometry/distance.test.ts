// Closed forms of the distance engine, each written beside its check (elementary geometry,
// worked by hand), plus internal consistency: closed forms against GJK, witness points, and the
// penetration depth as the shortest separating translation.
import { describe, expect, it } from "vitest";
import {
  createDistanceResult, distancePacked, gjkPacked, packShape, shapeDistance, STRIDE,
  type Shape,
} from "@/lib/geometry";
import { createRng, uniform } from "../helpers/rng";

/** Row-major 4×4 from roll, pitch, yaw (R = Rz·Ry·Rx) and a position. */
function pose(rpy: [number, number, number], p: [number, number, number]): number[] {
  const [r, pi, y] = rpy;
  const cr = Math.cos(r), sr = Math.sin(r), cp = Math.cos(pi), sp = Math.sin(pi), cy = Math.cos(y), sy = Math.sin(y);
  return [
    cy * cp, cy * sp * sr - sy * cr, cy * sp * cr + sy * sr, p[0],
    sy * cp, sy * sp * sr + cy * cr, sy * sp * cr - cy * sr, p[1],
    -sp, cp * sr, cp * cr, p[2],
    0, 0, 0, 1,
  ];
}
/** T·x for a point given in the frame of T. */
function at(T: number[], x: [number, number, number]): [number, number, number] {
  return [0, 1, 2].map((r) => T[4 * r] * x[0] + T[4 * r + 1] * x[1] + T[4 * r + 2] * x[2] + T[4 * r + 3]) as [number, number, number];
}
const dist = (a: Shape, b: Shape) => shapeDistance(a, b);
const norm = (v: ArrayLike<number>) => Math.hypot(v[0], v[1], v[2]);

// A frame that is neither axis-aligned nor at the origin, so every closed form below is checked
// through the transforms as well.
const F = pose([0.4, -0.7, 2.1], [0.3, -0.2, 0.9]);

describe("sphere and capsule closed forms (segment–segment closest points)", () => {
  it("sphere–sphere: |c₁ − c₂| − r₁ − r₂", () => {
    // centres 0.5 m apart (3-4-5), radii 0.1 and 0.2: 0.5 − 0.3 = 0.2 m
    const r = dist({ shape: "sphere", center: at(F, [0, 0, 0]), radius: 0.1 }, { shape: "sphere", center: at(F, [0.3, 0.4, 0]), radius: 0.2 });
    expect(r.distance).toBeCloseTo(0.2, 12);
    expect(r.method).toBe("closed");
    // 0.25 m apart: overlap depth 0.3 − 0.25 = 0.05 m
    const o = dist({ shape: "sphere", center: at(F, [0, 0, 0]), radius: 0.1 }, { shape: "sphere", center: at(F, [0.15, 0.2, 0]), radius: 0.2 });
    expect(o.distance).toBe(0);
    expect(o.depth).toBeCloseTo(0.05, 12);
  });

  it("parallel capsules: the gap between the axes where they overlap in length, else endpoint to endpoint", () => {
    const a: Shape = { shape: "capsule", from: at(F, [0, 0, 0]), to: at(F, [1, 0, 0]), radius: 0.05 };
    // axes 0.3 m apart and overlapping in x: 0.3 − 0.1 = 0.2 m
    expect(dist(a, { shape: "capsule", from: at(F, [0.5, 0.3, 0]), to: at(F, [2, 0.3, 0]), radius: 0.05 }).distance).toBeCloseTo(0.2, 12);
    // no overlap in x (B starts 0.2 m past A's end): hypot(0.2, 0.3) − 0.1
    expect(dist(a, { shape: "capsule", from: at(F, [1.2, 0.3, 0]), to: at(F, [2, 0.3, 0]), radius: 0.05 }).distance).toBeCloseTo(Math.hypot(0.2, 0.3) - 0.1, 12);
  });

  it("skew capsules: the common perpendicular, or an endpoint when it falls outside", () => {
    const a: Shape = { shape: "capsule", from: at(F, [-1, 0, 0]), to: at(F, [1, 0, 0]), radius: 0.1 };
    // axes along x (z = 0) and y (z = 0.5) crossing over: 0.5 − 0.25 = 0.25 m
    expect(dist(a, { shape: "capsule", from: at(F, [0, -1, 0.5]), to: at(F, [0, 1, 0.5]), radius: 0.15 }).distance).toBeCloseTo(0.25, 12);
    // B moved to x = 2: the perpendicular's foot is beyond A's end, so (1,0,0) to (2,0,0.5): hypot(1, 0.5) − 0.25
    expect(dist(a, { shape: "capsule", from: at(F, [2, -1, 0.5]), to: at(F, [2, 1, 0.5]), radius: 0.15 }).distance).toBeCloseTo(Math.hypot(1, 0.5) - 0.25, 12);
    // crossing axes overlap by the sum of the radii
    const x = dist(a, { shape: "capsule", from: at(F, [0, -1, 0]), to: at(F, [0, 1, 0]), radius: 0.15 });
    expect(x.distance).toBe(0);
    expect(x.depth).toBeCloseTo(0.25, 12);
  });

  it("a capsule of zero length is a sphere", () => {
    const s = dist({ shape: "capsule", from: at(F, [0, 0, 0]), to: at(F, [0, 0, 0]), radius: 0.1 }, { shape: "sphere", center: at(F, [0, 0, 0.7]), radius: 0.1 });
    expect(s.distance).toBeCloseTo(0.5, 12);
  });
});

describe("capsule against a box (piecewise-quadratic minimisation in the box frame)", () => {
  // box centred in frame F, full sides 0.4 × 0.6 × 0.8 (half sides 0.2, 0.3, 0.4)
  const box: Shape = { shape: "box", pose: F, size: [0.4, 0.6, 0.8] };
  it("face: a capsule parallel to the top face 0.2 m above it", () => {
    // top face z = 0.4, axis at z = 0.6, radius 0.05: 0.2 − 0.05 = 0.15 m
    const r = dist({ shape: "capsule", from: at(F, [-0.1, 0, 0.6]), to: at(F, [0.1, 0.1, 0.6]), radius: 0.05 }, box);
    expect(r.distance).toBeCloseTo(0.15, 12);
    expect(r.method).toBe("closed");
  });
  it("edge: a capsule along the edge x = 0.2, z = 0.4, offset by (0.1, 0.1)", () => {
    // distance from the axis to the edge hypot(0.1, 0.1), minus the radius 0.02
    const r = dist({ shape: "capsule", from: at(F, [0.3, -0.1, 0.5]), to: at(F, [0.3, 0.1, 0.5]), radius: 0.02 }, box);
    expect(r.distance).toBeCloseTo(Math.hypot(0.1, 0.1) - 0.02, 12);
  });
  it("corner: a capsule pointing away from the corner (0.2, 0.3, 0.4)", () => {
    // nearest axis point (0.3, 0.5, 0.6): sqrt(0.1² + 0.2² + 0.2²) = 0.3, minus 0.05
    const r = dist({ shape: "capsule", from: at(F, [0.3, 0.5, 0.6]), to: at(F, [0.6, 0.9, 1.0]), radius: 0.05 }, box);
    expect(r.distance).toBeCloseTo(0.25, 12);
    // the closest point on the box is the corner itself
    const c = at(F, [0.2, 0.3, 0.4]);
    expect(Math.hypot(r.pointB[0] - c[0], r.pointB[1] - c[1], r.pointB[2] - c[2])).toBeLessThan(1e-12);
  });
  it("a segment crossing over an edge diagonally: the minimum lies inside the segment", () => {
    // the axis passes (0.25, 0, 0.45) going along (−1, 0, 1)/√2: its distance to the edge line
    // x = 0.2, z = 0.4 is |(0.05, 0.05)·(1, 1)/√2| = 0.05·√2
    const r = dist({ shape: "capsule", from: at(F, [0.45, 0, 0.25]), to: at(F, [0.05, 0, 0.65]), radius: 0.01 }, box);
    expect(r.distance).toBeCloseTo(0.05 * Math.SQRT2 - 0.01, 12);
  });
  it("a sphere centre inside the box: depth = radius + distance to the nearest face", () => {
    // centre at x = 0.15 (0.05 from the face x = 0.2), radius 0.05: depth 0.1
    const r = dist({ shape: "sphere", center: at(F, [0.15, 0, 0]), radius: 0.05 }, box);
    expect(r.distance).toBe(0);
    expect(r.depth).toBeCloseTo(0.1, 12);
  });
  it("a capsule through the box: the separating-axis depth", () => {
    // axis along x through the centre of a 0.4 m cube: shortest way out is sideways, 0.2 + r
    const cube: Shape = { shape: "box", pose: F, size: [0.4, 0.4, 0.4] };
    const r = dist({ shape: "capsule", from: at(F, [-0.5, 0, 0.01]), to: at(F, [0.5, 0, 0.01]), radius: 0.01 }, cube);
    expect(r.depth).toBeCloseTo(0.2 - 0.01 + 0.01, 12);
  });
});

describe("sphere against a cylinder (radial and axial distance in the cylinder frame)", () => {
  // radius 0.2, length 0.6 (half 0.3), axis along F's z
  const cyl: Shape = { shape: "cylinder", pose: F, radius: 0.2, length: 0.6 };
  it("beside, beyond the rim, above the cap, and inside", () => {
    expect(dist({ shape: "sphere", center: at(F, [0.5, 0, 0]), radius: 0.1 }, cyl).distance).toBeCloseTo(0.2, 12); // 0.5 − 0.2 − 0.1
    expect(dist({ shape: "sphere", center: at(F, [0.3, 0.4, 0.5]), radius: 0.1 }, cyl).distance).toBeCloseTo(Math.hypot(0.3, 0.2) - 0.1, 12); // ρ = 0.5
    expect(dist({ shape: "sphere", center: at(F, [0.1, 0, 0.5]), radius: 0.1 }, cyl).distance).toBeCloseTo(0.1, 12); // 0.5 − 0.3 − 0.1
    const inside = dist({ shape: "sphere", center: at(F, [0.15, 0, 0.1]), radius: 0.02 }, cyl);
    expect(inside.depth).toBeCloseTo(0.05 + 0.02, 12); // min(0.2 − 0.15, 0.3 − 0.1) + r
  });
});

describe("GJK pairs with a known answer", () => {
  it("box–box apart and overlapping (axis-aligned unit cubes)", () => {
    const a: Shape = { shape: "box", pose: pose([0, 0, 0], [0, 0, 0]), size: [1, 1, 1] };
    expect(dist(a, { shape: "box", pose: pose([0, 0, 0], [1.3, 0.2, 0]), size: [1, 1, 1] }).distance).toBeCloseTo(0.3, 10);
    const o = dist(a, { shape: "box", pose: pose([0, 0, 0], [0.8, 0.1, 0]), size: [1, 1, 1] });
    expect(o.method).toBe("gjk");
    expect(o.depth).toBeCloseTo(0.2, 8); // 1 − 0.8 along x
  });
  it("box–cylinder, capsule–cylinder and cylinder–cylinder side by side", () => {
    const cyl: Shape = { shape: "cylinder", pose: F, radius: 0.1, length: 0.4 };
    // box face 0.25 m from the axis (box centred at x = 0.35 with half side 0.1): 0.25 − 0.1 = 0.15
    expect(dist({ shape: "box", pose: pose([0.4, -0.7, 2.1], at(F, [0.35, 0, 0])), size: [0.2, 0.2, 0.2] }, cyl).distance).toBeCloseTo(0.15, 10);
    // capsule axis parallel at 0.5 m, radius 0.05: 0.5 − 0.1 − 0.05
    expect(dist({ shape: "capsule", from: at(F, [0, 0.5, -0.1]), to: at(F, [0, 0.5, 0.1]), radius: 0.05 }, cyl).distance).toBeCloseTo(0.35, 10);
    // coaxial cylinders, caps 0.3 m apart: 0.5 − 0.2 − 0.15 (half lengths 0.2 and 0.15)
    const F2 = [...F]; [F2[3], F2[7], F2[11]] = at(F, [0, 0, 0.5]);
    expect(dist({ shape: "cylinder", pose: F2, radius: 0.3, length: 0.3 }, cyl).distance).toBeCloseTo(0.15, 10);
    // the same pair sharing the centre: depth by EPA, leaving through the caps 0.2 + 0.15
    const deep = dist({ shape: "cylinder", pose: F, radius: 0.3, length: 0.3 }, cyl);
    expect(deep.depth).toBeCloseTo(0.35, 6);
  });
});

function randomShape(rng: () => number, kind: Shape["shape"]): Shape {
  const p: [number, number, number] = [uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3)];
  const rot: [number, number, number] = [uniform(rng, -3, 3), uniform(rng, -1.5, 1.5), uniform(rng, -3, 3)];
  switch (kind) {
    case "sphere": return { shape: "sphere", center: p, radius: uniform(rng, 0.01, 0.2) };
    case "capsule": return { shape: "capsule", from: p, to: [p[0] + uniform(rng, -0.4, 0.4), p[1] + uniform(rng, -0.4, 0.4), p[2] + uniform(rng, -0.4, 0.4)], radius: uniform(rng, 0.01, 0.15) };
    case "box": return { shape: "box", pose: pose(rot, p), size: [uniform(rng, 0.02, 0.5), uniform(rng, 0.02, 0.5), uniform(rng, 0.02, 0.5)] };
    default: return { shape: "cylinder", pose: pose(rot, p), radius: uniform(rng, 0.02, 0.25), length: uniform(rng, 0.02, 0.5) };
  }
}
const KINDS: Shape["shape"][] = ["sphere", "capsule", "box", "cylinder"];

describe("consistency", () => {
  it("the closed forms agree with GJK/EPA on 3 000 random pairs (distance 1e-9 m, depth 1e-7 m)", () => {
    const rng = createRng(77);
    const A = new Float64Array(STRIDE), B = new Float64Array(STRIDE);
    const c = createDistanceResult(), g = createDistanceResult();
    let n = 0;
    for (let k = 0; k < 3000; k++) {
      const ka = KINDS[k % 2], kb = KINDS[(k >> 1) % 4]; // sphere/capsule against every kind
      if (ka === "capsule" && kb === "cylinder") continue; // GJK both ways
      packShape(randomShape(rng, ka), A, 0);
      packShape(randomShape(rng, kb), B, 0);
      distancePacked(A, 0, B, 0, c);
      gjkPacked(A, 0, B, 0, g);
      expect(Math.abs(c.distance - g.distance)).toBeLessThanOrEqual(1e-9);
      expect(Math.abs(c.depth - g.depth)).toBeLessThanOrEqual(1e-7);
      n++;
    }
    expect(n).toBeGreaterThan(2000);
  });

  it("witness points lie on the shapes and realise the distance; the normal points from A to B", () => {
    const rng = createRng(5);
    for (let k = 0; k < 400; k++) {
      const a = randomShape(rng, KINDS[k % 4]), b = randomShape(rng, KINDS[(k >> 2) % 4]);
      const r = dist(a, b);
      if (r.distance === 0) continue;
      const d = [r.pointB[0] - r.pointA[0], r.pointB[1] - r.pointA[1], r.pointB[2] - r.pointA[2]];
      expect(Math.abs(norm(d) - r.distance)).toBeLessThan(1e-9);
      expect(Math.abs(d[0] * r.normal[0] + d[1] * r.normal[1] + d[2] * r.normal[2] - r.distance)).toBeLessThan(1e-9);
      // each witness is on its own shape: its distance to that shape is 0 (as a point)
      expect(dist({ shape: "sphere", center: Array.from(r.pointA), radius: 0 }, a).distance).toBeLessThan(1e-9);
      expect(dist({ shape: "sphere", center: Array.from(r.pointB), radius: 0 }, b).distance).toBeLessThan(1e-9);
    }
  });

  it("the penetration depth is the shortest separating move: B moved by depth·normal touches A, and no other direction is shorter", () => {
    const rng = createRng(11);
    let checked = 0;
    for (let k = 0; k < 300 && checked < 120; k++) {
      const a = randomShape(rng, KINDS[k % 4]), b = randomShape(rng, KINDS[(k >> 2) % 4]);
      const r = dist(a, b);
      if (r.depth <= 1e-4) continue;
      checked++;
      const n = Array.from(r.normal);
      const moved = (t: number, u: number[]) => shift(b, [u[0] * t, u[1] * t, u[2] * t]);
      const tol = r.method === "gjk" ? 2e-6 : 1e-9;
      expect(dist(a, moved(r.depth + tol + 1e-9, n)).distance).toBeGreaterThan(0);
      expect(dist(a, moved(Math.max(0, r.depth - tol - 1e-6), n)).distance).toBe(0);
      // in 12 random directions the separating move is never shorter than the depth
      for (let j = 0; j < 12; j++) {
        const u = [uniform(rng, -1, 1), uniform(rng, -1, 1), uniform(rng, -1, 1)];
        const un = norm(u);
        if (un < 0.1) continue;
        const dir = u.map((x) => x / un);
        expect(dist(a, moved(r.depth * (1 - 1e-6) - tol, dir)).distance).toBe(0);
      }
    }
    expect(checked).toBeGreaterThan(60);
  });

  it("answers do not depend on the order of the pair (distance, depth; points swapped, normal reversed)", () => {
    const rng = createRng(19);
    const ab = createDistanceResult(), ba = createDistanceResult();
    for (let k = 0; k < 200; k++) {
      const a = randomShape(rng, KINDS[k % 4]), b = randomShape(rng, KINDS[(k >> 2) % 4]);
      shapeDistance(a, b, ab);
      shapeDistance(b, a, ba);
      expect(Math.abs(ab.distance - ba.distance)).toBeLessThan(1e-9);
      expect(Math.abs(ab.depth - ba.depth)).toBeLessThan(1e-6);
      if (ab.distance > 0) for (let c = 0; c < 3; c++) expect(ab.normal[c] + ba.normal[c]).toBeCloseTo(0, 6);
    }
  });
});

/** The shape translated by d. */
function shift(s: Shape, d: number[]): Shape {
  const add = (p: ArrayLike<number>) => [p[0] + d[0], p[1] + d[1], p[2] + d[2]];
  switch (s.shape) {
    case "sphere": return { ...s, center: add(s.center) };
    case "capsule": return { ...s, from: add(s.from), to: add(s.to) };
    default: {
      const p = Array.from(s.pose);
      p[3] += d[0]; p[7] += d[1]; p[11] += d[2];
      return { ...s, pose: p };
    }
  }
}


