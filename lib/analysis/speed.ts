/**
 * Exact achievable tool speed at one path sample.
 *
 * A path asks the tool for the task velocity ẋ (m/s for the position rows, rad/s for the
 * constrained rotations; lib/kinematics/task.ts) at every sample. The joints can give it at a
 * fraction or multiple s of the required speed when some joint speed q̇ satisfies
 *
 *   A·q̇ = s·ẋ,   −vmaxⱼ ≤ q̇ⱼ ≤ vmaxⱼ for every joint with a speed limit,
 *   q̇ⱼ ≥ 0 for a joint sitting at its lower position limit, q̇ⱼ ≤ 0 at its upper one,
 *
 * with A the task Jacobian (m×n) at the sample's configuration. The speed ratio is the largest
 * such s ≥ 0: a linear program in (q̇, s). Each joint is bounded in its own unit (rad/s or m/s);
 * no norm ever mixes them. For a square, non-singular A, q̇ = s·A⁻¹ẋ is the only choice and the
 * answer is the ratio test minⱼ vmaxⱼ/|(A⁻¹ẋ)ⱼ| (with the position-limit signs); otherwise (a
 * redundant arm, or a singular A) the program is solved by the simplex method below. Unlike the
 * minimum-norm split A⁺ẋ, the answer uses a redundant arm's spare joints where they help, and
 * never asks a joint at a limit to move past it.
 *
 * Method (common practice; Dantzig's simplex with Bland's anti-cycling rule, Chvátal, "Linear
 * Programming", 1983, ch. 3; from memory): variables are split q̇ⱼ = pⱼ − rⱼ with 0 ≤ pⱼ ≤ uⱼ and
 * 0 ≤ rⱼ ≤ −lⱼ, so q̇ = 0, s = 0 is a feasible start; every variable is scaled by its joint's
 * speed limit and every row by its largest entry; the final basis is refined twice from the
 * unscaled-by-pivoting data (iterative refinement) so the value is accurate to rounding.
 * Checked against scipy's linprog (HiGHS) in tests/reference/path_speed_reference.py.
 */

/**
 * A joint counts as sitting at a position limit when it is within this fraction of its range
 * (0.5 %) of that limit: it may then not move further towards it. The same band marks a path's
 * limit hits.
 */
export const AT_LIMIT_FRACTION = 0.005;

/** Result of {@link maxSpeedScale}. */
export interface SpeedScale {
  /** Largest s ≥ 0 (dimensionless: the multiple of the required task velocity); Infinity when unbounded. */
  scale: number;
  /** Joint speeds (rad/s or m/s) at that s, or null when unbounded. */
  jointSpeeds: Float64Array | null;
  /** `closed-form` (square non-singular A) or `linear-program`. */
  method: "closed-form" | "linear-program";
}

/** Relative size below which a pivot or a solved joint speed counts as zero. */
const ZERO = 1e-12;

/**
 * Largest s ≥ 0 with A·q̇ = s·b and lower ≤ q̇ ≤ upper (per joint; ±Infinity where unbounded;
 * lower ≤ 0 ≤ upper). `a` is m×n row-major. Allocates its scratch (small).
 */
export function maxSpeedScale(a: ArrayLike<number>, m: number, n: number, b: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): SpeedScale {
  for (let j = 0; j < n; j++) {
    if (!(lower[j] <= 0 && upper[j] >= 0)) throw new RangeError(`joint ${j + 1}: speed bounds must contain 0, got [${lower[j]}, ${upper[j]}]`);
  }
  if (m === n) {
    const d = solveSquare(a, n, b);
    if (d) return ratioTest(d, lower, upper);
  }
  return simplexScale(a, m, n, b, lower, upper);
}

/** x = A⁻¹b by Gaussian elimination with partial pivoting; null when A is singular (relative pivot ≤ ZERO). */
function solveSquare(a: ArrayLike<number>, n: number, b: ArrayLike<number>): Float64Array | null {
  const w = new Float64Array(n * (n + 1));
  let scale = 0;
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) { w[r * (n + 1) + c] = a[r * n + c]; scale = Math.max(scale, Math.abs(a[r * n + c])); }
    w[r * (n + 1) + n] = b[r];
  }
  if (!(scale > 0)) return null;
  const stride = n + 1;
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(w[r * stride + c]) > Math.abs(w[p * stride + c])) p = r;
    if (!(Math.abs(w[p * stride + c]) > ZERO * scale)) return null;
    if (p !== c) for (let k = 0; k <= n; k++) { const t = w[c * stride + k]; w[c * stride + k] = w[p * stride + k]; w[p * stride + k] = t; }
    for (let r = c + 1; r < n; r++) {
      const f = w[r * stride + c] / w[c * stride + c];
      if (f !== 0) for (let k = c; k <= n; k++) w[r * stride + k] -= f * w[c * stride + k];
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let s = w[r * stride + n];
    for (let k = r + 1; k < n; k++) s -= w[r * stride + k] * x[k];
    x[r] = s / w[r * stride + r];
  }
  return x;
}

/** s = min over joints of the bound each puts on s along q̇ = s·d. */
function ratioTest(d: Float64Array, lower: ArrayLike<number>, upper: ArrayLike<number>): SpeedScale {
  let dmax = 0;
  for (let j = 0; j < d.length; j++) dmax = Math.max(dmax, Math.abs(d[j]));
  let s = Infinity;
  for (let j = 0; j < d.length; j++) {
    if (!(Math.abs(d[j]) > ZERO * dmax)) continue;
    const bound = d[j] > 0 ? upper[j] / d[j] : lower[j] / d[j];
    if (bound < s) s = bound;
  }
  if (!Number.isFinite(s)) return { scale: Infinity, jointSpeeds: null, method: "closed-form" };
  s = Math.max(0, s);
  return { scale: s, jointSpeeds: d.map((v) => v * s), method: "closed-form" };
}

/**
 * The linear program in standard form, solved on a dense tableau (the sizes are at most a few
 * dozen rows and columns). Columns: pⱼ, rⱼ (scaled joint speed parts), s, a slack per finite
 * bound, an artificial per equality row. Rows: the m equality rows (scaled), then one row per
 * finite bound (pⱼ + slack = uⱼ/cⱼ, rⱼ + slack = −lⱼ/cⱼ).
 */
function simplexScale(a: ArrayLike<number>, m: number, n: number, b: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): SpeedScale {
  // Column scale per joint: its largest finite bound (so scaled bounds are ≤ 1), else 1.
  const cs = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const big = Math.max(Number.isFinite(upper[j]) ? upper[j] : 0, Number.isFinite(lower[j]) ? -lower[j] : 0);
    cs[j] = big > 0 ? big : 1;
  }
  // Structural columns: p_j when upper > 0, r_j when lower < 0 (a side fixed at 0 has no column).
  const cols: { joint: number; sign: 1 | -1; bound: number }[] = [];
  for (let j = 0; j < n; j++) {
    if (upper[j] > 0) cols.push({ joint: j, sign: 1, bound: upper[j] / cs[j] });
    if (lower[j] < 0) cols.push({ joint: j, sign: -1, bound: -lower[j] / cs[j] });
  }
  const nStruct = cols.length, sCol = nStruct;
  const bounded = cols.map((c, k) => ({ k, bound: c.bound })).filter((x) => Number.isFinite(x.bound));
  const R = m + bounded.length;
  const slack0 = nStruct + 1, art0 = slack0 + bounded.length, C = art0 + m, W = C + 1;
  const t = new Float64Array(R * W);
  for (let i = 0; i < m; i++) {
    let rowMax = Math.abs(b[i]);
    for (let j = 0; j < n; j++) rowMax = Math.max(rowMax, Math.abs(a[i * n + j] * cs[j]));
    const rs = rowMax > 0 ? 1 / rowMax : 1;
    cols.forEach((c, k) => { t[i * W + k] = c.sign * a[i * n + c.joint] * cs[c.joint] * rs; });
    t[i * W + sCol] = -b[i] * rs;
    t[i * W + art0 + i] = 1;
  }
  bounded.forEach((x, q) => {
    const r = m + q;
    t[r * W + x.k] = 1;
    t[r * W + slack0 + q] = 1;
    t[r * W + C] = x.bound;
  });
  const t0 = Float64Array.from(t);
  const basis = new Int32Array(R);
  for (let i = 0; i < m; i++) basis[i] = art0 + i;
  for (let q = 0; q < bounded.length; q++) basis[m + q] = slack0 + q;

  const pivot = (pr: number, pc: number) => {
    const pv = t[pr * W + pc];
    for (let k = 0; k < W; k++) t[pr * W + k] /= pv;
    for (let r = 0; r < R; r++) {
      if (r === pr) continue;
      const f = t[r * W + pc];
      if (f !== 0) for (let k = 0; k < W; k++) t[r * W + k] -= f * t[pr * W + k];
    }
    basis[pr] = pc;
  };

  // Drive the artificials (all at 0: the right-hand sides are 0) out of the basis by degenerate
  // pivots on the largest entry of their row; a row with no entry left is redundant and stays.
  for (let i = 0; i < m; i++) {
    if (basis[i] < art0) continue;
    let pc = -1, best = ZERO;
    for (let k = 0; k < art0; k++) if (Math.abs(t[i * W + k]) > best) { best = Math.abs(t[i * W + k]); pc = k; }
    if (pc >= 0) pivot(i, pc);
  }

  // Phase 2: maximise s (minimise −s). Reduced cost of column k: c_k − Σ_r c_basis[r]·t[r][k].
  const cost = (k: number) => (k === sCol ? -1 : 0);
  let unbounded = false;
  for (let iter = 0; iter < 50 * (R + C); iter++) {
    let enter = -1;
    for (let k = 0; k < art0; k++) {
      let d = cost(k);
      for (let r = 0; r < R; r++) { const cb = cost(basis[r]); if (cb !== 0) d -= cb * t[r * W + k]; }
      if (d < -ZERO) { enter = k; break; } // Bland: lowest index with a negative reduced cost
    }
    if (enter < 0) break;
    // Ratio test; ties (to rounding) go to the lowest basic index (Bland).
    let leave = -1, ratio = Infinity;
    for (let r = 0; r < R; r++) {
      const e = t[r * W + enter];
      if (!(e > ZERO)) continue;
      const q = Math.max(0, t[r * W + C]) / e;
      const tie = 1e-12 * Math.max(1, Math.abs(ratio));
      if (leave < 0 || q < ratio - tie || (q <= ratio + tie && basis[r] < basis[leave])) {
        leave = r;
        ratio = Math.min(ratio, q);
      }
    }
    if (leave < 0) { unbounded = true; break; }
    pivot(leave, enter);
  }
  if (unbounded) return { scale: Infinity, jointSpeeds: null, method: "linear-program" };

  // Iterative refinement of the basic solution against the original rows: x_B += B⁻¹(rhs − M·x).
  // B⁻¹ is held in the columns of the starting identity (artificials and slacks).
  const x = new Float64Array(C);
  for (let r = 0; r < R; r++) x[basis[r]] = t[r * W + C];
  const identityCol = (row: number) => (row < m ? art0 + row : slack0 + (row - m));
  for (let pass = 0; pass < 2; pass++) {
    const res = new Float64Array(R);
    for (let i = 0; i < R; i++) {
      let v = t0[i * W + C];
      for (let k = 0; k < C; k++) v -= t0[i * W + k] * x[k];
      res[i] = v;
    }
    for (let r = 0; r < R; r++) {
      let dx = 0;
      for (let i = 0; i < R; i++) dx += t[r * W + identityCol(i)] * res[i];
      x[basis[r]] += dx;
    }
  }
  const s = Math.max(0, x[sCol]);
  const qd = new Float64Array(n);
  cols.forEach((c, k) => { qd[c.joint] += c.sign * x[k] * cs[c.joint]; });
  return { scale: s, jointSpeeds: qd, method: "linear-program" };
}

/** Per-joint speed bounds at a configuration: ±maxSpeed (±Infinity where absent), one side 0 at a position limit. */
export function speedBounds(lowerLimit: ArrayLike<number>, upperLimit: ArrayLike<number>, maxSpeed: ArrayLike<number>, q: ArrayLike<number>): { lower: Float64Array; upper: Float64Array; atLimit: (-1 | 0 | 1)[] } {
  const n = q.length;
  const lower = new Float64Array(n), upper = new Float64Array(n);
  const atLimit: (-1 | 0 | 1)[] = [];
  for (let j = 0; j < n; j++) {
    const v = maxSpeed[j] > 0 ? maxSpeed[j] : Infinity;
    lower[j] = -v; upper[j] = v;
    const band = AT_LIMIT_FRACTION * (upperLimit[j] - lowerLimit[j]);
    let side: -1 | 0 | 1 = 0;
    if (q[j] <= lowerLimit[j] + band) { lower[j] = 0; side = -1; }
    if (q[j] >= upperLimit[j] - band) { upper[j] = 0; side = side === -1 ? 0 : 1; }
    atLimit.push(side);
  }
  return { lower, upper, atLimit };
}
