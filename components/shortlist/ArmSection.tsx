/**
 * One arm's section of the shortlist page: the 3-D view, force capability, payload, the cell,
 * the cycle, the path profiles and the workspace. Rendered on the server for the first few arms and in the
 * browser for the others once their data is loaded (LazyArmSection), so it takes its arm as props.
 */
import type { ArmAnalysis } from "@/lib/analysis/shortlist";
import { PathProfileChart, WorkspaceChart } from "./Charts";
import { fixed } from "@/shared/format";
import { VerdictTag } from "./verdict";
import { pathProfile, workspaceData } from "./view";
import { SolutionViewPanel } from "../view3d/launchers";
import { ArmCycles } from "./CycleView";

export const mmText = (m: number | null | undefined, d = 1) => (m === null || m === undefined ? "–" : fixed(m * 1000, d));

/** The cell at each target and along each path of one arm: collision-free or not, clearance and the closest pair. */
function CellTable({ arm, required }: { arm: ArmAnalysis; required: number }) {
  const c = arm.cell;
  if (!c) return null;
  if (c.checkedPairs === 0) return <p className="sub">Nothing checked for this arm: no collision geometry on it, the tool or the payload, or nothing to collide with.</p>;
  return (
    <>
      <div className="table-wrap">
        <table className="printable" data-testid="cell-table">
          <caption>Collisions and clearance in the cell (required clearance {mmText(required)} mm; {c.checkedPairs} pairs of bodies checked)</caption>
          <thead>
            <tr>
              <th scope="col">Target or path</th>
              <th scope="col">Collision-free</th>
              <th scope="col" className="num">Clearance (mm)</th>
              <th scope="col">Closest pair, or what hits what</th>
              <th scope="col" className="num">Branches colliding</th>
            </tr>
          </thead>
          <tbody>
            {arm.targets.map((t) =>
              t.cell ? (
                <tr key={`t:${t.name}`}>
                  <th scope="row">{t.name}</th>
                  <td>{t.cell.collisionFree ? "yes" : "no"}</td>
                  <td className="num">{t.cell.collisionFree ? mmText(t.cell.clearance) : "–"}</td>
                  <td>
                    {t.cell.collisionFree
                      ? t.cell.closest ? `${t.cell.closest.a} – ${t.cell.closest.b}` : "–"
                      : `${t.cell.collision!.a} hits ${t.cell.collision!.b} (overlap ${mmText(t.cell.collision!.depth)} mm)`}
                  </td>
                  <td className="num">
                    {t.cell.colliding} of {t.cell.branches}
                  </td>
                </tr>
              ) : null,
            )}
            {arm.paths.map((p) =>
              p.cell ? (
                <tr key={`p:${p.name}`}>
                  <th scope="row">path {p.name}</th>
                  <td>{p.cell.collisionFree ? "yes (samples and between)" : "no"}</td>
                  <td className="num">{p.cell.collisionFree ? mmText(p.cell.clearance) : "–"}</td>
                  <td>
                    {p.cell.firstCollision
                      ? `${p.cell.firstCollision.a} hits ${p.cell.firstCollision.b} at ${fixed(p.cell.firstCollision.s * 1000, 0)} mm${p.cell.firstCollision.between ? " (between samples)" : ""}`
                      : p.cell.closest ? `${p.cell.closest.a} – ${p.cell.closest.b} at ${fixed(p.cell.closest.s * 1000, 0)} mm` : "–"}
                  </td>
                  <td className="num">–</td>
                </tr>
              ) : null,
            )}
          </tbody>
        </table>
      </div>
      {c.skipped.length > 0 && <p className="sub">Not checked: {c.skipped.map((s) => `${s.a} – ${s.b} (${s.why === "ignored" ? "ignored pair" : "derived capsules that always touch"})`).join(", ")}.</p>}
      {c.unmodelled.length > 0 && <p className="sub">No collision geometry, not checked: {c.unmodelled.join(", ")}.</p>}
    </>
  );
}

const norm = (v: readonly number[]) => Math.hypot(...v);
const dirText = (v: readonly number[]) => {
  const n = norm(v);
  return n > 0 ? `(${v.map((x) => fixed(x / n, 2)).join(", ")})` : "–";
};

function ForceTable({ arm }: { arm: ArmAnalysis }) {
  const rows = arm.targets.filter((t) => t.force);
  if (rows.length === 0) return <p className="sub">No target of this requirement set asks for a force or moment.</p>;
  return (
    <div className="table-wrap">
      <table className="printable">
        <caption>
          Force capability along each required direction (exact, after gravity) with the torque-limit ellipsoid&apos;s estimate of the same 6-D wrench at the TCP
          beside it (not the force ellipsoid at the payload CoG)
        </caption>
        <thead>
          <tr>
            <th scope="col">Target</th>
            <th scope="col" className="num">Required force (N)</th>
            <th scope="col">Direction (cell frame)</th>
            <th scope="col" className="num">Capability, exact (N)</th>
            <th scope="col" className="num">Ellipsoid estimate at the TCP, 6-D (N)</th>
            <th scope="col" className="num">Required moment (N·m)</th>
            <th scope="col" className="num">Capability, exact (N·m)</th>
            <th scope="col" className="num">Limiting joint</th>
            <th scope="col">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((t) => {
            const f = t.force!;
            const fN = norm(f.force), mN = norm(f.moment);
            const est = f.ellipsoidEstimateRatio;
            return (
              <tr key={t.name}>
                <th scope="row">{t.name}</th>
                <td className="num">{fN > 0 ? fixed(fN, 1) : "–"}</td>
                <td>{fN > 0 ? dirText(f.force) : mN > 0 ? dirText(f.moment) : "–"}</td>
                <td className="num">{f.forceCapacity !== null ? fixed(f.forceCapacity, 1) : f.status === "unbounded" ? "structure" : "–"}</td>
                <td className="num">{est !== null && fN > 0 ? fixed(est * fN, 1) : "–"}</td>
                <td className="num">{mN > 0 ? fixed(mN, 2) : "–"}</td>
                <td className="num">{f.momentCapacity !== null ? fixed(f.momentCapacity, 2) : "–"}</td>
                <td className="num">{f.limitingJoint ?? "–"}</td>
                <td title={f.reason}>
                  <VerdictTag v={f.verdict} />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function PayloadTable({ arm }: { arm: ArmAnalysis }) {
  const rows = arm.targets.filter((t) => t.holding);
  const withBoth = rows.find((t) => t.holding!.payloadCapacity !== null && t.holding!.extraPayloadCapacity !== null);
  const load = withBoth ? withBoth.holding!.payloadCapacity! - withBoth.holding!.extraPayloadCapacity! : null;
  if (rows.length === 0) return <p className="sub">No target reached: no payload check.</p>;
  return (
    <div className="table-wrap">
      <table className="printable">
        <caption>
          Payload margin at each reached target: the largest payload at the payload CoG with the tool as given (the tool&apos;s mass at its own CoG)
          {load !== null ? `; tool + payload ${fixed(load, 2)} kg` : ""}
        </caption>
        <thead>
          <tr>
            <th scope="col">Target</th>
            <th scope="col" className="num">Holdable payload at the payload CoG (kg)</th>
            <th scope="col" className="num">Holdable tool + payload (kg)</th>
            <th scope="col" className="num">Margin (kg)</th>
            <th scope="col" className="num">Limiting joint</th>
            <th scope="col">Basis</th>
            <th scope="col">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((t) => {
            const h = t.holding!;
            return (
              <tr key={t.name}>
                <th scope="row">{t.name}</th>
                <td className="num">{fixed(h.holdablePayload ?? null, 2)}</td>
                <td className="num">{fixed(h.payloadCapacity, 2)}</td>
                <td className="num">{fixed(h.extraPayloadCapacity, 2)}</td>
                <td className="num">{h.limitingJoint ?? "–"}</td>
                <td>{h.basis === "torque-limits" ? "joint torque limits" : h.basis === "rated-payload" ? "rated payload (datasheet)" : "none"}</td>
                <td title={h.reason}>
                  <VerdictTag v={h.verdict} />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

export function ArmSection({ arm, index, shortlistId, runId, required }: { arm: ArmAnalysis; index: number; shortlistId: string; runId: string; required: number }) {
  const ws = workspaceData(arm);
  return (
    <section className="panel arm-section" aria-labelledby={`arm-${index}-h`} data-testid="arm-section">
      <h3 id={`arm-${index}-h`}>
        {arm.name} <span className="sub">{[arm.maker, arm.modelCode].filter(Boolean).join(" · ")} · {arm.axes} axes · revision {arm.revision}</span>
      </h3>
      <p>{arm.summary}</p>
      {arm.error ? (
        <p className="notice bad">Not analysed: {arm.error}</p>
      ) : (
        <>
          <h4>3-D view</h4>
          <SolutionViewPanel shortlistId={shortlistId} runId={runId} armId={arm.id} armName={arm.name} />
          <h4>Force capability</h4>
          <ForceTable arm={arm} />
          <h4>Payload</h4>
          <p className="sub">{arm.subScores.payload.note}</p>
          <PayloadTable arm={arm} />
          {arm.cell && (
            <>
              <h4>Cell</h4>
              <CellTable arm={arm} required={required} />
            </>
          )}
          <ArmCycles arm={arm} />
          {arm.paths.length > 0 && <h4>Path profiles</h4>}
          {arm.paths.map((p) => (
            <div key={p.name}>
              <p className="sub">
                <VerdictTag v={p.verdict} /> {p.reason}
              </p>
              {p.reached > 0 ? <PathProfileChart data={pathProfile(p)} /> : <p className="sub">No sample of {p.name} reached: no profile.</p>}
            </div>
          ))}
          {ws && (
            <>
              <h4>Workspace</h4>
              <WorkspaceChart data={ws} />
            </>
          )}
        </>
      )}
    </section>
  );
}

