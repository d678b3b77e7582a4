/**
 * GJK distance and EPA penetration depth between the cores of two packed convex shapes,
 * allocation-free (module scratch; synchronous code only).
 *
 * - GJK: Gilbert, Johnson and Keerthi, "A fast procedure for computing the distance between
 *   complex objects in three-dimensional space", IEEE J. Robotics and Automation 4(2), 1988, in
 *   the form of van den Bergen, "A fast and robust GJK implementation for collision detection of
 *   convex objects", J. Graphics Tools 4(2), 1999: the point v of a simplex of support points of
 *   the Minkowski difference D = A − B closest to the origin is improved until the support point
 *   w along −v satisfies ‖v‖² − v·w ≤ ε‖v‖ (then ‖v‖ − dist ≤ ε). The closest point of a segment,
 *   triangle or tetrahedron to the origin is found by its Voronoi regions (Ericson, "Real-Time
 *   Collision Detection", 2005, §5.1.5–5.1.6).
 * - EPA: the expanding polytope algorithm (van den Bergen, "Proximity queries and penetration
 *   depth computation on 3D game objects", GDC 2001): when D contains the origin, the polytope is
 *   grown towards the support point of its face nearest the origin until that face lies on D's
 *   boundary; its distance is the penetration depth. A simplex that only touches the origin is
 *   first blown up to a tetrahedron (the "enclose origin" step of Bullet's GJK–EPA).
 *
 * The cores: a sphere's centre, a capsule's segment, a box, a cylinder (spheres and capsules get
 * their radius added by the caller, so curved margins never slow the iteration down).
 */
// Layout constants of packed.ts, repeated as local constants so the hot code reads literals
// (an imported binding is a property load on every use).
const KIND_BOX = 2;
const KIND_CAPSULE = 1;
const KIND_SPHERE = 0;
const O_A = 2;
const O_B = 5;
const O_BC = 20;
const O_H = 17;
const O_R = 8;
const O_RADIUS = 1;

/** Distance accuracy of GJK on curved cores (m): the answer is within this of the true distance. */
const GJK_TOLERANCE = 1e-12;
/** Accuracy of the EPA penetration depth (m). */
const EPA_TOLERANCE = 1e-9;
const GJK_MAX_ITERATIONS = 200;
const EPA_MAX_VERTICES = 96;
const EPA_MAX_FACES = 256;
const EPA_MAX_EDGES = 192;

/** Result of the last {@link gjkCore} / {@link epaCore} call (module scratch). */
export const gjkOut = {
  /** Core distance (m), 0 when the cores touch or overlap. */
  distance: 0,
  /** True when the cores overlap or touch (then call epaCore for the depth). */
  intersect: false,
  /** Closest points on A's and B's core (separated), or EPA's witness points. */
  pa: new Float64Array(3),
  pb: new Float64Array(3),
  /** EPA: penetration depth (m) and the unit direction to move B by to separate. */
  depth: 0,
  normal: new Float64Array(3),
  iterations: 0,
};

// ---- support functions ----------------------------------------------------------------------

const sp = new Float64Array(3);

/** Support point of the core at buf[o] in direction d into sp. */
function support(buf: Float64Array, o: number, dx: number, dy: number, dz: number): void {
  const kind = buf[o];
  if (kind === KIND_SPHERE) {
    sp[0] = buf[o + O_A]; sp[1] = buf[o + O_A + 1]; sp[2] = buf[o + O_A + 2];
    return;
  }
  if (kind === KIND_CAPSULE) {
    const ux = buf[o + O_B] - buf[o + O_A], uy = buf[o + O_B + 1] - buf[o + O_A + 1], uz = buf[o + O_B + 2] - buf[o + O_A + 2];
    const off = ux * dx + uy * dy + uz * dz > 0 ? O_B : O_A;
    sp[0] = buf[o + off]; sp[1] = buf[o + off + 1]; sp[2] = buf[o + off + 2];
    return;
  }
  const r = o + O_R;
  // columns of R are the shape axes
  const ex = buf[r], ey = buf[r + 3], ez = buf[r + 6];
  const fx = buf[r + 1], fy = buf[r + 4], fz = buf[r + 7];
  const gx = buf[r + 2], gy = buf[r + 5], gz = buf[r + 8];
  const x = buf[o + O_A], y = buf[o + O_A + 1], z = buf[o + O_A + 2];
  if (kind === KIND_BOX) {
    const hx = (ex * dx + ey * dy + ez * dz >= 0 ? 1 : -1) * buf[o + O_H];
    const hy = (fx * dx + fy * dy + fz * dz >= 0 ? 1 : -1) * buf[o + O_H + 1];
    const hz = (gx * dx + gy * dy + gz * dz >= 0 ? 1 : -1) * buf[o + O_H + 2];
    sp[0] = x + hx * ex + hy * fx + hz * gx;
    sp[1] = y + hx * ey + hy * fy + hz * gy;
    sp[2] = z + hx * ez + hy * fz + hz * gz;
    return;
  }
  // cylinder: in its own frame the support is (r·(lx, ly)/|(lx, ly)|, ±h) for the local direction
  // l = Rᵀd; working in the local frame keeps the radial part exactly perpendicular to the axis
  const lx = ex * dx + ey * dy + ez * dz, ly = fx * dx + fy * dy + fz * dz, lz = gx * dx + gy * dy + gz * dz;
  const h = (lz >= 0 ? 1 : -1) * buf[o + O_H + 2];
  const rn = Math.sqrt(lx * lx + ly * ly);
  let qx = 0, qy = 0;
  if (rn > 0) {
    const k = buf[o + O_RADIUS] / rn;
    qx = k * lx; qy = k * ly;
  }
  sp[0] = x + qx * ex + qy * fx + h * gx;
  sp[1] = y + qx * ey + qy * fy + h * gy;
  sp[2] = z + qx * ez + qy * fz + h * gz;
}

// ---- GJK ------------------------------------------------------------------------------------

/** Simplex: Minkowski points W and the support points on A and B that made them (4 × 3 each). */
const W = new Float64Array(12), PA = new Float64Array(12), PB = new Float64Array(12);
const lam = new Float64Array(4);
let count = 0;
/** Closest point of the simplex to the origin. */
const v = new Float64Array(3);

function addVertex(A: Float64Array, ao: number, B: Float64Array, bo: number, dx: number, dy: number, dz: number): number {
  support(A, ao, dx, dy, dz);
  const i = count++;
  PA[3 * i] = sp[0]; PA[3 * i + 1] = sp[1]; PA[3 * i + 2] = sp[2];
  support(B, bo, -dx, -dy, -dz);
  PB[3 * i] = sp[0]; PB[3 * i + 1] = sp[1]; PB[3 * i + 2] = sp[2];
  W[3 * i] = PA[3 * i] - PB[3 * i]; W[3 * i + 1] = PA[3 * i + 1] - PB[3 * i + 1]; W[3 * i + 2] = PA[3 * i + 2] - PB[3 * i + 2];
  return i;
}

/** Keeps the simplex vertices whose flag bit is set (bit k = vertex k), with the weights in lam. */
function keep(mask: number): void {
  let j = 0;
  for (let i = 0; i < count; i++) {
    if ((mask & (1 << i)) === 0) continue;
    if (j !== i) {
      for (let c = 0; c < 3; c++) { W[3 * j + c] = W[3 * i + c]; PA[3 * j + c] = PA[3 * i + c]; PB[3 * j + c] = PB[3 * i + c]; }
      lam[j] = lam[i];
    }
    j++;
  }
  count = j;
}

/** Closest point of the segment W[i]–W[j] to the origin; weights into lam[i], lam[j]; returns the mask. */
function closestSegment(i: number, j: number): number {
  const ax = W[3 * i], ay = W[3 * i + 1], az = W[3 * i + 2];
  const dx = W[3 * j] - ax, dy = W[3 * j + 1] - ay, dz = W[3 * j + 2] - az;
  const dd = dx * dx + dy * dy + dz * dz;
  const t = dd > 0 ? -(ax * dx + ay * dy + az * dz) / dd : 0;
  if (t <= 0) { lam[i] = 1; lam[j] = 0; return 1 << i; }
  if (t >= 1) { lam[i] = 0; lam[j] = 1; return 1 << j; }
  lam[i] = 1 - t; lam[j] = t;
  return (1 << i) | (1 << j);
}

/**
 * Closest point of triangle W[i], W[j], W[k] to the origin; weights into lam; returns the mask.
 * The origin is projected on the triangle's plane and its barycentric coordinates are taken from
 * the signed areas of the sub-triangles (the "signed volumes" idea of Montanari, Petrinic and
 * Barbieri, ACM TOG 36(3), 2017), which stays accurate for the thin triangles GJK builds near a
 * curved contact; when the projection falls outside, the nearest edge decides.
 */
function closestTriangle(i: number, j: number, k: number): number {
  const ax = W[3 * i], ay = W[3 * i + 1], az = W[3 * i + 2];
  const bx = W[3 * j], by = W[3 * j + 1], bz = W[3 * j + 2];
  const cx = W[3 * k], cy = W[3 * k + 1], cz = W[3 * k + 2];
  const abx = bx - ax, aby = by - ay, abz = bz - az;
  const acx = cx - ax, acy = cy - ay, acz = cz - az;
  const nx = aby * acz - abz * acy, ny = abz * acx - abx * acz, nz = abx * acy - aby * acx;
  const nn = nx * nx + ny * ny + nz * nz;
  if (nn > 1e-24 * (abx * abx + aby * aby + abz * abz) * (acx * acx + acy * acy + acz * acz)) {
    const k0 = (nx * ax + ny * ay + nz * az) / nn;
    const px = k0 * nx, py = k0 * ny, pz = k0 * nz;
    // signed areas (times |n|) of the sub-triangles opposite each vertex
    const ua = triArea(bx - px, by - py, bz - pz, cx - px, cy - py, cz - pz, nx, ny, nz) / nn;
    const ub = triArea(cx - px, cy - py, cz - pz, ax - px, ay - py, az - pz, nx, ny, nz) / nn;
    const uc = 1 - ua - ub;
    if (ua >= 0 && ub >= 0 && uc >= 0) {
      lam[i] = ua; lam[j] = ub; lam[k] = uc;
      return (1 << i) | (1 << j) | (1 << k);
    }
  }
  // the nearest of the three edges
  let bestMask = 0, bestD = Infinity, l0 = 0, l1 = 0, l2 = 0;
  for (let e = 0; e < 3; e++) {
    const p = e === 0 ? i : e === 1 ? j : i, q = e === 0 ? j : e === 1 ? k : k;
    const mask = closestSegment(p, q);
    const x = lam[p] * W[3 * p] + lam[q] * W[3 * q], y = lam[p] * W[3 * p + 1] + lam[q] * W[3 * q + 1], z = lam[p] * W[3 * p + 2] + lam[q] * W[3 * q + 2];
    const d = x * x + y * y + z * z;
    if (d < bestD) {
      bestD = d; bestMask = mask;
      l0 = mask & (1 << i) ? lam[i] : 0; l1 = mask & (1 << j) ? lam[j] : 0; l2 = mask & (1 << k) ? lam[k] : 0;
    }
  }
  lam[i] = l0; lam[j] = l1; lam[k] = l2;
  return bestMask;
}

/** n · (u × w). */
function triArea(ux: number, uy: number, uz: number, wx: number, wy: number, wz: number, nx: number, ny: number, nz: number): number {
  return nx * (uy * wz - uz * wy) + ny * (uz * wx - ux * wz) + nz * (ux * wy - uy * wx);
}

const lamTmp = new Float64Array(4);
const lamOld = new Float64Array(4);

/** Closest point of the tetrahedron W[0..3] to the origin; returns the mask (15 = origin inside). */
function closestTetrahedron(): number {
  let bestMask = 15, bestD = Infinity;
  let inside = true;
  for (let f = 0; f < 4; f++) {
    // face opposite vertex f
    const i = f === 0 ? 1 : 0, j = f <= 1 ? 2 : 1, k = f <= 2 ? 3 : 2;
    const ax = W[3 * i], ay = W[3 * i + 1], az = W[3 * i + 2];
    const abx = W[3 * j] - ax, aby = W[3 * j + 1] - ay, abz = W[3 * j + 2] - az;
    const acx = W[3 * k] - ax, acy = W[3 * k + 1] - ay, acz = W[3 * k + 2] - az;
    const nx = aby * acz - abz * acy, ny = abz * acx - abx * acz, nz = abx * acy - aby * acx;
    const sideO = -(nx * ax + ny * ay + nz * az);
    const sideD = nx * (W[3 * f] - ax) + ny * (W[3 * f + 1] - ay) + nz * (W[3 * f + 2] - az);
    const scale = Math.sqrt(nx * nx + ny * ny + nz * nz) * Math.sqrt((W[3 * f] - ax) ** 2 + (W[3 * f + 1] - ay) ** 2 + (W[3 * f + 2] - az) ** 2);
    const degenerate = !(Math.abs(sideD) > 1e-12 * scale);
    if (!degenerate && sideO * sideD >= 0) continue;
    inside = false;
    const mask = closestTriangle(i, j, k);
    let px = 0, py = 0, pz = 0;
    for (let q = 0; q < 4; q++) if (mask & (1 << q)) { px += lam[q] * W[3 * q]; py += lam[q] * W[3 * q + 1]; pz += lam[q] * W[3 * q + 2]; }
    const d = px * px + py * py + pz * pz;
    if (d < bestD) {
      bestD = d; bestMask = mask;
      for (let q = 0; q < 4; q++) lamTmp[q] = mask & (1 << q) ? lam[q] : 0;
    }
  }
  if (inside) return 15;
  for (let q = 0; q < 4; q++) lam[q] = lamTmp[q];
  return bestMask;
}

function witness(): void {
  let ax = 0, ay = 0, az = 0, bx = 0, by = 0, bz = 0;
  for (let q = 0; q < count; q++) {
    ax += lam[q] * PA[3 * q]; ay += lam[q] * PA[3 * q + 1]; az += lam[q] * PA[3 * q + 2];
    bx += lam[q] * PB[3 * q]; by += lam[q] * PB[3 * q + 1]; bz += lam[q] * PB[3 * q + 2];
  }
  gjkOut.pa[0] = ax; gjkOut.pa[1] = ay; gjkOut.pa[2] = az;
  gjkOut.pb[0] = bx; gjkOut.pb[1] = by; gjkOut.pb[2] = bz;
}

/**
 * GJK between the cores of A (at A[ao]) and B. Sets gjkOut.distance, pa, pb (separated) or
 * gjkOut.intersect (the simplex is kept for {@link epaCore}).
 */
export function gjkCore(A: Float64Array, ao: number, B: Float64Array, bo: number): void {
  count = 0;
  gjkOut.intersect = false;
  // the first support direction: from B's bounding centre to A's
  let dx = A[ao + O_BC] - B[bo + O_BC], dy = A[ao + O_BC + 1] - B[bo + O_BC + 1], dz = A[ao + O_BC + 2] - B[bo + O_BC + 2];
  if (dx * dx + dy * dy + dz * dz < 1e-24) { dx = 1; dy = 0; dz = 0; }
  addVertex(A, ao, B, bo, -dx, -dy, -dz);
  lam[0] = 1;
  v[0] = W[0]; v[1] = W[1]; v[2] = W[2];
  let vv = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
  let it = 0;
  for (; it < GJK_MAX_ITERATIONS; it++) {
    if (vv <= 1e-28) { gjkOut.intersect = true; break; }
    // support of D along −v
    support(A, ao, -v[0], -v[1], -v[2]);
    const ax = sp[0], ay = sp[1], az = sp[2];
    support(B, bo, v[0], v[1], v[2]);
    const wx = ax - sp[0], wy = ay - sp[1], wz = az - sp[2];
    // ‖v‖ is an upper bound of the distance, w·v/‖v‖ a lower bound (w supports D along −v)
    const upper = Math.sqrt(vv), gap = upper - (v[0] * wx + v[1] * wy + v[2] * wz) / upper;
    if (gap <= GJK_TOLERANCE || gap <= 1e-14 * upper) break;
    let duplicate = false;
    for (let q = 0; q < count; q++) if (W[3 * q] === wx && W[3 * q + 1] === wy && W[3 * q + 2] === wz) duplicate = true;
    if (duplicate) break;
    const i = count++;
    PA[3 * i] = ax; PA[3 * i + 1] = ay; PA[3 * i + 2] = az;
    PB[3 * i] = sp[0]; PB[3 * i + 1] = sp[1]; PB[3 * i + 2] = sp[2];
    W[3 * i] = wx; W[3 * i + 1] = wy; W[3 * i + 2] = wz;
    for (let q = 0; q < i; q++) lamOld[q] = lam[q];
    const mask = count === 2 ? closestSegment(0, 1) : count === 3 ? closestTriangle(0, 1, 2) : closestTetrahedron();
    if (mask === 15) { gjkOut.intersect = true; break; }
    let nx = 0, ny = 0, nz = 0;
    for (let q = 0; q < count; q++) if (mask & (1 << q)) { nx += lam[q] * W[3 * q]; ny += lam[q] * W[3 * q + 1]; nz += lam[q] * W[3 * q + 2]; }
    const vvNew = nx * nx + ny * ny + nz * nz;
    if (vvNew >= vv) {
      // rounding: the new point gives no progress; keep the previous simplex and answer
      count = i;
      for (let q = 0; q < i; q++) lam[q] = lamOld[q];
      break;
    }
    keep(mask);
    v[0] = nx; v[1] = ny; v[2] = nz;
    vv = vvNew;
  }
  gjkOut.iterations = it;
  if (gjkOut.intersect) { gjkOut.distance = 0; return; }
  witness();
  gjkOut.distance = Math.sqrt(vv);
  if (gjkOut.distance <= 1e-14) gjkOut.intersect = true;
}

// ---- EPA ------------------------------------------------------------------------------------

const EV = new Float64Array(3 * EPA_MAX_VERTICES), EA = new Float64Array(3 * EPA_MAX_VERTICES), EB = new Float64Array(3 * EPA_MAX_VERTICES);
const FI = new Int32Array(3 * EPA_MAX_FACES), FN = new Float64Array(3 * EPA_MAX_FACES), FD = new Float64Array(EPA_MAX_FACES);
const FALIVE = new Uint8Array(EPA_MAX_FACES);
const EE = new Int32Array(2 * EPA_MAX_EDGES);
let nv = 0, nf = 0;

function epaVertex(A: Float64Array, ao: number, B: Float64Array, bo: number, dx: number, dy: number, dz: number): number {
  const i = nv++;
  support(A, ao, dx, dy, dz);
  EA[3 * i] = sp[0]; EA[3 * i + 1] = sp[1]; EA[3 * i + 2] = sp[2];
  support(B, bo, -dx, -dy, -dz);
  EB[3 * i] = sp[0]; EB[3 * i + 1] = sp[1]; EB[3 * i + 2] = sp[2];
  EV[3 * i] = EA[3 * i] - EB[3 * i]; EV[3 * i + 1] = EA[3 * i + 1] - EB[3 * i + 1]; EV[3 * i + 2] = EA[3 * i + 2] - EB[3 * i + 2];
  return i;
}

/** Adds face (i, j, k) (counter-clockwise seen from outside); returns false when out of room. */
function makeFace(i: number, j: number, k: number): boolean {
  if (nf >= EPA_MAX_FACES) return false;
  const f = nf++;
  FI[3 * f] = i; FI[3 * f + 1] = j; FI[3 * f + 2] = k;
  const ax = EV[3 * i], ay = EV[3 * i + 1], az = EV[3 * i + 2];
  const abx = EV[3 * j] - ax, aby = EV[3 * j + 1] - ay, abz = EV[3 * j + 2] - az;
  const acx = EV[3 * k] - ax, acy = EV[3 * k + 1] - ay, acz = EV[3 * k + 2] - az;
  let nx = aby * acz - abz * acy, ny = abz * acx - abx * acz, nz = abx * acy - aby * acx;
  const len = Math.sqrt(nx * nx + ny * ny + nz * nz);
  FALIVE[f] = 1;
  if (!(len > 1e-30)) {
    FN[3 * f] = 0; FN[3 * f + 1] = 0; FN[3 * f + 2] = 0; FD[f] = Infinity;
    return true;
  }
  nx /= len; ny /= len; nz /= len;
  FN[3 * f] = nx; FN[3 * f + 1] = ny; FN[3 * f + 2] = nz;
  FD[f] = nx * ax + ny * ay + nz * az;
  return true;
}

/** Copies the GJK simplex into the EPA vertex buffers. */
function epaFromSimplex(): void {
  nv = count;
  for (let q = 0; q < 3 * count; q++) { EV[q] = W[q]; EA[q] = PA[q]; EB[q] = PB[q]; }
}

function tetraVolume6(): number {
  const ax = EV[0], ay = EV[1], az = EV[2];
  const bx = EV[3] - ax, by = EV[4] - ay, bz = EV[5] - az;
  const cx = EV[6] - ax, cy = EV[7] - ay, cz = EV[8] - az;
  const dx = EV[9] - ax, dy = EV[10] - ay, dz = EV[11] - az;
  return bx * (cy * dz - cz * dy) - by * (cx * dz - cz * dx) + bz * (cx * dy - cy * dx);
}

const AXES = [1, 0, 0, 0, 1, 0, 0, 0, 1];

/**
 * Blows a simplex that touches the origin (rank 1–3) up to a tetrahedron that still contains it,
 * by adding support points along directions out of the simplex's span. Returns false when D is
 * flat there (the depth is then 0).
 */
function encloseOrigin(A: Float64Array, ao: number, B: Float64Array, bo: number): boolean {
  if (nv === 4) return Math.abs(tetraVolume6()) > 1e-30;
  if (nv === 1) {
    for (let k = 0; k < 3; k++) {
      for (const s of [1, -1]) {
        epaVertex(A, ao, B, bo, s * AXES[3 * k], s * AXES[3 * k + 1], s * AXES[3 * k + 2]);
        const dx = EV[3] - EV[0], dy = EV[4] - EV[1], dz = EV[5] - EV[2];
        if (dx * dx + dy * dy + dz * dz > 1e-28 && encloseOrigin(A, ao, B, bo)) return true;
        nv = 1;
      }
    }
    return false;
  }
  if (nv === 2) {
    const dx = EV[3] - EV[0], dy = EV[4] - EV[1], dz = EV[5] - EV[2];
    for (let k = 0; k < 3; k++) {
      const ex = AXES[3 * k], ey = AXES[3 * k + 1], ez = AXES[3 * k + 2];
      const px = dy * ez - dz * ey, py = dz * ex - dx * ez, pz = dx * ey - dy * ex;
      if (px * px + py * py + pz * pz <= 1e-28) continue;
      for (const s of [1, -1]) {
        epaVertex(A, ao, B, bo, s * px, s * py, s * pz);
        const ux = EV[6] - EV[0], uy = EV[7] - EV[1], uz = EV[8] - EV[2];
        const cx = dy * uz - dz * uy, cy = dz * ux - dx * uz, cz = dx * uy - dy * ux;
        if (cx * cx + cy * cy + cz * cz > 1e-28 && encloseOrigin(A, ao, B, bo)) return true;
        nv = 2;
      }
    }
    return false;
  }
  // nv === 3
  const abx = EV[3] - EV[0], aby = EV[4] - EV[1], abz = EV[5] - EV[2];
  const acx = EV[6] - EV[0], acy = EV[7] - EV[1], acz = EV[8] - EV[2];
  const nx = aby * acz - abz * acy, ny = abz * acx - abx * acz, nz = abx * acy - aby * acx;
  if (nx * nx + ny * ny + nz * nz <= 1e-28) return false;
  for (const s of [1, -1]) {
    epaVertex(A, ao, B, bo, s * nx, s * ny, s * nz);
    if (Math.abs(tetraVolume6()) > 1e-30) return true;
    nv = 3;
  }
  return false;
}

/**
 * Penetration depth of the cores after {@link gjkCore} reported an intersection. Sets
 * gjkOut.depth, normal (move B by depth·normal to separate) and the witness points pa, pb
 * (pa − pb = depth·normal).
 */
export function epaCore(A: Float64Array, ao: number, B: Float64Array, bo: number): void {
  epaFromSimplex();
  if (nv === 0) epaVertex(A, ao, B, bo, 1, 0, 0);
  if (!encloseOrigin(A, ao, B, bo)) {
    gjkOut.depth = 0;
    gjkOut.normal[0] = 1; gjkOut.normal[1] = 0; gjkOut.normal[2] = 0;
    for (let c = 0; c < 3; c++) { gjkOut.pa[c] = EA[c]; gjkOut.pb[c] = EB[c]; }
    return;
  }
  // orient the tetrahedron's faces outwards
  nf = 0;
  if (tetraVolume6() < 0) {
    // swap vertices 1 and 2 so (0, 1, 2) is clockwise seen from vertex 3
    for (let c = 0; c < 3; c++) {
      let t = EV[3 + c]; EV[3 + c] = EV[6 + c]; EV[6 + c] = t;
      t = EA[3 + c]; EA[3 + c] = EA[6 + c]; EA[6 + c] = t;
      t = EB[3 + c]; EB[3 + c] = EB[6 + c]; EB[6 + c] = t;
    }
  }
  // with positive volume (0,1,2,3), these faces have outward normals
  makeFace(0, 2, 1); makeFace(0, 1, 3); makeFace(0, 3, 2); makeFace(1, 2, 3);
  let best = 0;
  for (let iter = 0; iter < 4 * EPA_MAX_VERTICES; iter++) {
    best = -1;
    let bestD = Infinity;
    for (let f = 0; f < nf; f++) if (FALIVE[f] && FD[f] < bestD) { bestD = FD[f]; best = f; }
    if (best < 0) break;
    const nx = FN[3 * best], ny = FN[3 * best + 1], nz = FN[3 * best + 2];
    if (nv >= EPA_MAX_VERTICES) break;
    const w = epaVertex(A, ao, B, bo, nx, ny, nz);
    const wx = EV[3 * w], wy = EV[3 * w + 1], wz = EV[3 * w + 2];
    if (nx * wx + ny * wy + nz * wz - bestD <= EPA_TOLERANCE) { nv--; break; }
    // remove the faces w sees, keep their boundary (horizon) edges
    let ne = 0;
    let overflow = false;
    for (let f = 0; f < nf; f++) {
      if (!FALIVE[f]) continue;
      const i0 = FI[3 * f];
      const side = FN[3 * f] * (wx - EV[3 * i0]) + FN[3 * f + 1] * (wy - EV[3 * i0 + 1]) + FN[3 * f + 2] * (wz - EV[3 * i0 + 2]);
      if (!(side > 1e-14)) continue;
      FALIVE[f] = 0;
      for (let e = 0; e < 3; e++) {
        const a = FI[3 * f + e], b = FI[3 * f + ((e + 1) % 3)];
        let found = -1;
        for (let q = 0; q < ne; q++) if (EE[2 * q] === b && EE[2 * q + 1] === a) { found = q; break; }
        if (found >= 0) {
          ne--;
          EE[2 * found] = EE[2 * ne]; EE[2 * found + 1] = EE[2 * ne + 1];
        } else if (ne < EPA_MAX_EDGES) {
          EE[2 * ne] = a; EE[2 * ne + 1] = b; ne++;
        } else overflow = true;
      }
    }
    if (ne === 0 || overflow) break;
    let room = true;
    for (let q = 0; q < ne && room; q++) room = makeFace(EE[2 * q], EE[2 * q + 1], w);
    if (!room) break;
    // compact the face list now and then
    if (nf > EPA_MAX_FACES - 3 * EPA_MAX_EDGES / 4) compactFaces();
  }
  if (best < 0) {
    gjkOut.depth = 0;
    gjkOut.normal[0] = 1; gjkOut.normal[1] = 0; gjkOut.normal[2] = 0;
    return;
  }
  // witness: barycentric coordinates of depth·n in the face
  const i = FI[3 * best], j = FI[3 * best + 1], k = FI[3 * best + 2];
  const d = Math.max(0, FD[best]);
  const nx = FN[3 * best], ny = FN[3 * best + 1], nz = FN[3 * best + 2];
  barycentric(d * nx, d * ny, d * nz, i, j, k);
  for (let c = 0; c < 3; c++) {
    gjkOut.pa[c] = bary[0] * EA[3 * i + c] + bary[1] * EA[3 * j + c] + bary[2] * EA[3 * k + c];
    gjkOut.pb[c] = bary[0] * EB[3 * i + c] + bary[1] * EB[3 * j + c] + bary[2] * EB[3 * k + c];
  }
  gjkOut.depth = d;
  gjkOut.normal[0] = nx; gjkOut.normal[1] = ny; gjkOut.normal[2] = nz;
}

function compactFaces(): void {
  let j = 0;
  for (let f = 0; f < nf; f++) {
    if (!FALIVE[f]) continue;
    if (j !== f) {
      for (let c = 0; c < 3; c++) { FI[3 * j + c] = FI[3 * f + c]; FN[3 * j + c] = FN[3 * f + c]; }
      FD[j] = FD[f];
      FALIVE[j] = 1;
    }
    j++;
  }
  nf = j;
}

const bary = new Float64Array(3);

/** Barycentric coordinates of point p in triangle EV[i], EV[j], EV[k] (clamped to ≥ 0) into bary. */
function barycentric(px: number, py: number, pz: number, i: number, j: number, k: number): void {
  const ax = EV[3 * i], ay = EV[3 * i + 1], az = EV[3 * i + 2];
  const v0x = EV[3 * j] - ax, v0y = EV[3 * j + 1] - ay, v0z = EV[3 * j + 2] - az;
  const v1x = EV[3 * k] - ax, v1y = EV[3 * k + 1] - ay, v1z = EV[3 * k + 2] - az;
  const v2x = px - ax, v2y = py - ay, v2z = pz - az;
  const d00 = v0x * v0x + v0y * v0y + v0z * v0z, d01 = v0x * v1x + v0y * v1y + v0z * v1z, d11 = v1x * v1x + v1y * v1y + v1z * v1z;
  const d20 = v2x * v0x + v2y * v0y + v2z * v0z, d21 = v2x * v1x + v2y * v1y + v2z * v1z;
  const den = d00 * d11 - d01 * d01;
  let b1 = den > 0 ? (d11 * d20 - d01 * d21) / den : 0;
  let b2 = den > 0 ? (d00 * d21 - d01 * d20) / den : 0;
  if (b1 < 0) b1 = 0;
  if (b2 < 0) b2 = 0;
  if (b1 + b2 > 1) { const s = b1 + b2; b1 /= s; b2 /= s; }
  bary[0] = 1 - b1 - b2; bary[1] = b1; bary[2] = b2;
}
