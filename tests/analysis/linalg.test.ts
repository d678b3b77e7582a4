import { describe, expect, it } from "vitest";
import { Matrix, SingularValueDecomposition, pseudoInverse } from "ml-matrix";
import { svdRows, symmetricEigen, pseudoInverseSolve, determinant, cholesky } from "@/lib/analysis/linalg";
import { REF } from "./fixtures";

describe("svdRows", () => {
  // Source: numpy.linalg.svd (tests/reference/analysis_reference.py).
  for (const c of REF.linalg.filter((x: { symmetric?: boolean }) => !x.symmetric)) {
    it(`singular values of a ${c.m}×${c.n} matrix match numpy`, () => {
      const r = svdRows(c.a, c.m, c.n);
      for (let i = 0; i < c.m; i++) expect(r.sigma[i]).toBeCloseTo(c.sigma[i], 10);
      // A = U·W reconstructs the input.
      for (let i = 0; i < c.m; i++) for (let k = 0; k < c.n; k++) {
        let s = 0;
        for (let j = 0; j < c.m; j++) s += r.u[i * c.m + j] * r.w[j * c.n + k];
        expect(s).toBeCloseTo(c.a[i * c.n + k], 10);
      }
    });
  }

  it("agrees with ml-matrix on a random 6×7 matrix (independent library)", () => {
    const a = Array.from({ length: 42 }, (_, i) => Math.sin(i * 1.7) + 0.3 * Math.cos(i * i));
    const ours = svdRows(a, 6, 7).sigma;
    const theirs = new SingularValueDecomposition(new Matrix(Array.from({ length: 6 }, (_, r) => a.slice(r * 7, r * 7 + 7)))).diagonal;
    for (let i = 0; i < 6; i++) expect(ours[i]).toBeCloseTo(theirs[i], 10);
  });

  it("keeps a tiny singular value accurate (no squaring)", () => {
    // diag(1, 1e-9) rotated: σ_min must come back as 1e-9 to many digits.
    const c = Math.cos(0.3), s = Math.sin(0.3);
    const a = [c * 1, -s * 1e-9, s * 1, c * 1e-9];
    const r = svdRows(a, 2, 2);
    expect(r.sigma[1] / 1e-9).toBeCloseTo(1, 9);
  });

  it("solves the minimum-norm least-squares problem like the pseudo-inverse (ml-matrix)", () => {
    const a = [1, 2, 0, -1, 0.5, 1, 3, 0, 0, 1, 1, 1];
    const b = [1, -2, 0.5];
    const x = pseudoInverseSolve(svdRows(a, 3, 4), b);
    const A = new Matrix([a.slice(0, 4), a.slice(4, 8), a.slice(8, 12)]);
    const ref = pseudoInverse(A).mmul(Matrix.columnVector(b)).to1DArray();
    for (let i = 0; i < 4; i++) expect(x[i]).toBeCloseTo(ref[i], 10);
  });
});

describe("symmetricEigen, determinant, cholesky", () => {
  for (const c of REF.linalg.filter((x: { symmetric?: boolean }) => x.symmetric)) {
    it(`eigenvalues of a ${c.k}×${c.k} symmetric matrix match numpy.linalg.eigvalsh`, () => {
      const { values, vectors } = symmetricEigen(c.a, c.k);
      for (let i = 0; i < c.k; i++) expect(values[i]).toBeCloseTo(c.eigenvalues[i], 10);
      // S v = λ v
      for (let j = 0; j < c.k; j++) for (let r = 0; r < c.k; r++) {
        let s = 0;
        for (let p = 0; p < c.k; p++) s += c.a[r * c.k + p] * vectors[p * c.k + j];
        expect(s).toBeCloseTo(values[j] * vectors[r * c.k + j], 10);
      }
    });
  }
  it("determinant and Cholesky of small matrices (hand-checkable)", () => {
    expect(determinant([1, 2, 3, 4], 2)).toBeCloseTo(-2, 14);
    expect(determinant([0, 1, 0, 1, 0, 0, 0, 0, 1], 3)).toBeCloseTo(-1, 14);
    expect(cholesky([4, 2, 2, 3], 2)).toEqual(Float64Array.from([2, 0, 1, Math.SQRT2]));
    expect(cholesky([1, 2, 2, 1], 2)).toBeNull();
  });
});
