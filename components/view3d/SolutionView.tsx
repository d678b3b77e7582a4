"use client";
/**
 * Shortlist page, per arm: the arm at the analysis' chosen solution of a target (other branches on
 * request), the force ellipsoid at the payload point with the required force to one stated scale,
 * every target marked reached or not with the task matrix's word and symbol, and a slider that
 * steps along a path through the configurations the analysis found. The view reads the stored
 * result and the pinned documents; the only computation is forward kinematics of the stored q.
 */
import { useCallback, useEffect, useMemo, useState } from "react";
import { placedArmKinematics } from "@/lib/analysis/context";
import { linkGeometry } from "@/lib/geometry/arm";
import { invertRigid, mul4, poseFromRpy } from "@/lib/analysis/geometry";
import { transformPointRigid } from "@/lib/kinematics";
import type { RunArmView } from "@/lib/analysis/shortlist";
import type { TargetAnalysis } from "@/lib/analysis/targets";
import type { PathAnalysis } from "@/lib/analysis/paths";
import { kinematicsOf } from "@/shared/schemas/arm";
import { api } from "../api";
import { VERDICT_SYMBOL } from "../shortlist/verdict";
import { bodyShapes, cellObstacles } from "./cell";
import { createRig, forceScale, homeConfiguration, originOf, pathMarks, pointAtArcLength, poseArm, type ArmRig, type ForceMark, type PairMark, type PathMark, type SceneContent, type TargetMark, type Vec3 } from "./scene";
import { mmText, ViewShell } from "./ViewShell";
import { fixed, magnitude } from "@/shared/format";

const KEEPS = "The task matrix, tables and 2-D plots on this page show the same results.";

export interface SolutionViewProps {
  shortlistId: string;
  runId: string;
  armId: string;
  armName: string;
}

/** The clearance check at a target (`cell` of its result; null when the cell checks nothing for the arm). */
type CellCheck = NonNullable<TargetAnalysis["cell"]>;
const cellOf = (t: TargetAnalysis): CellCheck | null => t.cell;
/** 1-based number, among all of the path's samples, of the k-th sample the stored result keeps. */
const sampleNo = (p: PathAnalysis, k: number) => (p.profile.index?.[Math.min(k, p.q.length - 1)] ?? Math.min(k, p.q.length - 1)) + 1;
const quoted = (name: string) => (/^(base|link \d+|tool|payload)$/.test(name) ? name : `“${name}”`);

function closestPair(c: NonNullable<CellCheck["closest"]>, required: number): PairMark {
  const below = c.distance < required ? `, below the required ${mmText(required)}` : "";
  return {
    a: c.a, b: c.b, distance: c.distance, depth: null,
    pointA: c.pointA ? (c.pointA.slice(0, 3) as Vec3) : null, pointB: c.pointB ? (c.pointB.slice(0, 3) as Vec3) : null,
    text: `closest pair: ${quoted(c.a)} to ${quoted(c.b)}, gap ${mmText(c.distance)}${below}`,
  };
}

function collisionPair(c: NonNullable<CellCheck["collision"]>): PairMark {
  return { a: c.a, b: c.b, distance: 0, depth: c.depth, pointA: null, pointB: null, text: `${VERDICT_SYMBOL.fails} collision: ${quoted(c.a)} hits ${quoted(c.b)}, overlap ${mmText(c.depth)}` };
}

type Loaded = { view: RunArmView; rig: ArmRig } | { error: string };

export default function SolutionView(props: SolutionViewProps) {
  const { shortlistId, runId, armId } = props;
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  useEffect(() => {
    let live = true;
    api<RunArmView>(`/api/shortlists/${encodeURIComponent(shortlistId)}/runs/${encodeURIComponent(runId)}/view?arm=${encodeURIComponent(armId)}`, "GET").then((r) => {
      if (!live) return;
      if (!r.ok) return setLoaded({ error: r.error.message });
      try {
        const v = r.data;
        const geometry = { links: linkGeometry(v.arm), base: v.arm.baseCollision };
        setLoaded({ view: v, rig: createRig(placedArmKinematics(kinematicsOf(v.arm), v.requirementSet), v.requirementSet.base, geometry) });
      } catch (e) {
        setLoaded({ error: `the arm cannot be drawn: ${e instanceof Error ? e.message : String(e)}` });
      }
    });
    return () => {
      live = false;
    };
  }, [shortlistId, runId, armId]);

  if (!loaded) return <p className="sub" role="status">Loading the analysis of {props.armName}…</p>;
  if ("error" in loaded) return <p className="notice bad" role="alert">No 3-D view: {loaded.error}</p>;
  return <Solutions view={loaded.view} rig={loaded.rig} armName={props.armName} />;
}

function Solutions({ view, rig, armName }: { view: RunArmView; rig: ArmRig; armName: string }) {
  const req = view.requirementSet;
  const a = view.analysis;
  const hasPaths = a.paths.length > 0;
  const [mode, setMode] = useState<"target" | "path">(a.targets.length === 0 && hasPaths ? "path" : "target");
  const firstReached = Math.max(0, a.targets.findIndex((t) => t.reached));
  const [ti, setTi] = useState(firstReached);
  const [branch, setBranch] = useState<number | null>(null);
  const [showBranches, setShowBranches] = useState(false);
  const [pi, setPi] = useState(0);
  const [sample, setSample] = useState(0);
  // Every target named by default when there are few and the view is wide enough to read them.
  const [allLabels, setAllLabels] = useState(() => a.targets.length <= 12 && window.innerWidth >= 640);

  const t = a.targets[ti];
  const chosen = t?.chosen ?? null;
  const b = branch !== null && t && branch < t.solutions.length ? branch : chosen ?? (t && t.solutions.length > 0 ? 0 : null);
  const cell = t ? cellOf(t) : null;
  const path = a.paths[pi];

  const obstacles = useMemo(() => cellObstacles(req), [req]);
  // Tool shapes are given in the arm's tool-point frame (TCP · tcp⁻¹), payload shapes in the TCP frame.
  const tcpInverse = useMemo(() => Array.from(invertRigid(req.tool.tcp)), [req]);
  const heldShapes = useCallback(
    (tcp: number[]) => [...bodyShapes(Array.from(mul4(tcp, tcpInverse)), req.tool.collision, "tool"), ...bodyShapes(tcp, req.payload.collision, "payload")],
    [req, tcpInverse],
  );
  const span = useMemo(() => poseArm(rig, homeConfiguration(rig)).size, [rig]);
  const targets = useMemo(
    (): TargetMark[] =>
      req.targets.map((rt, i) => ({
        name: rt.name,
        pose: Array.from(poseFromRpy(rt.position, rt.rpy)),
        status: a.targets[i] ? { reached: a.targets[i].reached, verdict: a.targets[i].verdict } : undefined,
        selected: mode === "target" && i === ti,
        label: allLabels || (mode === "target" && i === ti),
      })),
    [req, a, mode, ti, allLabels],
  );
  const paths = useMemo(
    (): PathMark[] =>
      req.paths.map((p, i) => {
        const points = p.waypoints.map((w) => w.position.slice() as Vec3);
        return { name: p.name, points, marks: pathMarks(points, span / 5), selected: mode === "path" && i === pi };
      }),
    [req, span, mode, pi],
  );

  const scene = useMemo((): { content: SceneContent; status: string; force: ForceMark | null } => {
    const base: SceneContent = { targets, paths, obstacles, toolLabel: "TCP", floorZ: req.base[11] };
    if (mode === "path" && path) {
      // the stored result keeps a bounded number of samples per path (profile.index: their places)
      const k = Math.min(sample, path.q.length - 1);
      const no = (path.profile.index?.[k] ?? k) + 1;
      const q = path.q[k];
      const s = path.profile.s[k] ?? 0;
      const where = `sample ${no} of ${path.samples}, ${mmText(s)} along ${path.name}`;
      if (!q) {
        const pts = paths[pi]?.points ?? [];
        return { content: { ...base, arm: null, cursor: { at: pointAtArcLength(pts, s), text: `${VERDICT_SYMBOL.fails} not reached` } }, status: `${where}: not reached, no configuration to show.`, force: null };
      }
      const arm = poseArm(rig, q);
      const margin = path.profile.dexterityMargin[k];
      return {
        content: { ...base, arm, bodies: heldShapes(arm.tool), cursor: { at: originOf(arm.tool), text: `sample ${no}` } },
        status: `${where}: reached${margin !== null && margin !== undefined ? `, dexterity margin D = ${fixed(margin, 2)}` : ""}.`,
        force: null,
      };
    }
    if (!t) return { content: { ...base, arm: poseArm(rig, homeConfiguration(rig)) }, status: "The requirement set has no targets; the arm is shown at home (q = 0).", force: null };
    const verdictText = `${VERDICT_SYMBOL[t.verdict]} ${t.verdict}`;
    if (b === null) {
      return {
        content: { ...base, arm: poseArm(rig, homeConfiguration(rig)) },
        status: `Target ${t.name}: ${verdictText}, not reached (${t.reason}). The arm is shown at home (q = 0).`,
        force: null,
      };
    }
    const sol = t.solutions[b];
    const arm = poseArm(rig, sol.q);
    const bodies = heldShapes(arm.tool);
    const ghosts = showBranches ? t.solutions.filter((_, i) => i !== b).map((s) => poseArm(rig, s.q)) : [];
    if (!t.reached) {
      // Reached by inverse kinematics, but every branch collides in the cell.
      const only = t.solutions.length === 1 && cell?.collision ? collisionPair(cell.collision) : null;
      return {
        content: { ...base, arm, ghosts, bodies, pair: only },
        status: `Target ${t.name}: ${verdictText}, not reached (${t.reason}). Shown: branch ${b + 1} of ${t.solutions.length}, which collides.`,
        force: null,
      };
    }
    let force: ForceMark | null = null;
    if (b === chosen && t.forceEllipsoid) {
      const required = req.targets[ti]?.force ?? null;
      const fe = t.forceEllipsoid;
      const sc = forceScale(fe.radii, required, span * 0.3);
      force = {
        point: transformPointRigid(arm.tool, req.payload.cog),
        axes: fe.directions.map((d, i) => ({ dir: d as Vec3, radius: fe.radii[i] })),
        weighted: fe.weighted,
        force: required ? (required.slice() as Vec3) : null,
        forceAt: originOf(arm.tool),
        ...sc,
      };
    }
    const rule = cell ? "collision-free first, then the required clearance, then the best dexterity margin" : "best dexterity margin";
    const which = b === chosen ? `the chosen branch (${rule})` : "another branch";
    // The analysis reports the closest pair of the chosen branch only.
    const pair = b === chosen && cell?.closest ? closestPair(cell.closest, cell.required) : null;
    const free = sol.collisionFree === false ? "; this branch collides in the cell" : "";
    return {
      content: { ...base, arm, ghosts, force, bodies, pair },
      status: `Target ${t.name}: ${verdictText}; branch ${b + 1} of ${t.solutions.length}, ${which}, dexterity margin D = ${fixed(sol.margin, 2)}${free}.${pair ? ` ${pair.text[0].toUpperCase()}${pair.text.slice(1)}.` : ""}`,
      force,
    };
  }, [targets, paths, obstacles, mode, path, sample, pi, t, b, chosen, showBranches, rig, req, ti, span, heldShapes, cell]);

  const f = scene.force;
  const radiiText = f ? f.axes.map((x) => (x.radius === null ? "unbounded" : `${magnitude(x.radius)} N`)).join(", ") : "";

  return (
    <div data-testid="solution-view">
      <div className="v3-controls">
        {a.targets.length > 0 && hasPaths && (
          <div className="field" role="radiogroup" aria-label="Show">
            <span className="checks">
              <label>
                <input type="radio" name={`v3-mode-${view.armId}`} checked={mode === "target"} onChange={() => setMode("target")} /> a target
              </label>
              <label>
                <input type="radio" name={`v3-mode-${view.armId}`} checked={mode === "path"} onChange={() => setMode("path")} /> a path
              </label>
            </span>
          </div>
        )}
        {mode === "target" && a.targets.length > 0 && (
          <>
            <div className="field">
              <label htmlFor={`v3-target-${view.armId}`}>Target</label>
              <select id={`v3-target-${view.armId}`} value={ti} onChange={(e) => { setTi(Number(e.target.value)); setBranch(null); }}>
                {a.targets.map((x, i) => (
                  <option key={x.name} value={i}>
                    {x.name}: {VERDICT_SYMBOL[x.verdict]} {x.verdict}{x.reached ? "" : " (not reached)"}
                  </option>
                ))}
              </select>
            </div>
            {t && t.solutions.length > 0 && (
              <div className="field">
                <label htmlFor={`v3-branch-${view.armId}`}>Branch (IK solution)</label>
                <select id={`v3-branch-${view.armId}`} value={b ?? 0} onChange={(e) => setBranch(Number(e.target.value))}>
                  {t.solutions.map((s, i) => (
                    <option key={i} value={i}>
                      {i + 1}{i === chosen ? " (chosen)" : ""}: D = {fixed(s.margin, 2)}{s.collisionFree === false ? ", collides" : ""}
                    </option>
                  ))}
                </select>
                {t.solutions.length > 1 && (
                  <label className="v3-check">
                    <input type="checkbox" checked={showBranches} onChange={(e) => setShowBranches(e.target.checked)} /> draw the other {t.solutions.length - 1} branch{t.solutions.length > 2 ? "es" : ""} faint
                  </label>
                )}
              </div>
            )}
          </>
        )}
        {a.targets.length > 0 && (
          <div className="field">
            <label className="v3-check">
              <input type="checkbox" checked={allLabels} onChange={(e) => setAllLabels(e.target.checked)} /> name every target (else the selected one only)
            </label>
          </div>
        )}
        {mode === "path" && path && (
          <>
            <div className="field">
              <label htmlFor={`v3-path-${view.armId}`}>Path</label>
              <select id={`v3-path-${view.armId}`} value={pi} onChange={(e) => { setPi(Number(e.target.value)); setSample(0); }}>
                {a.paths.map((p, i) => (
                  <option key={p.name} value={i}>
                    {p.name}: {VERDICT_SYMBOL[p.verdict]} {p.verdict} ({p.reached} of {p.samples} samples reached)
                  </option>
                ))}
              </select>
            </div>
            <div className="v3-slider">
              <label htmlFor={`v3-sample-${view.armId}`}>Sample along the path</label>
              <input
                id={`v3-sample-${view.armId}`}
                type="range"
                min={0}
                max={Math.max(0, path.q.length - 1)}
                step={1}
                value={Math.min(sample, path.q.length - 1)}
                aria-valuetext={`sample ${sampleNo(path, sample)} of ${path.samples}`}
                data-testid="path-slider"
                onChange={(e) => setSample(Number(e.target.value))}
              />
              <output htmlFor={`v3-sample-${view.armId}`}>
                {sampleNo(path, sample)} / {path.samples}
              </output>
            </div>
          </>
        )}
      </div>
      <p className="v3-status" role="status" data-testid="view-status">
        {scene.status}
      </p>
      <ViewShell
        content={scene.content}
        frameKey={view.armId}
        fileName={`armsift-${armName.replace(/[^\w.-]+/g, "-").slice(0, 40)}-${mode === "path" && path ? `path-${path.name}` : t ? `target-${t.name}` : "arm"}`.replace(/[^\w.-]+/g, "-")}
        caption={`Armsift 3-D view: ${armName} (rev ${view.revision}) in ${req.name}. ${scene.status}${f ? ` Force ellipsoid at the payload point, ${f.scaleText}; semi-axes ${radiiText}.` : ""} Screening aid only; see the caution on the page.`}
        label={`3-D view of ${armName} in the cell`}
        keeps={KEEPS}
        legend={
          <>
            <li>Targets: a ring = reached, a cross = not reached; each label gives the task matrix&apos;s symbol and word ({VERDICT_SYMBOL.meets} meets, {VERDICT_SYMBOL.marginal} marginal, {VERDICT_SYMBOL.fails} fails).</li>
            <li>Arm: rods from joint to joint, numbered joints, the TCP frame lettered{showBranches ? "; other branches faint violet" : ""}.</li>
            {f && (
              <li data-testid="force-legend">
                Force ellipsoid at the payload point ({f.weighted ? "weighted by the joint torque limits" : "no torque limits: unit torque ball"}), principal semi-axes to scale, {f.scaleText}: {radiiText}.
                {f.force ? ` Required force ${fixed(Math.hypot(...f.force), 1)} N drawn as an arrow from the TCP at the same scale.` : " No required force at this target."} The exact capability is in the force table.
              </li>
            )}
            {paths.length > 0 && <li>Paths: polylines with arrowheads in the direction of travel.</li>}
            {obstacles.length > 0 && <li>Obstacles: translucent clay shapes with their names (the cell frame).</li>}
            {(req.tool.collision?.length ?? 0) + (req.payload.collision?.length ?? 0) > 0 && <li>Tool and payload shapes: translucent blue, where the arm holds them.</li>}
            {scene.content.pair && (
              <li data-testid="pair-legend">
                Closest pair, drawn over in raspberry with the gap as a rod between the closest points: {scene.content.pair.text}.
              </li>
            )}
          </>
        }
      />
    </div>
  );
}
