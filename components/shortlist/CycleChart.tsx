"use client";
import { useSyncExternalStore } from "react";
import { Bar, BarChart, CartesianGrid, LabelList, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { fixed } from "@/shared/format";
import { useMounted } from "./useMounted";
import type { CycleChartData } from "./view";

/** Two shades per kind of step; neighbouring steps of one kind alternate between them. */
const SHADES: Record<CycleChartData["steps"][number]["kind"], [string, string]> = {
  move: ["#35668f", "#8fb2d1"],
  path: ["#94742a", "#d4b870"],
  wait: ["#7f868d", "#c0c5ca"],
};

/** The fill of each step: the kind's shades in turn. */
export function stepColours(steps: CycleChartData["steps"]): string[] {
  const seen = { move: 0, path: 0, wait: 0 };
  return steps.map((s) => SHADES[s.kind][seen[s.kind]++ % 2]);
}

const NARROW = "(max-width: 640px)";
const subscribeNarrow = (cb: () => void) => {
  const m = window.matchMedia(NARROW);
  m.addEventListener("change", cb);
  return () => m.removeEventListener("change", cb);
};
/** True on a narrow screen (the arm names then get a narrower axis). */
function useNarrow(): boolean {
  return useSyncExternalStore(subscribeNarrow, () => window.matchMedia(NARROW).matches, () => false);
}

/** An arm's name on the axis, cut with "…" to fit `chars` characters; the whole name in its tooltip. */
function ArmTick(props: { x?: number; y?: number; payload?: { value?: string }; chars: number }) {
  const { x = 0, y = 0, payload, chars } = props;
  const full = String(payload?.value ?? "");
  const text = full.length > chars ? `${full.slice(0, chars - 1).trimEnd()}…` : full;
  return (
    <text x={x - 6} y={y} dy={4} textAnchor="end" fontSize={11} fill="#3d444d">
      <title>{full}</title>
      {text}
    </text>
  );
}

interface SegmentProps {
  x?: number;
  y?: number;
  width?: number;
  height?: number;
  fill?: string;
  payload?: { armId?: string };
}

/**
 * A stacked bar per arm, one segment per step of the sequence (s), with the required time as a
 * dashed line. Arms whose cycle is unknown have no bar; "≈" marks an estimate.
 */
export function CycleChart({ data }: { data: CycleChartData }) {
  const mounted = useMounted();
  const narrow = useNarrow();
  const axisWidth = narrow ? 100 : 190;
  const chars = narrow ? 13 : 30;
  const colours = stepColours(data.steps);
  const rows = data.rows.map((r) => ({ ...r, label: `${r.estimate ? "≈ " : ""}${r.arm}${r.time === null ? (r.blocked ? " (blocked)" : " (unknown)") : ""}` }));
  const height = 60 + 40 * rows.length;
  const longest = Math.max(...data.rows.map((r) => r.time ?? 0), data.required ?? 0);
  if (!mounted) return <div className="chart-placeholder" style={{ height: height + 40 }} aria-hidden="true" />;
  return (
    <figure className="chart cycle-chart" data-testid="cycle-chart">
      <figcaption>
        Where the time of <strong>{data.sequence}</strong> goes: one bar per arm, one segment per step, in the order of the sequence (s)
        {data.required !== null ? `; dashed line: the required ${fixed(data.required, 2)} s` : ""}.
      </figcaption>
      <ResponsiveContainer width="100%" height={height} initialDimension={{ width: 640, height }}>
        <BarChart data={rows} layout="vertical" margin={{ top: 16, right: narrow ? 40 : 52, bottom: 18, left: 4 }} barCategoryGap="24%">
          <CartesianGrid stroke="#e7eaee" horizontal={false} />
          <XAxis
            type="number"
            domain={[0, Math.ceil(longest * 1.08 * 10) / 10 || 1]}
            tick={{ fontSize: 11 }}
            tickFormatter={(v) => fixed(Number(v), longest < 5 ? 1 : 0)}
            label={{ value: "cycle time (s)", position: "insideBottom", offset: -10, fontSize: 11 }}
          />
          <YAxis type="category" dataKey="label" tick={<ArmTick chars={chars} />} width={axisWidth} interval={0} />
          <Tooltip formatter={(v, name) => [`${fixed(Number(v), 2)} s`, String(name)]} cursor={{ fill: "rgba(47, 93, 138, 0.06)" }} />
          {data.steps.map((s, k) => (
            <Bar
              key={s.key}
              dataKey={s.key}
              name={s.label}
              stackId="cycle"
              fill={colours[k]}
              isAnimationActive={false}
              shape={(p: SegmentProps) => (
                <rect x={p.x} y={p.y} width={Math.max(0, p.width ?? 0)} height={p.height} fill={p.fill} stroke="#fff" strokeWidth={1} data-testid="cycle-segment" data-step={k + 1} data-arm-id={p.payload?.armId} />
              )}
            >
              {k === data.steps.length - 1 && <LabelList dataKey="time" position="right" fontSize={11} fill="#1f2328" formatter={(v) => (v === null || v === undefined ? "" : `${fixed(Number(v), 2)} s`)} />}
            </Bar>
          ))}
          {data.required !== null && (
            <ReferenceLine x={data.required} stroke="#a3231a" strokeDasharray="5 3" label={{ value: `required ${fixed(data.required, 2)} s`, fontSize: 10, position: "top", fill: "#a3231a" }} />
          )}
        </BarChart>
      </ResponsiveContainer>
      <p className="chart-legend cycle-legend">
        {data.steps.map((s, k) => (
          <span key={s.key} className="lg-item">
            <span className="lg-swatch" style={{ background: colours[k] }} aria-hidden="true" /> {s.label}
          </span>
        ))}
        {data.rows.some((r) => r.estimate) && <span className="lg-item">≈ an estimate: an assumed acceleration for some joint</span>}
      </p>
    </figure>
  );
}
