"use client";
import { Bar, BarChart, CartesianGrid, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
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
  const colours = stepColours(data.steps);
  const rows = data.rows.map((r) => ({ ...r, label: `${r.estimate ? "≈ " : ""}${r.arm}${r.time === null ? " (unknown)" : ""}` }));
  const height = 56 + 34 * rows.length;
  const longest = Math.max(...data.rows.map((r) => r.time ?? 0), data.required ?? 0);
  if (!mounted) return <div className="chart-placeholder" style={{ height: height + 40 }} aria-hidden="true" />;
  return (
    <figure className="chart cycle-chart" data-testid="cycle-chart">
      <figcaption>
        Where the time of <strong>{data.sequence}</strong> goes: one bar per arm, one segment per step, in the order of the sequence (s)
        {data.required !== null ? `; dashed line: the required ${fixed(data.required, 2)} s` : ""}.
      </figcaption>
      <ResponsiveContainer width="100%" height={height} initialDimension={{ width: 640, height }}>
        <BarChart data={rows} layout="vertical" margin={{ top: 14, right: 18, bottom: 18, left: 4 }} barCategoryGap="22%">
          <CartesianGrid stroke="#e7eaee" horizontal={false} />
          <XAxis
            type="number"
            domain={[0, Math.ceil(longest * 1.08 * 10) / 10 || 1]}
            tick={{ fontSize: 11 }}
            tickFormatter={(v) => fixed(Number(v), longest < 5 ? 1 : 0)}
            label={{ value: "cycle time (s)", position: "insideBottom", offset: -10, fontSize: 11 }}
          />
          <YAxis type="category" dataKey="label" tick={{ fontSize: 11 }} width={120} interval={0} />
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
            />
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
