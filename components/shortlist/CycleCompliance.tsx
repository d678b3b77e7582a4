import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { fixed } from "@/shared/format";
import { ComplianceHead } from "./ComplianceHead";
import { VerdictTag } from "./verdict";

const sText = (t: number | null) => (t === null ? "–" : fixed(t, 2));

/**
 * The compliance table's cycle-time rows (also printed): per sequence, its required cycle time
 * and each arm's estimated cycle, parts per hour, verdict and whether the figure rests on an
 * assumed acceleration (docs/design.md#cycle-time). Nothing without sequences.
 */
export function CycleCompliance({ analysis }: { analysis: ShortlistAnalysis }) {
  const names = analysis.requirementSet.sequences ?? [];
  if (names.length === 0) return null;
  return (
    <div className="table-wrap">
      <table className="compliance printable" data-testid="compliance-cycle">
        <caption>Cycle time per sequence (estimates for comparing arms: point-to-point moves at the joint limits entered, no blending)</caption>
        <ComplianceHead columns={["Sequence", "Required", "Unit"]} arms={analysis.arms} />
        <tbody>
          {names.map((name, i) => {
            const required = analysis.arms.map((a) => a.cycles?.[i]?.required ?? null).find((r) => r !== null) ?? null;
            return (
              <tr key={name} data-testid="compliance-cycle-row">
                <th scope="row">Cycle time of {name}</th>
                <td className="num">{required === null ? "none given" : `≤ ${sText(required)}`}</td>
                <td>s</td>
                {analysis.arms.map((a) => {
                  const c = a.cycles?.[i];
                  if (!c) return <td key={a.id} data-arm-id={a.id}>not in this result</td>;
                  return (
                    <td key={a.id} className="ccell" title={c.reason} data-arm-id={a.id}>
                      <span className="cval">{c.time !== null ? `${sText(c.time)} s` : c.blocked ? `blocked at step ${c.blocked.step}` : "unknown"}</span>
                      {c.partsPerHour !== null && <span className="hint"> ({fixed(c.partsPerHour, 0)} parts/h)</span>}
                      {c.estimate && <span className="hint" title={`assumed acceleration on joint${c.assumedAcceleration.length > 1 ? "s" : ""} ${c.assumedAcceleration.join(", ")}`}> estimate</span>}
                      <br />
                      <VerdictTag v={c.verdict} />
                    </td>
                  );
                })}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
