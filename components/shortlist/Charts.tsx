"use client";
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis, ZAxis } from "recharts";
import { fixed } from "@/shared/format";
import { useMounted } from "./useMounted";

export interface PathProfileData {
  name: string;
  /**
   * Arc length (mm), σ_min of the translational block (mm/rad), joint speed use with the best
   * joint speeds at each sample (% of the limiting joint's maximum: 100 / exact speed ratio) and
   * the joint speed use of the joint trajectory found (%, from its own differences).
   */
  points: { s: number; sigma: number | null; speedUse: number | null; trajectoryUse: number | null }[];
  /** Some segment only turns the tool: it has no speed requirement (no speed values there). */
  rotationOnly: boolean;
}

const SIZE = { width: 420, height: 220 };

/** Smallest singular value and joint speed use along one path. */
export function PathProfileChart({ data }: { data: PathProfileData }) {
  const mounted = useMounted();
  if (!mounted) return <div className="chart-placeholder" style={{ height: 230 }} aria-hidden="true" />;
  return (
    <figure className="chart">
      <figcaption>
        Path <strong>{data.name}</strong>: smallest singular value of the translational Jacobian and the joint speed used at the required tool speed
        (dashed: with the best joint speeds at each sample; solid: by the joint trajectory found)
        {data.rotationOnly ? ". Segments that only turn the tool have no speed requirement and no speed values." : ""}
      </figcaption>
      <div className="chart-pair">
        <ResponsiveContainer width="100%" height={200} initialDimension={SIZE}>
          <LineChart data={data.points} margin={{ top: 8, right: 12, bottom: 16, left: 4 }}>
            <CartesianGrid stroke="#e7eaee" />
            <XAxis dataKey="s" type="number" tick={{ fontSize: 11 }} label={{ value: "path length (mm)", position: "insideBottom", offset: -8, fontSize: 11 }} />
            <YAxis tick={{ fontSize: 11 }} width={62} label={{ value: "σ min (mm/rad)", angle: -90, position: "insideLeft", offset: 4, fontSize: 11, style: { textAnchor: "middle" } }} />
            <Tooltip formatter={(v) => fixed(Number(v), 1)} labelFormatter={(s) => `s = ${fixed(Number(s), 0)} mm`} />
            <Line type="linear" dataKey="sigma" name="σ min (mm/rad)" stroke="#2f5d8a" dot={false} isAnimationActive={false} connectNulls={false} />
          </LineChart>
        </ResponsiveContainer>
        <ResponsiveContainer width="100%" height={200} initialDimension={SIZE}>
          <LineChart data={data.points} margin={{ top: 8, right: 12, bottom: 16, left: 4 }}>
            <CartesianGrid stroke="#e7eaee" />
            <XAxis dataKey="s" type="number" tick={{ fontSize: 11 }} label={{ value: "path length (mm)", position: "insideBottom", offset: -8, fontSize: 11 }} />
            <YAxis tick={{ fontSize: 11 }} width={62} label={{ value: "joint speed use (%)", angle: -90, position: "insideLeft", offset: 4, fontSize: 11, style: { textAnchor: "middle" } }} />
            <ReferenceLine y={100} stroke="#a3231a" strokeDasharray="5 3" label={{ value: "joint limit", fontSize: 10, position: "insideTopRight" }} />
            <Tooltip formatter={(v) => `${fixed(Number(v), 0)} %`} labelFormatter={(s) => `s = ${fixed(Number(s), 0)} mm`} />
            <Line type="linear" dataKey="speedUse" name="best joint speeds (%)" stroke="#8a6d2f" strokeDasharray="6 2" dot={false} isAnimationActive={false} connectNulls={false} />
            <Line type="linear" dataKey="trajectoryUse" name="trajectory found (%)" stroke="#5b4a8a" dot={false} isAnimationActive={false} connectNulls={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

export interface WorkspaceData {
  /** Side view boundary [r, z] and top view boundary [x, y] (mm), targets (mm). */
  side: { r: number; z: number }[];
  top: { x: number; y: number }[];
  targets: { name: string; r: number; z: number; x: number; y: number; reached: boolean | null }[];
  note: string;
}

function TargetShape(props: { cx?: number; cy?: number; payload?: { reached: boolean | null } }) {
  const { cx = 0, cy = 0, payload } = props;
  if (payload?.reached) return <circle cx={cx} cy={cy} r={4.5} fill="#216e39" stroke="#fff" strokeWidth={1} />;
  return (
    <g stroke="#a3231a" strokeWidth={2}>
      <line x1={cx - 4} y1={cy - 4} x2={cx + 4} y2={cy + 4} />
      <line x1={cx - 4} y1={cy + 4} x2={cx + 4} y2={cy - 4} />
    </g>
  );
}

/** Sampled reach envelope in a side view (r, z) and a top view (x, y), with the targets. */
export function WorkspaceChart({ data }: { data: WorkspaceData }) {
  const mounted = useMounted();
  const reached = data.targets.filter((t) => t.reached);
  const missed = data.targets.filter((t) => !t.reached);
  const view = (kind: "side" | "top") => {
    const xk = kind === "side" ? "r" : "x";
    const yk = kind === "side" ? "z" : "y";
    const outline = kind === "side" ? data.side : data.top;
    const closed = kind === "top" && outline.length ? [...outline, outline[0]] : outline;
    return (
      <ResponsiveContainer width="100%" height={240} initialDimension={{ width: 420, height: 240 }}>
        <ScatterChart margin={{ top: 8, right: 12, bottom: 16, left: 4 }}>
          <CartesianGrid stroke="#e7eaee" />
          <XAxis dataKey={xk} type="number" tick={{ fontSize: 11 }} label={{ value: `${kind === "side" ? "radius from base axis" : "x"} (mm)`, position: "insideBottom", offset: -8, fontSize: 11 }} />
          <YAxis dataKey={yk} type="number" tick={{ fontSize: 11 }} width={62} label={{ value: `${kind === "side" ? "z" : "y"} (mm)`, angle: -90, position: "insideLeft", offset: 4, fontSize: 11, style: { textAnchor: "middle" } }} />
          <ZAxis range={[30, 30]} />
          <Tooltip formatter={(v) => fixed(Number(v), 0)} />
          <Scatter name="envelope (sampled)" data={closed} line={{ stroke: "#6b8fb3" }} shape={() => <g />} isAnimationActive={false} />
          <Scatter name="target reached (●)" data={reached} shape={<TargetShape />} isAnimationActive={false} />
          <Scatter name="target not reached (✗)" data={missed} shape={<TargetShape />} isAnimationActive={false} fill="#a3231a" />
        </ScatterChart>
      </ResponsiveContainer>
    );
  };
  if (!mounted) return <div className="chart-placeholder" style={{ height: 270 }} aria-hidden="true" />;
  return (
    <figure className="chart">
      <figcaption>Workspace envelope (cell frame): side view and top view, with the targets. {data.note}</figcaption>
      <div className="chart-pair">
        {view("side")}
        {view("top")}
      </div>
      <p className="chart-legend">
        <span className="lg-line" aria-hidden="true" /> envelope (sampled, a lower bound) · <span className="ok">●</span> target reached · <span className="bad-ink">✗</span> target not reached
      </p>
    </figure>
  );
}
