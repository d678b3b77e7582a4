/**
 * Closed-form distance queries on packed shapes (see packed.ts), allocation-free.
 *
 * - Point and segment cores (spheres and capsules): the closest points of two segments
 *   (Ericson, "Real-Time Collision Detection", 2005, §5.1.9, with its degenerate cases), then
 *   the radii subtracted. Overlapping cores (crossing axes) have depth r_A + r_B.
 * - Segment (or point) against a box: in the box frame the squared distance from the point
 *   s(t) = p + t·u to the box is f(t) = Σᵢ max(0, |sᵢ(t)| − hᵢ)², a convex, piecewise quadratic
 *   function of t ∈ [0, 1] whose pieces change where sᵢ(t) = ±hᵢ. Minimising each piece in
 *   closed form gives the exact distance. When the segment enters the box, the penetration depth
 *   is the smallest overlap of the projections on the separating-axis candidates (the box's three
 *   axes and the three cross products of the segment with them: the facet normals of the
 *   Minkowski sum of a box and a segment), which is exact for convex polytopes.
 * - Point against a cylinder: in the cylinder frame with radial distance ρ and axial z, the
 *   distance is hypot(max(0, ρ − r), max(0, |z| − h)); inside, the depth is min(r − ρ, h − |z|).
 *
 * Every function writes a {@link DistanceResult} (conventions in types.ts) and returns the
 * separation (0 when touching or overlapping).
 */
import type { DistanceResult } from "./types";
// Layout constants of packed.ts, repeated as local constants so the hot code reads literals
// (an imported binding is a property load on every use).
const O_A = 2;
const O_B = 5;
const O_H = 17;
const O_R = 8;
const O_RADIUS = 1;

/** Core distances below this (m) are treated as touching cores (no reliable direction). */
const CORE_TOUCH = 1e-15;

/** Closest points of the cores, shared scratch (synchronous code only). */
const cp = new Float64Array(6);
/** Breakpoints of the segment–box search. */
const ts = new Float64Array(8);

/**
 * Closest points of segments p1→q1 and p2→q2 into cp[0..2] and cp[3..5]; returns their
 * distance. Either segment may be a point (p = q).
 */
function segmentSegment(
  p1x: number, p1y: number, p1z: number, q1x: number, q1y: number, q1z: number,
  p2x: number, p2y: number, p2z: number, q2x: number, q2y: number, q2z: number,
): number {
  const d1x = q1x - p1x, d1y = q1y - p1y, d1z = q1z - p1z;
  const d2x = q2x - p2x, d2y = q2y - p2y, d2z = q2z - p2z;
  const rx = p1x - p2x, ry = p1y - p2y, rz = p1z - p2z;
  const a = d1x * d1x + d1y * d1y + d1z * d1z;
  const e = d2x * d2x + d2y * d2y + d2z * d2z;
  const f = d2x * rx + d2y * ry + d2z * rz;
  let s: number, t: number;
  if (a <= 1e-30 && e <= 1e-30) {
    s = 0; t = 0;
  } else if (a <= 1e-30) {
    s = 0;
    t = clamp01(f / e);
  } else {
    const c = d1x * rx + d1y * ry + d1z * rz;
    if (e <= 1e-30) {
      t = 0;
      s = clamp01(-c / a);
    } else {
      const b = d1x * d2x + d1y * d2y + d1z * d2z;
      const denom = a * e - b * b;
      s = denom > 1e-30 * a * e ? clamp01((b * f - c * e) / denom) : 0;
      t = (b * s + f) / e;
      if (t < 0) {
        t = 0;
        s = clamp01(-c / a);
      } else if (t > 1) {
        t = 1;
        s = clamp01((b - c) / a);
      }
    }
  }
  const ax = p1x + s * d1x, ay = p1y + s * d1y, az = p1z + s * d1z;
  const bx = p2x + t * d2x, by = p2y + t * d2y, bz = p2z + t * d2z;
  cp[0] = ax; cp[1] = ay; cp[2] = az; cp[3] = bx; cp[4] = by; cp[5] = bz;
  return Math.sqrt((ax - bx) ** 2 + (ay - by) ** 2 + (az - bz) ** 2);
}

function clamp01(x: number): number {
  return x < 0 ? 0 : x > 1 ? 1 : x;
}

/**
 * Fills `out` from core closest points (cp) at core distance dc > CORE_TOUCH and the margins.
 * Returns the separation.
 */
export function finishFromCores(
  ax: number, ay: number, az: number, bx: number, by: number, bz: number, dc: number, rA: number, rB: number, out: DistanceResult,
): number {
  const nx = (bx - ax) / dc, ny = (by - ay) / dc, nz = (bz - az) / dc;
  const d = dc - rA - rB;
  out.pointA[0] = ax + rA * nx; out.pointA[1] = ay + rA * ny; out.pointA[2] = az + rA * nz;
  out.pointB[0] = bx - rB * nx; out.pointB[1] = by - rB * ny; out.pointB[2] = bz - rB * nz;
  out.normal[0] = nx; out.normal[1] = ny; out.normal[2] = nz;
  if (d > 0) {
    out.distance = d;
    out.depth = 0;
  } else {
    out.distance = 0;
    out.depth = -d;
  }
  return out.distance;
}

/** Any unit vector perpendicular to (x, y, z) (or the x axis for the zero vector) into out.normal. */
function perpendicular(x: number, y: number, z: number, out: DistanceResult): void {
  const n = Math.sqrt(x * x + y * y + z * z);
  if (n < 1e-300) { out.normal[0] = 1; out.normal[1] = 0; out.normal[2] = 0; return; }
  // cross with the coordinate axis least aligned with v
  const ax = Math.abs(x), ay = Math.abs(y), az = Math.abs(z);
  let px: number, py: number, pz: number;
  if (ax <= ay && ax <= az) { px = 0; py = -z; pz = y; } else if (ay <= az) { px = z; py = 0; pz = -x; } else { px = -y; py = x; pz = 0; }
  const m = Math.sqrt(px * px + py * py + pz * pz);
  out.normal[0] = px / m; out.normal[1] = py / m; out.normal[2] = pz / m;
}

/**
 * Sets pointA to A's support point along out.normal (A a sphere or capsule at `ao`) and
 * pointB = pointA − depth·normal, for overlapping cores.
 */
function overlapWitness(A: Float64Array, ao: number, depth: number, out: DistanceResult): void {
  const nx = out.normal[0], ny = out.normal[1], nz = out.normal[2];
  const ux = A[ao + O_B] - A[ao + O_A], uy = A[ao + O_B + 1] - A[ao + O_A + 1], uz = A[ao + O_B + 2] - A[ao + O_A + 2];
  const o = ux * nx + uy * ny + uz * nz > 0 ? O_B : O_A;
  const r = A[ao + O_RADIUS];
  out.pointA[0] = A[ao + o] + r * nx; out.pointA[1] = A[ao + o + 1] + r * ny; out.pointA[2] = A[ao + o + 2] + r * nz;
  out.pointB[0] = out.pointA[0] - depth * nx; out.pointB[1] = out.pointA[1] - depth * ny; out.pointB[2] = out.pointA[2] - depth * nz;
  out.distance = 0;
  out.depth = depth;
}

/** Sphere or capsule A against sphere or capsule B. */
export function capsuleCapsule(A: Float64Array, ao: number, B: Float64Array, bo: number, out: DistanceResult): number {
  out.method = "closed";
  const dc = segmentSegment(
    A[ao + O_A], A[ao + O_A + 1], A[ao + O_A + 2], A[ao + O_B], A[ao + O_B + 1], A[ao + O_B + 2],
    B[bo + O_A], B[bo + O_A + 1], B[bo + O_A + 2], B[bo + O_B], B[bo + O_B + 1], B[bo + O_B + 2],
  );
  const rA = A[ao + O_RADIUS], rB = B[bo + O_RADIUS];
  if (dc > CORE_TOUCH) return finishFromCores(cp[0], cp[1], cp[2], cp[3], cp[4], cp[5], dc, rA, rB, out);
  // Crossing axes: the shortest way out is perpendicular to both segments.
  const ux = A[ao + O_B] - A[ao + O_A], uy = A[ao + O_B + 1] - A[ao + O_A + 1], uz = A[ao + O_B + 2] - A[ao + O_A + 2];
  const vx = B[bo + O_B] - B[bo + O_A], vy = B[bo + O_B + 1] - B[bo + O_A + 1], vz = B[bo + O_B + 2] - B[bo + O_A + 2];
  const cx = uy * vz - uz * vy, cy = uz * vx - ux * vz, cz = ux * vy - uy * vx;
  const cn = Math.sqrt(cx * cx + cy * cy + cz * cz);
  if (cn > 1e-12 * Math.sqrt((ux * ux + uy * uy + uz * uz) * (vx * vx + vy * vy + vz * vz))) {
    out.normal[0] = cx / cn; out.normal[1] = cy / cn; out.normal[2] = cz / cn;
  } else if (ux * ux + uy * uy + uz * uz > 0) perpendicular(ux, uy, uz, out);
  else perpendicular(vx, vy, vz, out);
  const depth = rA + rB - dc;
  out.pointA[0] = cp[0] + rA * out.normal[0]; out.pointA[1] = cp[1] + rA * out.normal[1]; out.pointA[2] = cp[2] + rA * out.normal[2];
  out.pointB[0] = out.pointA[0] - depth * out.normal[0]; out.pointB[1] = out.pointA[1] - depth * out.normal[1]; out.pointB[2] = out.pointA[2] - depth * out.normal[2];
  out.distance = 0;
  out.depth = depth;
  return 0;
}

/** Sphere or capsule A against box B. */
export function capsuleBox(A: Float64Array, ao: number, B: Float64Array, bo: number, out: DistanceResult): number {
  out.method = "closed";
  const r = bo + O_R;
  const r0 = B[r], r1 = B[r + 1], r2 = B[r + 2], r3 = B[r + 3], r4 = B[r + 4], r5 = B[r + 5], r6 = B[r + 6], r7 = B[r + 7], r8 = B[r + 8];
  const cx = B[bo + O_A], cy = B[bo + O_A + 1], cz = B[bo + O_A + 2];
  const hx = B[bo + O_H], hy = B[bo + O_H + 1], hz = B[bo + O_H + 2];
  // segment in the box frame: p = Rᵀ(a − c), u = Rᵀ(b − a)
  const ax = A[ao + O_A] - cx, ay = A[ao + O_A + 1] - cy, az = A[ao + O_A + 2] - cz;
  const wx = A[ao + O_B] - A[ao + O_A], wy = A[ao + O_B + 1] - A[ao + O_A + 1], wz = A[ao + O_B + 2] - A[ao + O_A + 2];
  const px = r0 * ax + r3 * ay + r6 * az, py = r1 * ax + r4 * ay + r7 * az, pz = r2 * ax + r5 * ay + r8 * az;
  const ux = r0 * wx + r3 * wy + r6 * wz, uy = r1 * wx + r4 * wy + r7 * wz, uz = r2 * wx + r5 * wy + r8 * wz;
  // breakpoints in (0, 1), sorted (insertion sort, at most 6)
  let nb = 0;
  nb = addBreak(nb, px, ux, hx);
  nb = addBreak(nb, py, uy, hy);
  nb = addBreak(nb, pz, uz, hz);
  let bestT = 0, bestF = Infinity;
  let t0 = 0;
  for (let k = 0; k <= nb; k++) {
    const t1 = k < nb ? ts[k] : 1;
    if (t1 < t0) continue;
    const tm = 0.5 * (t0 + t1);
    // active set at the middle of the piece; minimise A t² + 2 B t + C there
    let qa = 0, qb = 0;
    let s = px + tm * ux;
    if (s > hx) { qa += ux * ux; qb += (px - hx) * ux; } else if (s < -hx) { qa += ux * ux; qb += (px + hx) * ux; }
    s = py + tm * uy;
    if (s > hy) { qa += uy * uy; qb += (py - hy) * uy; } else if (s < -hy) { qa += uy * uy; qb += (py + hy) * uy; }
    s = pz + tm * uz;
    if (s > hz) { qa += uz * uz; qb += (pz - hz) * uz; } else if (s < -hz) { qa += uz * uz; qb += (pz + hz) * uz; }
    let t = qa > 0 ? -qb / qa : t0;
    if (t < t0) t = t0; else if (t > t1) t = t1;
    const f = boxGapSq(px + t * ux, py + t * uy, pz + t * uz, hx, hy, hz);
    if (f < bestF) { bestF = f; bestT = t; }
    t0 = t1;
    if (bestF === 0) break;
  }
  const sx = px + bestT * ux, sy = py + bestT * uy, sz = pz + bestT * uz;
  const kx = sx > hx ? hx : sx < -hx ? -hx : sx, ky = sy > hy ? hy : sy < -hy ? -hy : sy, kz = sz > hz ? hz : sz < -hz ? -hz : sz;
  const dc = Math.sqrt(bestF);
  const rA = A[ao + O_RADIUS];
  if (dc > CORE_TOUCH) {
    // back to the query frame: x = c + R·local
    const ex = A[ao + O_A] + bestT * wx, ey = A[ao + O_A + 1] + bestT * wy, ez = A[ao + O_A + 2] + bestT * wz;
    const bx = cx + r0 * kx + r1 * ky + r2 * kz, by = cy + r3 * kx + r4 * ky + r5 * kz, bz = cz + r6 * kx + r7 * ky + r8 * kz;
    return finishFromCores(ex, ey, ez, bx, by, bz, dc, rA, 0, out);
  }
  // The core enters the box: separating-axis depth over the box axes and u × axes (box frame).
  let best = Infinity, nxL = 1, nyL = 0, nzL = 0;
  const uu = Math.sqrt(ux * ux + uy * uy + uz * uz);
  for (let k = 0; k < 6; k++) {
    let mx: number, my: number, mz: number;
    if (k === 0) { mx = 1; my = 0; mz = 0; } else if (k === 1) { mx = 0; my = 1; mz = 0; } else if (k === 2) { mx = 0; my = 0; mz = 1; }
    else if (k === 3) { mx = 0; my = uz; mz = -uy; } else if (k === 4) { mx = -uz; my = 0; mz = ux; } else { mx = uy; my = -ux; mz = 0; }
    const m = Math.sqrt(mx * mx + my * my + mz * mz);
    if (k >= 3 && !(m > 1e-9 * uu)) continue;
    mx /= m; my /= m; mz /= m;
    const rho = Math.abs(mx) * hx + Math.abs(my) * hy + Math.abs(mz) * hz;
    const s0 = px * mx + py * my + pz * mz, s1 = s0 + ux * mx + uy * my + uz * mz;
    const smin = s0 < s1 ? s0 : s1, smax = s0 < s1 ? s1 : s0;
    const down = smax + rho, up = rho - smin;
    // moving A along −m by `down` (B along +m), or A along +m by `up` (B along −m)
    if (down < best) { best = down; nxL = mx; nyL = my; nzL = mz; }
    if (up < best) { best = up; nxL = -mx; nyL = -my; nzL = -mz; }
  }
  out.normal[0] = r0 * nxL + r1 * nyL + r2 * nzL;
  out.normal[1] = r3 * nxL + r4 * nyL + r5 * nzL;
  out.normal[2] = r6 * nxL + r7 * nyL + r8 * nzL;
  overlapWitness(A, ao, best + rA, out);
  return 0;
}

/** Adds the crossings of p + t·u with ±h in (0, 1) to the sorted breakpoints; returns the count. */
function addBreak(nb: number, p: number, u: number, h: number): number {
  if (u === 0) return nb;
  for (let k = 0; k < 2; k++) {
    const t = ((k === 0 ? -h : h) - p) / u;
    if (!(t > 0 && t < 1)) continue;
    let i = nb++;
    while (i > 0 && ts[i - 1] > t) { ts[i] = ts[i - 1]; i--; }
    ts[i] = t;
  }
  return nb;
}

function boxGapSq(x: number, y: number, z: number, hx: number, hy: number, hz: number): number {
  const gx = x > hx ? x - hx : x < -hx ? -hx - x : 0;
  const gy = y > hy ? y - hy : y < -hy ? -hy - y : 0;
  const gz = z > hz ? z - hz : z < -hz ? -hz - z : 0;
  return gx * gx + gy * gy + gz * gz;
}

/** Sphere A against cylinder B. */
export function sphereCylinder(A: Float64Array, ao: number, B: Float64Array, bo: number, out: DistanceResult): number {
  out.method = "closed";
  const r = bo + O_R;
  const r0 = B[r], r1 = B[r + 1], r2 = B[r + 2], r3 = B[r + 3], r4 = B[r + 4], r5 = B[r + 5], r6 = B[r + 6], r7 = B[r + 7], r8 = B[r + 8];
  const cx = B[bo + O_A], cy = B[bo + O_A + 1], cz = B[bo + O_A + 2];
  const rc = B[bo + O_RADIUS], h = B[bo + O_H + 2];
  const ax = A[ao + O_A], ay = A[ao + O_A + 1], az = A[ao + O_A + 2];
  const dx = ax - cx, dy = ay - cy, dz = az - cz;
  const lx = r0 * dx + r3 * dy + r6 * dz, ly = r1 * dx + r4 * dy + r7 * dz, lz = r2 * dx + r5 * dy + r8 * dz;
  const rho = Math.sqrt(lx * lx + ly * ly);
  const dr = rho - rc, dzz = Math.abs(lz) - h;
  const rA = A[ao + O_RADIUS];
  if (dr > 0 || dzz > 0) {
    const k = rho > rc ? rc / rho : 1;
    const qx = lx * k, qy = ly * k, qz = lz > h ? h : lz < -h ? -h : lz;
    const gr = dr > 0 ? dr : 0, gz = dzz > 0 ? dzz : 0;
    const dc = Math.sqrt(gr * gr + gz * gz);
    const bx = cx + r0 * qx + r1 * qy + r2 * qz, by = cy + r3 * qx + r4 * qy + r5 * qz, bz = cz + r6 * qx + r7 * qy + r8 * qz;
    if (dc > CORE_TOUCH) return finishFromCores(ax, ay, az, bx, by, bz, dc, rA, 0, out);
  }
  // centre inside (or on) the cylinder: leave radially or through the nearer cap
  let nlx: number, nly: number, nlz: number, core: number;
  if (-dr < -dzz) {
    core = -dr;
    if (rho > 1e-300) { nlx = -lx / rho; nly = -ly / rho; } else { nlx = -1; nly = 0; }
    nlz = 0;
  } else {
    core = -dzz;
    nlx = 0; nly = 0; nlz = lz >= 0 ? -1 : 1;
  }
  if (core < 0) core = 0;
  out.normal[0] = r0 * nlx + r1 * nly + r2 * nlz;
  out.normal[1] = r3 * nlx + r4 * nly + r5 * nlz;
  out.normal[2] = r6 * nlx + r7 * nly + r8 * nlz;
  overlapWitness(A, ao, core + rA, out);
  return 0;
}
