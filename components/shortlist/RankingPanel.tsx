"use client";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { Weights } from "@/shared/schemas/requirements";
import { rankArms, subScoreOf, type ArmScoreInput, type SubScore } from "@/lib/analysis/ranking";
import { SUB_SCORES } from "@/shared/sub-scores";
import { api } from "../api";
import { fixed } from "@/shared/format";
import { useMounted } from "./useMounted";

export interface RankingArm extends ArmScoreInput {
  id: string;
  name: string;
  revision: number;
  summary: string;
}

// Labels and colours of the sub-scores come from their table (shared/sub-scores.ts).
const { keys: SUB_SCORE_KEYS, label: SUB_SCORE_LABELS, colour: SUB_SCORE_COLOURS } = SUB_SCORES;
type SubScoreKey = (typeof SUB_SCORE_KEYS)[number];

const WEIGHT_MAX = 10;

function weightsParam(w: Weights): string {
  return SUB_SCORE_KEYS.map((k) => `${k}:${w[k]}`).join(",");
}

/**
 * The ranking with its contributions as stacked bars, the weight sliders (re-ranking in the
 * browser from the stored sub-scores), reset, saving the weights to the requirement set, and the
 * export links (which carry the weights shown).
 */
export function RankingPanel(props: {
  shortlistId: string;
  runId: string;
  arms: RankingArm[];
  weights: Weights;
  requirementSetId: string;
  requirementName: string;
  canSaveWeights: boolean;
}) {
  const router = useRouter();
  const uid = useId();
  const mounted = useMounted();
  const [weights, setWeights] = useState<Weights>(props.weights);
  const [saveMsg, setSaveMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [saving, setSaving] = useState(false);
  const changed = SUB_SCORE_KEYS.some((k) => weights[k] !== props.weights[k]);
  const byId = useMemo(() => new Map(props.arms.map((a) => [a.id, a])), [props.arms]);
  const ranking = useMemo(() => rankArms(props.arms, weights), [props.arms, weights]);
  const applicable = (k: SubScoreKey) => props.arms.some((a) => subScoreOf(a.subScores, k).applicable);
  const qualified = ranking.filter((r) => !r.disqualified);
  const disqualified = ranking.filter((r) => r.disqualified);
  const chartData = qualified.map((r) => ({ name: `${r.rank}. ${byId.get(r.armId)!.name}`, ...Object.fromEntries(SUB_SCORE_KEYS.map((k) => [k, Number(r.contributions[k].toFixed(4))])) }));
  const q = changed ? `&weights=${encodeURIComponent(weightsParam(weights))}` : "";
  const exportBase = `/api/shortlists/${props.shortlistId}/export?run=${props.runId}`;

  async function save() {
    setSaving(true);
    setSaveMsg(null);
    const cur = await api<{ revision: number; requirementSet: Record<string, unknown> }>(`/api/requirements/${props.requirementSetId}`, "GET");
    if (!cur.ok) {
      setSaving(false);
      setSaveMsg({ ok: false, text: cur.error.message });
      return;
    }
    const r = await api<{ revision: number }>(`/api/requirements/${props.requirementSetId}`, "PUT", {
      baseRevision: cur.data.revision,
      requirementSet: { ...cur.data.requirementSet, weights },
    });
    setSaving(false);
    if (r.ok) {
      setSaveMsg({ ok: true, text: `Saved as revision ${r.data.revision} of ${props.requirementName}. Re-pin this shortlist to analyse with it.` });
      router.refresh();
    } else setSaveMsg({ ok: false, text: `Not saved: ${r.error.message}` });
  }

  const subCell = (s: SubScore, c: number) => (s.applicable ? `${fixed(c, 3)} (${fixed(s.value, 2)})` : "n/a");

  return (
    <section className="panel" aria-labelledby={uid + "-h"} data-testid="ranking">
      <h2 id={uid + "-h"}>Ranking</h2>
      <p className="sub">
        Score = Σ weight share × sub-score (each 0–1). Arms that fail a <em>must</em> requirement are listed apart, whatever their score.
        {changed && <strong className="adjusted"> Weights adjusted on this page (not saved).</strong>}
      </p>
      <div className="ranking-layout">
        <fieldset className="weights no-print-controls" data-testid="weights">
          <legend>Weights</legend>
          {SUB_SCORE_KEYS.map((k) => (
            <div key={k} className={`weight-row${applicable(k) ? "" : " na"}`}>
              <label htmlFor={`${uid}-${k}`}>
                <span className="swatch" style={{ background: SUB_SCORE_COLOURS[k] }} aria-hidden="true" />
                {SUB_SCORE_LABELS[k]}
                {!applicable(k) && <span className="hint"> (not applicable)</span>}
              </label>
              <input
                id={`${uid}-${k}`}
                type="range"
                min={0}
                max={WEIGHT_MAX}
                step={0.5}
                value={weights[k]}
                aria-label={`Weight: ${SUB_SCORE_LABELS[k]}`}
                onChange={(e) => setWeights({ ...weights, [k]: Number(e.target.value) })}
              />
              <output htmlFor={`${uid}-${k}`} className="num">
                {weights[k]}
              </output>
            </div>
          ))}
          <div className="toolbar">
            <button type="button" onClick={() => setWeights(props.weights)} disabled={!changed}>
              Reset weights
            </button>
            {props.canSaveWeights && (
              <button type="button" onClick={save} disabled={!changed || saving}>
                {saving ? "Saving…" : "Save weights to the requirement set"}
              </button>
            )}
          </div>
          <div aria-live="polite">{saveMsg && <p className={`notice${saveMsg.ok ? "" : " bad"}`}>{saveMsg.text}</p>}</div>
        </fieldset>
        <div className="ranking-chart" aria-hidden="true">
          {qualified.length > 0 && mounted && (
            <ResponsiveContainer width="100%" height={Math.max(120, 44 * qualified.length + 60)} initialDimension={{ width: 600, height: 300 }}>
              <BarChart data={chartData} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 8 }}>
                <CartesianGrid horizontal={false} stroke="#e7eaee" />
                <XAxis type="number" domain={[0, 1]} ticks={[0, 0.25, 0.5, 0.75, 1]} tick={{ fontSize: 12 }} />
                <YAxis type="category" dataKey="name" width={150} tick={{ fontSize: 12 }} />
                <Tooltip formatter={(v, n) => [fixed(Number(v), 3), SUB_SCORE_LABELS[n as SubScoreKey] ?? String(n)]} />
                <Legend formatter={(v) => SUB_SCORE_LABELS[v as SubScoreKey] ?? v} wrapperStyle={{ fontSize: 12 }} />
                {SUB_SCORE_KEYS.map((k) => (
                  <Bar key={k} dataKey={k} stackId="s" fill={SUB_SCORE_COLOURS[k]} isAnimationActive={false} />
                ))}
              </BarChart>
            </ResponsiveContainer>
          )}
        </div>
      </div>
      <div className="table-wrap">
        <table className="ranking-table" data-testid="ranking-table">
          <thead>
            <tr>
              <th scope="col" className="num">Rank</th>
              <th scope="col">Arm</th>
              <th scope="col" className="num">Score (0–1)</th>
              {SUB_SCORE_KEYS.map((k) => (
                <th scope="col" className="num" key={k}>
                  {SUB_SCORE_LABELS[k]}
                  <br />
                  <span className="hint">contribution (sub-score)</span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {qualified.map((r) => {
              const a = byId.get(r.armId)!;
              return (
                <tr key={r.armId} data-testid="ranking-row" data-arm-id={r.armId}>
                  <td className="num">{r.rank}</td>
                  <th scope="row">
                    {a.name} <span className="sub">rev {a.revision}</span>
                    {r.unknownMusts.length > 0 && <div className="sub">? must with missing data: {r.unknownMusts.join("; ")}</div>}
                  </th>
                  <td className="num">
                    <strong>{fixed(r.score, 3)}</strong>
                  </td>
                  {SUB_SCORE_KEYS.map((k) => (
                    <td className="num" key={k} title={subScoreOf(a.subScores, k).note}>
                      {subCell(subScoreOf(a.subScores, k), r.contributions[k])}
                    </td>
                  ))}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {disqualified.length > 0 && (
        <div className="disqualified" data-testid="disqualified">
          <h3>Disqualified (fails a must requirement)</h3>
          <ul>
            {disqualified.map((r) => (
              <li key={r.armId} data-testid="disqualified-row" data-arm-id={r.armId}>
                <span className="verdict v-fails">
                  <span aria-hidden="true">✗</span> {byId.get(r.armId)!.name}
                </span>{" "}
                — fails: {r.failedMusts.join("; ")} <span className="sub">(score {fixed(r.score, 3)} for reference)</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      <div className="toolbar exports" data-testid="exports">
        <span className="sub">Download:</span>
        <a className="button" href={`${exportBase}&format=csv&table=ranking${q}`} download>Ranking CSV</a>
        <a className="button" href={`${exportBase}&format=csv&table=compliance${q}`} download>Compliance CSV</a>
        <a className="button" href={`${exportBase}&format=xlsx${q}`} download>Ranking + compliance XLSX</a>
        <a className="button" href={`${exportBase}&format=json${q}`} download>Shortlist JSON</a>
      </div>
    </section>
  );
}
