/**
 * The cell and the arm's collision geometry as the 3-D view draws them (cell frame, m): the
 * requirement set's obstacles (`cell.obstacles`), the tool and payload shapes, the arm's base
 * capsules. Link capsules come from the geometry library (lib/geometry `linkGeometry`).
 */
import type { RequirementSet } from "@/shared/schemas/requirements";
import type { BodyShape } from "@/shared/schemas/cell";
import type { ObstacleMark, Pose, Vec3 } from "./scene";

/** The requirement set's obstacles, names as given (unique by the schema). */
export function cellObstacles(req: Pick<RequirementSet, "cell">): ObstacleMark[] {
  return (req.cell?.obstacles ?? []).map((o): ObstacleMark => {
    switch (o.shape) {
      case "box": return { name: o.name, shape: "box", pose: o.pose.slice(), size: [o.size[0], o.size[1], o.size[2]] };
      case "sphere": return { name: o.name, shape: "sphere", center: o.center.slice() as Vec3, radius: o.radius };
      case "cylinder": return { name: o.name, shape: "cylinder", pose: o.pose.slice(), radius: o.radius, length: o.length };
      case "capsule": return { name: o.name, shape: "capsule", from: o.from.slice() as Vec3, to: o.to.slice() as Vec3, radius: o.radius };
    }
  });
}

const mul = (a: ArrayLike<number>, b: ArrayLike<number>): Pose => {
  const out = new Array<number>(16).fill(0);
  for (let r = 0; r < 4; r++) for (let c = 0; c < 4; c++) for (let k = 0; k < 4; k++) out[4 * r + c] += a[4 * r + k] * b[4 * k + c];
  return out;
};
const apply = (t: ArrayLike<number>, p: ArrayLike<number>): Vec3 => [
  t[0] * p[0] + t[1] * p[1] + t[2] * p[2] + t[3],
  t[4] * p[0] + t[5] * p[1] + t[6] * p[2] + t[7],
  t[8] * p[0] + t[9] * p[1] + t[10] * p[2] + t[11],
];

/** Body shapes (capsules, boxes) given in the frame `frame` (world pose), as drawn marks named `who`. */
export function bodyShapes(frame: ArrayLike<number>, shapes: readonly BodyShape[] | undefined, who: string): ObstacleMark[] {
  return (shapes ?? []).map((s, i): ObstacleMark => {
    const name = s.name ? `${who}: ${s.name}` : `${who} ${i + 1}`;
    return s.shape === "box"
      ? { name, shape: "box", pose: mul(frame, s.pose), size: [s.size[0], s.size[1], s.size[2]] }
      : { name, shape: "capsule", from: apply(frame, s.from), to: apply(frame, s.to), radius: s.radius };
  });
}

