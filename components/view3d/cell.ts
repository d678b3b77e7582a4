/** The cell's obstacles of a requirement set as the 3-D view draws them (cell frame, m). */
import type { RequirementSet } from "@/shared/schemas/requirements";
import { boxAt, type ObstacleMark, type Vec3 } from "./scene";

export function cellObstacles(req: Pick<RequirementSet, "obstacles">): ObstacleMark[] {
  return (req.obstacles ?? []).map((o, i): ObstacleMark => {
    const name = o.name?.trim() || `obstacle ${i + 1}`;
    return o.shape === "box" ? boxAt(name, o.center, o.size) : { name, shape: "sphere", center: o.center.slice() as Vec3, radius: o.radius };
  });
}
