"use client";
/**
 * Requirement-set editor's 3-D view of the cell as the form stands: the arm's base placement,
 * targets as frames with their names, paths as polylines with direction marks, and obstacles.
 * All in the cell frame.
 */
import { useMemo } from "react";
import { poseFromRpy } from "@/lib/analysis/geometry";
import { reqFormToDoc, type ReqForm } from "../requirements/reqForm";
import { cellObstacles } from "./cell";
import { pathMarks, type PathMark, type SceneContent, type TargetMark, type Vec3 } from "./scene";
import { ViewShell } from "./ViewShell";

const KEEPS = "The target, path and placement tables above are unchanged.";

export default function CellView({ form }: { form: ReqForm }) {
  const built = useMemo(() => reqFormToDoc(form), [form]);
  const doc = built.doc;
  const content = useMemo((): SceneContent => {
    const targets: TargetMark[] = doc.targets.map((t) => ({ name: t.name || "(unnamed)", pose: Array.from(poseFromRpy(t.position, t.rpy)) }));
    const positions = doc.targets.map((t) => t.position as Vec3);
    const span = Math.max(0.2, ...positions.map((p) => Math.hypot(p[0] - doc.base[3], p[1] - doc.base[7], p[2] - doc.base[11])));
    const paths: PathMark[] = doc.paths.map((p) => {
      const points = p.waypoints.map((w) => w.position.slice() as Vec3);
      return { name: p.name || "(unnamed path)", points, marks: pathMarks(points, span / 6) };
    });
    return { mount: doc.base.slice(), targets, paths, obstacles: cellObstacles(doc), floorZ: doc.base[11] };
  }, [doc]);
  return (
    <div data-testid="cell-view">
      {built.errors.length > 0 && (
        <p className="notice warn" role="status">
          {built.errors.length} {built.errors.length === 1 ? "entry is" : "entries are"} not a number yet and {built.errors.length === 1 ? "is" : "are"} drawn as 0 (first: {built.errors[0].message}).
        </p>
      )}
      <ViewShell
        content={content}
        frameKey="cell"
        fileName={`armsift-cell-${(form.name || "cell").replace(/[^\w.-]+/g, "-").slice(0, 40)}`}
        caption={`Armsift 3-D view of the cell ${form.name || ""}: ${doc.targets.length} targets, ${doc.paths.length} paths, ${content.obstacles?.length ?? 0} obstacles, cell frame at the origin.`}
        label={`3-D view of the cell ${form.name}`}
        keeps={KEEPS}
        legend={
          <>
            <li>Arm base: the placement frame, labelled “arm base”.</li>
            <li>Targets: the TCP frame each target asks for, with its name; the ring lies about the tool z axis.</li>
            <li>Paths: waypoint polylines, arrowheads pointing the way the path runs, “start” and “end” labelled.</li>
            <li>Obstacles: translucent shapes with their names.</li>
          </>
        }
      />
    </div>
  );
}
