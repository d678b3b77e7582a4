import { COMPARATOR_TEXT, type Weights } from "@/shared/schemas/requirements";
import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { RankingPanel, type RankingArm } from "./RankingPanel";
import { TaskMatrix } from "./TaskMatrix";
import { VerdictTag } from "./verdict";
import { matrixColumns, matrixRows, matrixSummaryRows, placementRows } from "./view";
import { PlacementPanel } from "./PlacementPanel";
import { ArmSection, mmText } from "./ArmSection";
import { LazyArmSection, LoadAllArmSections } from "./LazyArmSection";

/**
 * Arm sections drawn with the page; the others come collapsed (heading and summary) and load
 * their data on demand, so a large shortlist's page does not carry every arm's tables and charts.
 */
const EAGER_ARM_SECTIONS = 3;
import { armClearance } from "@/lib/analysis/clearance";
import { CellCaution } from "../CellCaution";
import { CycleSection } from "./CycleView";
import { CycleCompliance } from "./CycleCompliance";
import { ComplianceHead } from "./ComplianceHead";


function ComplianceTable({ analysis }: { analysis: ShortlistAnalysis }) {
  const specs = analysis.requirementSet.specs;
  const first = analysis.arms.find((a) => a.specs.length === specs.length);
  const cell = analysis.cell;
  return (
    <section className="panel" aria-labelledby="compliance-h" data-testid="compliance">
      <h2 id="compliance-h">Compliance table</h2>
      {cell && (
        <div className="table-wrap">
          <table className="compliance printable" data-testid="compliance-clearance">
            <ComplianceHead columns={["Requirement", "Required", "Unit"]} arms={analysis.arms} />
            <tbody>
              <tr>
                <th scope="row">Clearance in the cell (targets and paths)</th>
                <td className="num">≥ {mmText(cell.clearance)}</td>
                <td>mm</td>
                {analysis.arms.map((a) => {
                  const c = armClearance(a, cell.clearance);
                  return (
                    <td key={a.id} className="ccell" title={c.reason} data-arm-id={a.id}>
                      <span className="cval">{c.value === null ? "–" : `${mmText(c.value)} mm`}</span>
                      <br />
                      <VerdictTag v={c.verdict} />
                    </td>
                  );
                })}
              </tr>
            </tbody>
          </table>
        </div>
      )}
      <CycleCompliance analysis={analysis} />
      {specs.length === 0 || !first ? (
        <p className="sub">The requirement set has no spec requirements.</p>
      ) : (
        <div className="table-wrap">
          <table className="compliance printable" data-testid="compliance-table">
            <ComplianceHead columns={["Requirement", "Priority", "Required", "Unit"]} arms={analysis.arms} revisions />
            <tbody>
              {specs.map((_, i) => {
                const s0 = first.specs[i];
                const op = COMPARATOR_TEXT[s0.comparator].symbol;
                return (
                  <tr key={i} data-testid="compliance-row">
                    <th scope="row">{s0.label}</th>
                    <td>{s0.priority}</td>
                    <td className="num">
                      {op} {s0.requiredDisplay}
                    </td>
                    <td>{s0.displayUnit || "–"}</td>
                    {analysis.arms.map((a) => {
                      const s = a.specs[i];
                      return (
                        <td key={a.id} className="ccell" title={s.reason} data-arm-id={a.id}>
                          <span className="cval" data-testid="compliance-value">
                            {s.value === null ? "no data" : s.valueDisplay}
                            {s.value !== null && s.displayUnit ? ` ${s.displayUnit}` : ""}
                          </span>
                          <br />
                          <VerdictTag v={s.verdict} />
                        </td>
                      );
                    })}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <p className="sub">{analysis.thresholds.ipRule}</p>
    </section>
  );
}

/** Everything shown from one stored analysis result. */
export function ResultView(props: {
  analysis: ShortlistAnalysis;
  shortlistId: string;
  runId: string;
  requirementSetId: string;
  /** The requirement-set revision the result was made for (saving a placement refuses a later one). */
  requirementRevision?: number | null;
  canSaveWeights: boolean;
}) {
  const { analysis } = props;
  const arms: RankingArm[] = analysis.arms.map((a) => ({
    id: a.id, armId: a.id, name: a.name, revision: a.revision, summary: a.summary, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts,
  }));
  return (
    <>
      {!analysis.cell && (
        <p className="notice warn" data-testid="made-without-cell">
          Made without the cell: this result comes from analysis {analysis.version}, before collisions with obstacles and the arm itself were checked. Run the analysis again to include them.
        </p>
      )}
      {analysis.cell && <CellCaution />}
      <RankingPanel
        shortlistId={props.shortlistId}
        runId={props.runId}
        arms={arms}
        weights={analysis.weights as Weights}
        requirementSetId={props.requirementSetId}
        requirementName={analysis.requirementSet.name}
        canSaveWeights={props.canSaveWeights}
      />
      {analysis.placement && (
        <PlacementPanel
          rows={placementRows(analysis.arms, analysis.ranking, analysis.placement)}
          placement={analysis.placement}
          targets={analysis.placement.targets}
          requirementSetId={props.requirementSetId}
          requirementRevision={props.requirementRevision ?? null}
          canSave={props.canSaveWeights}
        />
      )}
      {analysis.arms.length > EAGER_ARM_SECTIONS ? (
        <TaskMatrix
          columns={matrixColumns(analysis)}
          rows={matrixSummaryRows(analysis)}
          threshold={analysis.thresholds.dexterityMarginal}
          source={{ shortlistId: props.shortlistId, runId: props.runId, requirementSet: { targets: analysis.requirementSet.targets, paths: analysis.requirementSet.paths } }}
        />
      ) : (
        <TaskMatrix columns={matrixColumns(analysis)} rows={matrixRows(analysis)} threshold={analysis.thresholds.dexterityMarginal} />
      )}
      <ComplianceTable analysis={analysis} />
      <CycleSection analysis={analysis} />
      <h2 className="print-break">Per arm</h2>
      {analysis.arms.length > EAGER_ARM_SECTIONS && <LoadAllArmSections count={analysis.arms.length - EAGER_ARM_SECTIONS} />}
      {analysis.arms.map((a, i) =>
        i < EAGER_ARM_SECTIONS ? (
          <ArmSection key={a.id} arm={a} index={i} shortlistId={props.shortlistId} runId={props.runId} required={analysis.cell?.clearance ?? 0} />
        ) : (
          <LazyArmSection
            key={a.id}
            arm={{ id: a.id, name: a.name, maker: a.maker, modelCode: a.modelCode, axes: a.axes, revision: a.revision, summary: a.summary }}
            index={i}
            shortlistId={props.shortlistId}
            runId={props.runId}
            required={analysis.cell?.clearance ?? 0}
          />
        ),
      )}
    </>
  );
}
