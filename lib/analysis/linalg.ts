/**
 * Small dense linear algebra for the analysis (row-major `Float64Array`s, SI units irrelevant here).
 *
 * - `svdRows`: singular value decomposition of an m×n matrix by one-sided (Hestenes) Jacobi
 *   rotations applied to its rows (Golub & Van Loan, "Matrix Computations", 4th ed., §8.6.3; from
 *   memory). It is accurate for small singular values (no squaring of the matrix), deterministic,
 *   and cheap for the 3×n and 6×n blocks of a Jacobian.
 * - `symmetricEigen`: cyclic Jacobi eigenvalue method for a small symmetric matrix
 *   (Golub & Van Loan §8.5; from memory).
 *
 * Both allocate their results (the analysis is not the IK hot path). The Jacobi sweeps are the
 * kinematics' own (`jacobiEigenInPlace`), so both parts share one implementation.
 */
import { jacobiEigenInPlace, jacobiRotation, rotatePair } from "@/lib/kinematics/math/linalg";

const cs = new Float64Array(2);

/** Result of {@link svdRows} for an m×n matrix A = U·diag(σ)·Vᵀ (only the first m right vectors). */
export interface SvdRows {
  /** Rows m of the input. */
  m: number;
  /** Columns n of the input. */
  n: number;
  /** Singular values, descending, length m (zeros where m > rank). */
  sigma: Float64Array;
  /** Left singular vectors as the COLUMNS of this row-major m×m matrix (U[r*m + j] = u_j[r]). */
  u: Float64Array;
  /**
   * Row j holds σ_j·v_j (length n each, m rows, row-major): the input's rows after the
   * orthogonalising rotation, so that A = U·W. Divide by σ_j to get the right singular vector.
   */
  w: Float64Array;
}

/**
 * Singular values and left singular vectors of the m×n row-major matrix `a` (rows `rowStart` to
 * `rowStart + m − 1` of a matrix with `n` columns), by one-sided Jacobi rotations on the rows.
 * Converges to machine precision in a few sweeps for m ≤ 6. Does not modify `a`.
 */
export function svdRows(a: ArrayLike<number>, m: number, n: number, rowStart = 0): SvdRows {
  const w = new Float64Array(m * n);
  for (let i = 0; i < m * n; i++) w[i] = a[rowStart * n + i];
  const u = new Float64Array(m * m);
  for (let i = 0; i < m; i++) u[i * m + i] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    let rotated = false;
    for (let p = 0; p < m - 1; p++) {
      for (let q = p + 1; q < m; q++) {
        let alpha = 0, beta = 0, gamma = 0;
        for (let k = 0; k < n; k++) {
          const x = w[p * n + k], y = w[q * n + k];
          alpha += x * x; beta += y * y; gamma += x * y;
        }
        if (gamma === 0 || Math.abs(gamma) <= 1e-15 * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        jacobiRotation((beta - alpha) / (2 * gamma), cs);
        rotatePair(w, p * n, q * n, 1, n, cs[0], cs[1]); // rows p and q of W
        rotatePair(u, p, q, m, m, cs[0], cs[1]); // columns p and q of U
      }
    }
    if (!rotated) break;
  }
  const norms = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    let s = 0;
    for (let k = 0; k < n; k++) s += w[j * n + k] * w[j * n + k];
    norms[j] = Math.sqrt(s);
  }
  // Sort descending (insertion sort, stable on index for ties, so the result is deterministic).
  const order = new Int32Array(m);
  for (let j = 0; j < m; j++) {
    let p = j;
    while (p > 0 && norms[order[p - 1]] < norms[j]) { order[p] = order[p - 1]; p--; }
    order[p] = j;
  }
  let sorted = true;
  for (let j = 0; j < m; j++) if (order[j] !== j) sorted = false;
  if (sorted) return { m, n, sigma: norms, u, w };
  const sigma = new Float64Array(m), uS = new Float64Array(m * m), wS = new Float64Array(m * n);
  for (let dst = 0; dst < m; dst++) {
    const src = order[dst];
    sigma[dst] = norms[src];
    for (let r = 0; r < m; r++) uS[r * m + dst] = u[r * m + src];
    for (let k = 0; k < n; k++) wS[dst * n + k] = w[src * n + k];
  }
  return { m, n, sigma, u: uS, w: wS };
}

/**
 * Minimum-norm least-squares solution x = A⁺·b of the m×n system A·x = b, from an {@link svdRows}
 * result; singular values at or below `relTol`·σ_max are treated as zero (truncated
 * pseudo-inverse). Returns a new array of length n.
 */
export function pseudoInverseSolve(svd: SvdRows, b: ArrayLike<number>, relTol = 1e-10): Float64Array {
  const { m, n, sigma, u, w } = svd;
  const x = new Float64Array(n);
  const cut = sigma[0] * relTol;
  for (let j = 0; j < m; j++) {
    const s = sigma[j];
    if (!(s > cut) || s === 0) continue;
    let ub = 0;
    for (let r = 0; r < m; r++) ub += u[r * m + j] * b[r];
    const f = ub / (s * s);
    for (let k = 0; k < n; k++) x[k] += w[j * n + k] * f;
  }
  return x;
}

/** Eigen-decomposition S = V·diag(λ)·Vᵀ of a symmetric k×k matrix. */
interface SymmetricEigen {
  /** Eigenvalues, descending. */
  values: Float64Array;
  /** Eigenvectors as the COLUMNS of this row-major k×k matrix. */
  vectors: Float64Array;
}

/**
 * Eigenvalues and eigenvectors of the symmetric k×k row-major matrix `s` (both triangles are
 * read and averaged, so an input made slightly asymmetric by rounding is symmetrised). Cyclic
 * Jacobi; does not modify `s`.
 */
export function symmetricEigen(s: ArrayLike<number>, k: number): SymmetricEigen {
  const a = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) a[i * k + j] = 0.5 * (s[i * k + j] + s[j * k + i]);
  const v = new Float64Array(k * k);
  for (let i = 0; i < k; i++) v[i * k + i] = 1;
  jacobiEigenInPlace(a, k, v);
  const order = Array.from({ length: k }, (_, j) => j).sort((x, y) => a[y * k + y] - a[x * k + x] || x - y);
  const values = new Float64Array(k), vectors = new Float64Array(k * k);
  order.forEach((src, dst) => {
    values[dst] = a[src * k + src];
    for (let r = 0; r < k; r++) vectors[r * k + dst] = v[r * k + src];
  });
  return { values, vectors };
}

/** Cholesky factor L (row-major k×k, lower) of an SPD matrix; null if not positive definite. */
export function cholesky(s: ArrayLike<number>, k: number): Float64Array | null {
  const l = new Float64Array(k * k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = s[i * k + j];
      for (let p = 0; p < j; p++) sum -= l[i * k + p] * l[j * k + p];
      if (i === j) {
        if (!(sum > 0)) return null;
        l[i * k + i] = Math.sqrt(sum);
      } else {
        l[i * k + j] = sum / l[j * k + j];
      }
    }
  }
  return l;
}

/** Determinant of a small square k×k row-major matrix by Gaussian elimination with partial pivoting. */
export function determinant(s: ArrayLike<number>, k: number): number {
  const a = Float64Array.from({ length: k * k }, (_, i) => s[i]);
  let det = 1;
  for (let c = 0; c < k; c++) {
    let piv = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(a[r * k + c]) > Math.abs(a[piv * k + c])) piv = r;
    if (a[piv * k + c] === 0) return 0;
    if (piv !== c) {
      for (let j = 0; j < k; j++) { const t = a[c * k + j]; a[c * k + j] = a[piv * k + j]; a[piv * k + j] = t; }
      det = -det;
    }
    const d = a[c * k + c];
    det *= d;
    for (let r = c + 1; r < k; r++) {
      const f = a[r * k + c] / d;
      if (f !== 0) for (let j = c; j < k; j++) a[r * k + j] -= f * a[c * k + j];
    }
  }
  return det;
}
