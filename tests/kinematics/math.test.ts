import { describe, expect, it } from "vitest";
import {
  createRng,
  mat4FromPositionRpy,
  mat4InvertRigid,
  mat4MulRigid,
  minSingularValue,
  rotationAngleBetween,
} from "@/lib/kinematics";
import { choleskyInPlace, choleskySolve } from "@/lib/kinematics/math/linalg";
import { rotationErrorVector } from "@/lib/kinematics/math/mat4";
import { maxAbsDiff } from "../helpers/fd";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

describe("mat4 helpers (row-major)", () => {
  const a = mat4FromPositionRpy(new Float64Array(16), [0.1, -0.2, 0.3], [0.4, -0.5, 0.6]);
  const b = mat4FromPositionRpy(new Float64Array(16), [-0.3, 0.2, 0.1], [-1, 0.2, 2.5]);

  it("multiply: into out, returns out, inputs unchanged, alias-safe (gl-matrix spec pattern)", () => {
    const a0 = Float64Array.from(a);
    const out = new Float64Array(16);
    const ab = mat4MulRigid(out, a, b);
    expect(ab).toBe(out);
    expect(Array.from(a)).toEqual(Array.from(a0));
    const alias = Float64Array.from(a);
    mat4MulRigid(alias, alias, b);
    expect(maxAbsDiff(alias, out)).toBe(0);
  });

  it("a · a⁻¹ = I, also in place", () => {
    const inv = mat4InvertRigid(new Float64Array(16), a);
    expect(maxAbsDiff(mat4MulRigid(new Float64Array(16), a, inv), I)).toBeLessThan(1e-15);
    const self = Float64Array.from(a);
    mat4InvertRigid(self, self);
    expect(maxAbsDiff(self, inv)).toBe(0);
  });

  it("rpy builds Rz(y)·Ry(p)·Rx(r) (fixed axes X, Y, Z; Craig §2.8)", () => {
    const rx = mat4FromPositionRpy(new Float64Array(16), [0, 0, 0], [0.4, 0, 0]);
    const ry = mat4FromPositionRpy(new Float64Array(16), [0, 0, 0], [0, -0.5, 0]);
    const rz = mat4FromPositionRpy(new Float64Array(16), [0, 0, 0], [0, 0, 0.6]);
    const m = mat4MulRigid(new Float64Array(16), rz, mat4MulRigid(new Float64Array(16), ry, rx));
    m[3] = 0.1; m[7] = -0.2; m[11] = 0.3;
    expect(maxAbsDiff(m, a)).toBeLessThan(1e-15);
  });

  it("rotation error vector: known angles, including near π", () => {
    const rng = createRng(3);
    const w = new Float64Array(3);
    for (const angle of [1e-9, 0.3, 2, Math.PI - 1e-9, Math.PI]) {
      const u = [rng() - 0.5, rng() - 0.5, rng() - 0.5];
      const nu = Math.hypot(u[0], u[1], u[2]);
      const [x, y, z] = u.map((v) => v / nu);
      // Rodrigues: R = I + sinθ K + (1 − cosθ) K²
      const c = Math.cos(angle), s = Math.sin(angle), t = 1 - c;
      const R = [
        c + x * x * t, x * y * t - z * s, x * z * t + y * s, 0,
        y * x * t + z * s, c + y * y * t, y * z * t - x * s, 0,
        z * x * t - y * s, z * y * t + x * s, c + z * z * t, 0,
        0, 0, 0, 1,
      ];
      const got = rotationErrorVector(w, R, I);
      expect(got).toBeCloseTo(angle, 7);
      expect(rotationAngleBetween(R, I)).toBeCloseTo(angle, 7);
      const sign = angle > 3 && w[0] * x + w[1] * y + w[2] * z < 0 ? -1 : 1; // ±u both valid at π
      expect(maxAbsDiff(w, [sign * x * angle, sign * y * angle, sign * z * angle])).toBeLessThan(1e-6);
    }
  });
});

describe("small linear algebra", () => {
  it("Cholesky solve matches a known system", () => {
    const A = new Float64Array([4, 2, 0.4, 2, 5, 1, 0.4, 1, 3]);
    const x = [0.3, -1, 2];
    const b = [0, 1, 2].map((i) => A[3 * i] * x[0] + A[3 * i + 1] * x[1] + A[3 * i + 2] * x[2]);
    expect(choleskyInPlace(A, 3)).toBe(true);
    expect(maxAbsDiff(choleskySolve(A, 3, b, new Float64Array(3)), x)).toBeLessThan(1e-14);
    expect(choleskyInPlace(new Float64Array([1, 2, 2, 1]), 2)).toBe(false);
  });

  it("smallest singular value of a diagonal-like matrix and of a wide matrix", () => {
    // σ of diag(3, 0.5) padded with a zero column: {3, 0.5}
    expect(minSingularValue([3, 0, 0, 0, 0.5, 0], 2, 3, new Float64Array(9))).toBeCloseTo(0.5, 12);
    // tall 3×2 with orthogonal columns of norms 2 and 0.1
    expect(minSingularValue([2, 0, 0, 0.1, 0, 0], 3, 2, new Float64Array(9))).toBeCloseTo(0.1, 12);
  });
});
