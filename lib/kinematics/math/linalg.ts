/**
 * Small dense linear algebra on row-major Float64Array buffers, allocation-free.
 * Used in the IK hot path instead of a general matrix library.
 */

/**
 * In-place Cholesky factorisation of the symmetric positive-definite k×k matrix `a` (row-major,
 * lower triangle read and overwritten with L, A = L·Lᵀ). Returns false if a pivot is not
 * positive (matrix not positive definite); `a` is then partly overwritten.
 * Reference: Golub & Van Loan, Matrix Computations, §4.2 (common practice).
 */
export function choleskyInPlace(a: Float64Array, k: number): boolean {
  for (let j = 0; j < k; j++) {
    let s = a[j * k + j];
    for (let p = 0; p < j; p++) s -= a[j * k + p] * a[j * k + p];
    if (!(s > 0)) return false;
    const ljj = Math.sqrt(s);
    a[j * k + j] = ljj;
    const inv = 1 / ljj;
    for (let i = j + 1; i < k; i++) {
      let t = a[i * k + j];
      for (let p = 0; p < j; p++) t -= a[i * k + p] * a[j * k + p];
      a[i * k + j] = t * inv;
    }
  }
  return true;
}

/** Solves L·Lᵀ·x = b with the factor from `choleskyInPlace`; x may alias b. */
export function choleskySolve(l: Float64Array, k: number, b: ArrayLike<number>, x: Float64Array): Float64Array {
  for (let i = 0; i < k; i++) {
    let s = b[i];
    for (let p = 0; p < i; p++) s -= l[i * k + p] * x[p];
    x[i] = s / l[i * k + i];
  }
  for (let i = k - 1; i >= 0; i--) {
    let s = x[i];
    for (let p = i + 1; p < k; p++) s -= l[p * k + i] * x[p];
    x[i] = s / l[i * k + i];
  }
  return x;
}

/**
 * The Jacobi rotation that zeroes one off-diagonal pair, from ζ = (a_qq − a_pp) / (2·a_pq) (or the
 * column-pair analogue of the one-sided method): t the smaller root of t² + 2ζt − 1 = 0,
 * c = 1/√(1 + t²), s = c·t. Writes [c, s] into `out`. Golub & Van Loan, "Matrix Computations",
 * §8.5.2 (from memory).
 */
export function jacobiRotation(zeta: number, out: Float64Array): void {
  const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
  const c = 1 / Math.sqrt(1 + t * t);
  out[0] = c;
  out[1] = c * t;
}

/**
 * Rotates two lines of a row-major buffer in place: x ← c·x − s·y, y ← s·x + c·y for `count`
 * elements, x starting at `i`, y at `j`, both stepping by `step` (a row: step 1; a column: step =
 * the row length).
 */
export function rotatePair(buf: Float64Array, i: number, j: number, step: number, count: number, c: number, s: number): void {
  for (let k = 0; k < count; k++) {
    const x = buf[i + k * step], y = buf[j + k * step];
    buf[i + k * step] = c * x - s * y;
    buf[j + k * step] = s * x + c * y;
  }
}

const cs = new Float64Array(2);

/**
 * Cyclic Jacobi rotations on the symmetric k×k matrix `a` (row-major) until the off-diagonal part
 * is negligible; `a` is destroyed (its diagonal holds the eigenvalues, unsorted, on return). When
 * `v` (k×k, row-major, usually the identity on entry) is given, each rotation is also applied to
 * its columns, so that its columns become the eigenvectors. Does not allocate.
 * Reference: Golub & Van Loan, Matrix Computations, §8.5 (cyclic Jacobi).
 */
export function jacobiEigenInPlace(a: Float64Array, k: number, v?: Float64Array): void {
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < k; i++) {
      diag += a[i * k + i] * a[i * k + i];
      for (let j = i + 1; j < k; j++) off += a[i * k + j] * a[i * k + j];
    }
    if (off <= 1e-30 * diag || off === 0) break;
    for (let p = 0; p < k; p++) {
      for (let q = p + 1; q < k; q++) {
        const apq = a[p * k + q];
        if (apq === 0) continue;
        const app = a[p * k + p], aqq = a[q * k + q];
        jacobiRotation((aqq - app) / (2 * apq), cs);
        const c = cs[0], s = cs[1];
        rotatePair(a, p, q, k, k, c, s); // columns p and q
        rotatePair(a, p * k, q * k, 1, k, c, s); // rows p and q
        if (v) rotatePair(v, p, q, k, k, c, s);
      }
    }
  }
}

/**
 * Eigenvalues of the symmetric k×k matrix `a` (row-major) by cyclic Jacobi rotations; `a` is
 * destroyed (its diagonal holds the eigenvalues on return). Returns the smallest eigenvalue.
 * Reference: Golub & Van Loan, Matrix Computations, §8.5 (cyclic Jacobi).
 */
function symmetricMinEigenvalue(a: Float64Array, k: number): number {
  jacobiEigenInPlace(a, k);
  let min = Infinity;
  for (let i = 0; i < k; i++) if (a[i * k + i] < min) min = a[i * k + i];
  return min;
}

/**
 * Smallest singular value of the m×n row-major matrix `j`, through the smaller Gram matrix
 * (J·Jᵀ when m ≤ n, else Jᵀ·J) and its smallest eigenvalue. `scratch` needs min(m,n)² entries.
 * Accurate to about √ε·σ_max for tiny σ (enough for singularity screening).
 */
export function minSingularValue(j: ArrayLike<number>, m: number, n: number, scratch: Float64Array): number {
  const k = m <= n ? m : n;
  if (m <= n) {
    for (let r = 0; r < m; r++) {
      for (let c = r; c < m; c++) {
        let s = 0;
        for (let p = 0; p < n; p++) s += j[r * n + p] * j[c * n + p];
        scratch[r * k + c] = s;
        scratch[c * k + r] = s;
      }
    }
  } else {
    for (let r = 0; r < n; r++) {
      for (let c = r; c < n; c++) {
        let s = 0;
        for (let p = 0; p < m; p++) s += j[p * n + r] * j[p * n + c];
        scratch[r * k + c] = s;
        scratch[c * k + r] = s;
      }
    }
  }
  const lambda = symmetricMinEigenvalue(scratch, k);
  return Math.sqrt(Math.max(0, lambda));
}
