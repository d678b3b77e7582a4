"use client";
/**
 * The 3-D views as pages place them. Each is a button until opened; the view's code (three.js,
 * the scene) loads as its own chunk on the first open.
 */
import { lazy } from "react";
import type { ArmForm } from "../arm/armForm";
import type { ReqForm } from "../requirements/reqForm";
import { LazyViewFrame } from "./LazyViewFrame";
import type { SolutionViewProps } from "./SolutionView";

const ArmLiveView = lazy(() => import("./ArmLiveView"));
const CellView = lazy(() => import("./CellView"));
const SolutionView = lazy(() => import("./SolutionView"));

/** Arm editor: the arm as the table stands, with joint sliders. */
export function ArmViewPanel({ form }: { form: ArmForm }) {
  return (
    <LazyViewFrame title="3-D view" keeps="The joint table and the transforms are unchanged." testId="arm-view3d">
      <ArmLiveView form={form} />
    </LazyViewFrame>
  );
}

/** Requirement-set editor: the cell with targets, paths and obstacles. */
export function CellViewPanel({ form }: { form: ReqForm }) {
  return (
    <LazyViewFrame title="3-D view of the cell" keeps="The tables of targets and paths are unchanged." testId="cell-view3d">
      <CellView form={form} />
    </LazyViewFrame>
  );
}

/** Shortlist page, per arm: the solutions of the analysis run shown. */
export function SolutionViewPanel(props: SolutionViewProps) {
  return (
    <LazyViewFrame title="3-D view" keeps="The task matrix, tables and 2-D plots on this page show the same results." testId="solution-view3d">
      <SolutionView {...props} />
    </LazyViewFrame>
  );
}
