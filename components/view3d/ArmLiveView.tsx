"use client";
/**
 * Arm editor's live 3-D view: the arm as the table stands, posed by a slider per joint (within its
 * limits) through the kinematics library's forward kinematics; home and the limits on buttons.
 * The world is the arm's own base frame (the frame the arm file's base transform is given in).
 */
import { useMemo, useState } from "react";
import { poseRpy } from "@/shared/pose";
import { jointToDisplay, jointUnit } from "@/shared/units";
import { kinematicsOf, type ArmDocument } from "@/shared/schemas/arm";
import { linkGeometry } from "@/lib/geometry/arm";
import { armFormToDoc, type ArmForm } from "../arm/armForm";
import { createRig, homeConfiguration, poseArm, originOf, type ArmRig } from "./scene";
import { mmText, ViewShell } from "./ViewShell";
import { deg, fixed } from "@/shared/format";

const KEEPS = "The joint table and the transforms above are unchanged.";

/** The rig for the table, or why it cannot be drawn. */
function rigOf(doc: ArmDocument, formErrors: string[]): { rig: ArmRig | null; problem: string | null } {
  if (formErrors.length) return { rig: null, problem: formErrors[0] };
  try {
    return { rig: createRig(kinematicsOf(doc), undefined, { links: linkGeometry(doc), base: doc.baseCollision }), problem: null };
  } catch (e) {
    return { rig: null, problem: e instanceof Error ? e.message : String(e) };
  }
}

/** Same joint count and limits: the sliders can keep their values. */
const sameLimits = (a: ArmRig, b: ArmRig) => a.model.n === b.model.n && a.model.lower.every((v, i) => v === b.model.lower[i] && a.model.upper[i] === b.model.upper[i]);

/**
 * Keyboard steps of a joint slider: arrows 0.5° (1 mm), Page Up / Down 10° (10 mm), Home / End
 * the limits. The slider itself takes any value, so what it shows is exactly the q drawn.
 */
function keyStep(key: string, v: number, lo: number, hi: number, type: "revolute" | "prismatic"): number | null {
  const small = type === "revolute" ? Math.PI / 360 : 0.001;
  const clamp = (x: number) => Math.min(hi, Math.max(lo, x));
  switch (key) {
    case "ArrowRight": case "ArrowUp": return clamp(v + small);
    case "ArrowLeft": case "ArrowDown": return clamp(v - small);
    case "PageUp": return clamp(v + 20 * small);
    case "PageDown": return clamp(v - 20 * small);
    case "Home": return lo;
    case "End": return hi;
    default: return null;
  }
}

const clampQ = (rig: ArmRig, q: readonly number[]) => Array.from({ length: rig.model.n }, (_, i) => Math.min(rig.model.upper[i], Math.max(rig.model.lower[i], q[i] ?? 0)));

export default function ArmLiveView({ form }: { form: ArmForm }) {
  const built = useMemo(() => armFormToDoc(form), [form]);
  const current = useMemo(() => rigOf(built.doc, built.errors.map((e) => e.message)), [built]);
  // The last table that could be drawn stays on screen while the current one has an error.
  const [shown, setShown] = useState<{ rig: ArmRig; q: number[] } | null>(() => (current.rig ? { rig: current.rig, q: homeConfiguration(current.rig) } : null));
  if (current.rig && shown?.rig !== current.rig) {
    const q = shown && sameLimits(shown.rig, current.rig) ? shown.q : current.rig ? homeConfiguration(current.rig) : [];
    setShown({ rig: current.rig, q: clampQ(current.rig, q) });
  }
  const rig = shown?.rig ?? null;
  const q = shown?.q ?? null;
  const figure = useMemo(() => (rig && q ? poseArm(rig, q) : null), [rig, q]);
  const content = useMemo(() => ({ arm: figure, toolLabel: "tool point", originLabel: null }), [figure]);

  if (!rig || !q || !figure) {
    return <p className="notice warn" role="status">The 3-D view will draw the arm once the joint table is complete: {current.problem ?? "no joints yet"}.</p>;
  }
  const setJoint = (i: number, v: number) => setShown({ rig, q: q.map((x, k) => (k === i ? v : x)) });
  const { p, rpy } = poseRpy(figure.tool);

  return (
    <div data-testid="arm-view">
      {current.problem && (
        <p className="notice warn" role="status">
          Showing the last complete table: {current.problem}
        </p>
      )}
      <div className="toolbar">
        <button type="button" title="Every joint at 0, or mid-range where 0 is outside its limits" onClick={() => setShown({ rig, q: homeConfiguration(rig) })}>
          Home (q = 0)
        </button>
        <button type="button" onClick={() => setShown({ rig, q: Array.from(rig.model.lower) })}>
          Show at lower limits
        </button>
        <button type="button" onClick={() => setShown({ rig, q: Array.from(rig.model.upper) })}>
          Show at upper limits
        </button>
      </div>
      <div className="v3-controls" role="group" aria-label="Joint positions">
        {q.map((v, i) => {
          const type = rig.model.types[i];
          const unit = jointUnit(type);
          const shownV = jointToDisplay(type, v);
          const lo = jointToDisplay(type, rig.model.lower[i]), hi = jointToDisplay(type, rig.model.upper[i]);
          const text = `${fixed(shownV, 1)} ${unit}`;
          return (
            <div className="v3-slider" key={i}>
              <label htmlFor={`v3-q-${i}`}>
                Joint {i + 1} ({type}, {fixed(lo, 0)} to {fixed(hi, 0)} {unit})
              </label>
              <input
                id={`v3-q-${i}`}
                type="range"
                min={rig.model.lower[i]}
                max={rig.model.upper[i]}
                step="any"
                value={v}
                aria-valuetext={text}
                data-testid={`joint-slider-${i + 1}`}
                onChange={(e) => setJoint(i, Number(e.target.value))}
                onKeyDown={(e) => {
                  const next = keyStep(e.key, v, rig.model.lower[i], rig.model.upper[i], type);
                  if (next === null) return;
                  e.preventDefault();
                  setJoint(i, next);
                }}
              />
              <output htmlFor={`v3-q-${i}`}>{text}</output>
            </div>
          );
        })}
      </div>
      <p className="v3-readout" data-testid="tool-readout">
        Tool point in the base frame: x {mmText(p[0])}, y {mmText(p[1])}, z {mmText(p[2])}; roll {deg(rpy[0])}, pitch {deg(rpy[1])}, yaw {deg(rpy[2])}.
      </p>
      <ViewShell
        content={content}
        frameKey={`${rig.model.n}`}
        fileName={`armsift-arm-${(form.name || "arm").replace(/[^\w.-]+/g, "-").slice(0, 40)}`}
        caption={`Armsift 3-D view: ${form.name || "arm"} at q = (${q.map((x, i) => `${fixed(jointToDisplay(rig.model.types[i], x), 1)} ${jointUnit(rig.model.types[i])}`).join(", ")}), base frame at the origin.`}
        label={`3-D view of ${form.name || "the arm"}`}
        keeps={KEEPS}
        legend={
          <>
            <li>
              Links: rods from joint to joint{rig.model.convention === "chain" ? ", straight from each link frame's origin to the next" : " along the table (d along z, then a along x)"}
              {figure.capsules.length ? "; translucent capsules: the collision geometry (given, or derived from the collision radius)" : ""}.
            </li>
            <li>
              Joints: amber cylinders (revolute) or blocks (prismatic) along each joint axis, numbered 1–{rig.model.n}; the small frame at each is{" "}
              {rig.model.convention === "chain" ? "the link frame the axis is given in" : "the frame whose z is that axis"}.
            </li>
            <li>Tool point {mmText(Math.hypot(...originOf(figure.tool)))} from the base origin.</li>
          </>
        }
      />
    </div>
  );
}
