/**
 * The packed form of shapes used by the allocation-free queries: each shape is `STRIDE` numbers
 * in a Float64Array, so a body's shapes, a placed arm and a cell's obstacles are flat buffers
 * that the hot loops read without creating objects.
 *
 * Layout of one shape at offset o (lengths in m, in the frame the buffer is expressed in):
 * - o+0  kind: {@link KIND_SPHERE}, {@link KIND_CAPSULE}, {@link KIND_BOX}, {@link KIND_CYLINDER}
 * - o+1  radius: sphere, capsule and cylinder radius; 0 for a box
 * - o+2…4  point a: sphere centre, capsule `from`, box and cylinder centre
 * - o+5…7  point b: capsule `to` (equal to a for the other kinds)
 * - o+8…16 rotation R (row-major 3×3; its columns are the shape's x, y, z axes): box and cylinder
 * - o+17…19 half extents: box half sides; cylinder (0, 0, half length)
 * - o+20…22 centre and o+23 radius of a bounding sphere (every point of the shape lies within it)
 *
 * Spheres and capsules are handled as a core (a point or a segment) plus a margin (the radius);
 * boxes and cylinders have no margin.
 */
import type { Shape } from "./types";

export const STRIDE = 24;
const KIND_SPHERE = 0;
const KIND_CAPSULE = 1;
const KIND_BOX = 2;
const KIND_CYLINDER = 3;

const O_RADIUS = 1;
const O_A = 2;
const O_B = 5;
const O_R = 8;
const O_H = 17;
const O_BC = 20;
const O_BR = 23;

function setVec(out: Float64Array, o: number, v: ArrayLike<number>): void {
  out[o] = v[0]; out[o + 1] = v[1]; out[o + 2] = v[2];
}

/** Fills the bounding sphere of the packed shape at `o` from its other fields. */
export function updateBound(buf: Float64Array, o: number): void {
  const kind = buf[o];
  if (kind === KIND_SPHERE) {
    buf[o + O_BC] = buf[o + O_A]; buf[o + O_BC + 1] = buf[o + O_A + 1]; buf[o + O_BC + 2] = buf[o + O_A + 2];
    buf[o + O_BR] = buf[o + O_RADIUS];
  } else if (kind === KIND_CAPSULE) {
    const ax = buf[o + O_A], ay = buf[o + O_A + 1], az = buf[o + O_A + 2];
    const bx = buf[o + O_B], by = buf[o + O_B + 1], bz = buf[o + O_B + 2];
    buf[o + O_BC] = 0.5 * (ax + bx); buf[o + O_BC + 1] = 0.5 * (ay + by); buf[o + O_BC + 2] = 0.5 * (az + bz);
    buf[o + O_BR] = 0.5 * Math.sqrt((bx - ax) ** 2 + (by - ay) ** 2 + (bz - az) ** 2) + buf[o + O_RADIUS];
  } else {
    buf[o + O_BC] = buf[o + O_A]; buf[o + O_BC + 1] = buf[o + O_A + 1]; buf[o + O_BC + 2] = buf[o + O_A + 2];
    const hx = buf[o + O_H], hy = buf[o + O_H + 1], hz = buf[o + O_H + 2];
    buf[o + O_BR] = kind === KIND_BOX ? Math.sqrt(hx * hx + hy * hy + hz * hz) : Math.sqrt(buf[o + O_RADIUS] ** 2 + hz * hz);
  }
}

/**
 * Writes `shape` (expressed in frame F) into `out` at offset `o`, optionally placed by
 * `pose` = T_W_F (row-major 4×4; the shape is then expressed in W). Allocates nothing.
 */
export function packShape(shape: Shape, out: Float64Array, o: number, pose?: ArrayLike<number>): void {
  for (let k = 0; k < STRIDE; k++) out[o + k] = 0;
  switch (shape.shape) {
    case "sphere":
      out[o] = KIND_SPHERE; out[o + O_RADIUS] = shape.radius;
      setVec(out, o + O_A, shape.center); setVec(out, o + O_B, shape.center);
      out[o + O_R] = out[o + O_R + 4] = out[o + O_R + 8] = 1;
      break;
    case "capsule":
      out[o] = KIND_CAPSULE; out[o + O_RADIUS] = shape.radius;
      setVec(out, o + O_A, shape.from); setVec(out, o + O_B, shape.to);
      out[o + O_R] = out[o + O_R + 4] = out[o + O_R + 8] = 1;
      break;
    case "box":
    case "cylinder": {
      const p = shape.pose;
      out[o] = shape.shape === "box" ? KIND_BOX : KIND_CYLINDER;
      out[o + O_A] = p[3]; out[o + O_A + 1] = p[7]; out[o + O_A + 2] = p[11];
      out[o + O_B] = p[3]; out[o + O_B + 1] = p[7]; out[o + O_B + 2] = p[11];
      for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[o + O_R + 3 * r + c] = p[4 * r + c];
      if (shape.shape === "box") {
        out[o + O_H] = 0.5 * shape.size[0]; out[o + O_H + 1] = 0.5 * shape.size[1]; out[o + O_H + 2] = 0.5 * shape.size[2];
      } else {
        out[o + O_RADIUS] = shape.radius; out[o + O_H + 2] = 0.5 * shape.length;
      }
      break;
    }
  }
  updateBound(out, o);
  if (pose) placeShape(out, o, pose, out, o);
}

/**
 * Writes the shape at `src[so]` (in frame F) placed by `pose` = T_W_F into `dst[dOff]` (in W).
 * `src` and `dst` may be the same slot. Allocates nothing.
 */
export function placeShape(src: Float64Array, so: number, pose: ArrayLike<number>, dst: Float64Array, dOff: number): void {
  const p0 = pose[0], p1 = pose[1], p2 = pose[2], p3 = pose[3];
  const p4 = pose[4], p5 = pose[5], p6 = pose[6], p7 = pose[7];
  const p8 = pose[8], p9 = pose[9], p10 = pose[10], p11 = pose[11];
  dst[dOff] = src[so];
  dst[dOff + O_RADIUS] = src[so + O_RADIUS];
  for (let k = 0; k < 3; k++) {
    const off = k === 0 ? O_A : k === 1 ? O_B : O_BC;
    const x = src[so + off], y = src[so + off + 1], z = src[so + off + 2];
    dst[dOff + off] = p0 * x + p1 * y + p2 * z + p3;
    dst[dOff + off + 1] = p4 * x + p5 * y + p6 * z + p7;
    dst[dOff + off + 2] = p8 * x + p9 * y + p10 * z + p11;
  }
  // R_W = R_pose · R_F (row-major)
  const r = so + O_R, w = dOff + O_R;
  const a0 = src[r], a1 = src[r + 1], a2 = src[r + 2], a3 = src[r + 3], a4 = src[r + 4], a5 = src[r + 5], a6 = src[r + 6], a7 = src[r + 7], a8 = src[r + 8];
  dst[w] = p0 * a0 + p1 * a3 + p2 * a6; dst[w + 1] = p0 * a1 + p1 * a4 + p2 * a7; dst[w + 2] = p0 * a2 + p1 * a5 + p2 * a8;
  dst[w + 3] = p4 * a0 + p5 * a3 + p6 * a6; dst[w + 4] = p4 * a1 + p5 * a4 + p6 * a7; dst[w + 5] = p4 * a2 + p5 * a5 + p6 * a8;
  dst[w + 6] = p8 * a0 + p9 * a3 + p10 * a6; dst[w + 7] = p8 * a1 + p9 * a4 + p10 * a7; dst[w + 8] = p8 * a2 + p9 * a5 + p10 * a8;
  dst[dOff + O_H] = src[so + O_H]; dst[dOff + O_H + 1] = src[so + O_H + 1]; dst[dOff + O_H + 2] = src[so + O_H + 2];
  dst[dOff + O_BR] = src[so + O_BR];
}

