import type { ArmAnalysis, ShortlistAnalysis } from "@/lib/analysis/shortlist";
import type { CycleResult } from "@/lib/analysis/cycle";
import { ASSUMED_ACCELERATION_TIME } from "@/lib/analysis/cycle";
import { fixed } from "@/shared/format";
import { CycleCaution } from "../CycleCaution";
import { CycleChart } from "./CycleChart";
import { VerdictTag } from "./verdict";
import { cycleChartData } from "./view";

const sText = (t: number | null) => (t === null ? "–" : fixed(t, 2));
const rateText = (r: number | null) => (r === null ? "–" : fixed(r, r >= 100 ? 0 : 1));
const joints = (ns: number[]) => `joint${ns.length === 1 ? "" : "s"} ${ns.join(", ")}`;

/** What the figure rests on: the stated limits, or an assumed acceleration for the joints named. */
function basisText(c: CycleResult): string {
  if (c.time === null) return "–";
  return c.estimate ? `assumed acceleration: ${joints(c.assumedAcceleration)}` : "stated speed and acceleration limits";
}

/** The verdict, or "no requirement" when the sequence has no required time (not a verdict of "unknown"). */
function CycleVerdict({ c }: { c: CycleResult | undefined }) {
  if (!c) return <VerdictTag v="unknown" />;
  if (c.required === null && c.time !== null) return <span className="sub">no requirement</span>;
  return <VerdictTag v={c.verdict} />;
}

function EstimateTag({ c }: { c: CycleResult }) {
  if (!c.estimate) return null;
  return (
    <span className="tag estimate" data-testid="cycle-estimate" title={`${basisText(c)}, taken to reach full speed in ${ASSUMED_ACCELERATION_TIME} s`}>
      estimate
    </span>
  );
}

/** The arms side by side for each sequence: time, rate, verdict, basis, and the stacked-bar chart. */
export function CycleSection({ analysis }: { analysis: ShortlistAnalysis }) {
  const names = analysis.requirementSet.sequences ?? [];
  if (names.length === 0) return null;
  return (
    <section className="panel" aria-labelledby="cycle-h" data-testid="cycle-section">
      <h2 id="cycle-h">Cycle time</h2>
      <p className="sub">
        Per sequence, each arm&apos;s estimated cycle: synchronised point-to-point joint moves at the joints&apos; speed and acceleration limits, paths at the speed they are followed at, dwells and
        waits as given, the branch of each target chosen to make the whole cycle shortest. The breakdown per step is in each arm&apos;s section below.
      </p>
      {names.map((name, i) => {
        const chart = cycleChartData(analysis, i);
        const required = analysis.arms.map((a) => a.cycles?.[i]).find((c) => c)?.required ?? null;
        return (
          <div key={name} className="cycle-sequence" data-testid="cycle-sequence">
            <h3>
              {name}{" "}
              <span className="sub">
                {required !== null ? `required ${fixed(required, 2)} s per cycle (${rateText(3600 / required)} parts per hour)` : "no required time"}
              </span>
            </h3>
            <div className="table-wrap">
              <table className="printable" data-testid="cycle-table">
                <caption className="visually-hidden">Cycle time of {name} per arm</caption>
                <thead>
                  <tr>
                    <th scope="col">Arm</th>
                    <th scope="col" className="num">Cycle time (s)</th>
                    <th scope="col" className="num">Parts per hour (1/h)</th>
                    <th scope="col">Verdict</th>
                    <th scope="col">Basis</th>
                  </tr>
                </thead>
                <tbody>
                  {analysis.arms.map((a) => {
                    const c = a.cycles?.[i];
                    return (
                      <tr key={a.id} data-arm-id={a.id} data-testid="cycle-row">
                        <th scope="row">{a.name}</th>
                        <td className="num" data-testid="cycle-time">
                          {sText(c?.time ?? null)}
                        </td>
                        <td className="num">{rateText(c?.partsPerHour ?? null)}</td>
                        <td title={c?.reason}>
                          <CycleVerdict c={c} />
                        </td>
                        <td className="cycle-basis">
                          {c ? (c.time === null ? c.reason : c.estimate ? <><EstimateTag c={c} /> {basisText(c)}</> : basisText(c)) : "not in this result"}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            {analysis.arms.some((a) => a.cycles?.[i]?.estimate) && (
              <p className="sub">
                An estimate rests on an assumed acceleration: a joint without a max acceleration is taken to reach its max speed in {ASSUMED_ACCELERATION_TIME} s (an assumed value, not
                the maker&apos;s). Enter the joints&apos; accelerations in the arm editor to replace it.
              </p>
            )}
            {chart ? <CycleChart data={chart} /> : <p className="sub">No arm has a known cycle for {name}: no chart.</p>}
          </div>
        );
      })}
      <CycleCaution />
    </section>
  );
}

/** One arm's cycles: verdict with its reason, and the time of each step with its limiting joint. */
export function ArmCycles({ arm }: { arm: ArmAnalysis }) {
  const cycles = arm.cycles ?? [];
  if (cycles.length === 0) return null;
  const mmText = (m: number | null | undefined) => (m === null || m === undefined ? "–" : fixed(m * 1000, 1));
  return (
    <>
      <h4>Cycle time</h4>
      {cycles.map((c) => (
        <div key={c.name} data-testid="arm-cycle">
          <p className="sub">
            <CycleVerdict c={c} /> <strong>{c.name}</strong>: {c.reason}
          </p>
          {c.steps.length > 0 && c.time !== null && (
            <div className="table-wrap">
              <table className="printable" data-testid="cycle-steps">
                <caption>
                  {c.name}: {sText(c.time)} s per cycle, {rateText(c.partsPerHour)} parts per hour <EstimateTag c={c} />
                </caption>
                <thead>
                  <tr>
                    <th scope="col" className="num">Step</th>
                    <th scope="col">Kind</th>
                    <th scope="col">Target or path</th>
                    <th scope="col" className="num">Time (s)</th>
                    <th scope="col" className="num">Share (%)</th>
                    <th scope="col">Limiting joint</th>
                    {c.steps.some((s) => s.clearance !== null && s.clearance !== undefined) && <th scope="col" className="num" title="exact where the move was evaluated, a proven lower bound elsewhere">Clearance along the move (mm)</th>}
                  </tr>
                </thead>
                <tbody>
                  {c.steps.map((s, k) => (
                    <tr key={k}>
                      <td className="num">{k + 1}</td>
                      <td>{s.kind === "move" ? "move" : s.kind === "path" ? "path" : "wait"}</td>
                      <td>{s.kind === "wait" ? "–" : s.name}</td>
                      <td className="num">{sText(s.time)}</td>
                      <td className="num">{c.time! > 0 ? fixed((100 * s.time) / c.time!, 0) : "–"}</td>
                      <td className="cycle-nowrap">
                        {s.limitingJoint === null
                          ? "–"
                          : `joint ${s.limitingJoint}${c.assumedAcceleration.includes(s.limitingJoint) ? " (assumed acceleration)" : ""}`}
                      </td>
                      {c.steps.some((x) => x.clearance !== null && x.clearance !== undefined) && <td className="num">{mmText(s.clearance)}</td>}
                    </tr>
                  ))}
                </tbody>
                <tfoot>
                  <tr>
                    <th scope="row" colSpan={3}>
                      Cycle
                    </th>
                    <td className="num">{sText(c.time)}</td>
                    <td className="num">100</td>
                    <td colSpan={c.steps.some((x) => x.clearance !== null && x.clearance !== undefined) ? 2 : 1} />
                  </tr>
                </tfoot>
              </table>
            </div>
          )}
        </div>
      ))}
    </>
  );
}
