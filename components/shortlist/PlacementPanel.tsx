"use client";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import type { ArmAnalysis, ShortlistPlacement } from "@/lib/analysis/shortlist";
import type { PlacementRow } from "./view";
import { mountingClass } from "@/shared/schemas/mounting";
import { deg, fixed } from "@/shared/format";
import { api } from "../api";

const mm = (m: number) => fixed(m * 1000, 0);

/** Words for the change of rank: "up 3", "down 1", "same". */
function rankChange(from: number, to: number): string {
  if (to < from) return `up ${from - to}`;
  if (to > from) return `down ${to - from}`;
  return "same";
}

/**
 * A coverage map: targets reached over the region's x–y plane at the placement's z and yaw, each
 * cell shaded by the share reached and labelled with the count; the targets (dots) and the
 * placement (cross) drawn in; a caption says what it shows in words.
 */
function CoverageChart({ row, targets }: { row: PlacementRow; targets: { name: string; x: number; y: number }[] }) {
  const c = row.result.coverage, p = row.result.placement;
  if (!c || !p) return null;
  const W = 400, H = 400, pad = 40;
  const xs = c.xs, ys = c.ys;
  const dx = xs.length > 1 ? xs[1] - xs[0] : 0.1, dy = ys.length > 1 ? ys[1] - ys[0] : 0.1;
  const x0 = Math.min(xs[0] - dx / 2, ...targets.map((t) => t.x)), x1 = Math.max(xs[xs.length - 1] + dx / 2, ...targets.map((t) => t.x));
  const y0 = Math.min(ys[0] - dy / 2, ...targets.map((t) => t.y)), y1 = Math.max(ys[ys.length - 1] + dy / 2, ...targets.map((t) => t.y));
  const span = Math.max(x1 - x0, y1 - y0) || 1;
  // one scale for both axes (a plan view), the drawing centred in the square
  const k = (W - 2 * pad) / span, offX = ((span - (x1 - x0)) * k) / 2, offY = ((span - (y1 - y0)) * k) / 2;
  const sx = (x: number) => pad + offX + (x - x0) * k;
  const sy = (y: number) => H - pad - offY - (y - y0) * k;
  const labels = dx * k >= 16 && dy * k >= 12;
  const best = Math.max(...c.reached);
  return (
    <figure className="coverage" data-testid="coverage-map" data-arm-id={row.id}>
      <svg viewBox={`0 0 ${W} ${H}`} width={W} height={H} style={{ maxWidth: "100%", height: "auto" }} role="img" aria-label={`Coverage map of ${row.name}: targets reached over the region at z ${mm(c.z)} mm and yaw ${deg(c.yaw)}, at most ${best} of ${c.total}`}>
        {ys.map((y, j) =>
          xs.map((x, i) => {
            const n = c.reached[j * xs.length + i];
            const share = c.total > 0 ? n / c.total : 0;
            return (
              <g key={`${i}-${j}`}>
                <rect x={sx(x - dx / 2)} y={sy(y + dy / 2)} width={sx(x + dx / 2) - sx(x - dx / 2)} height={sy(y - dy / 2) - sy(y + dy / 2)} fill={`rgba(31, 110, 180, ${0.08 + 0.82 * share})`} stroke="#fff" strokeWidth={0.5}>
                  <title>{`x ${mm(x)} mm, y ${mm(y)} mm: ${n} of ${c.total} targets`}</title>
                </rect>
                {labels && <text x={sx(x)} y={sy(y) + 4} fontSize={9} textAnchor="middle" fill={share > 0.55 ? "#fff" : "#1b2a38"}>{n}</text>}
              </g>
            );
          }),
        )}
        {targets.map((t) => (
          <g key={t.name}>
            <circle cx={sx(t.x)} cy={sy(t.y)} r={3.5} fill="#c0392b" stroke="#fff" strokeWidth={1}>
              <title>{`target ${t.name}: x ${mm(t.x)} mm, y ${mm(t.y)} mm`}</title>
            </circle>
          </g>
        ))}
        <g stroke="#111" strokeWidth={2.5}>
          <line x1={sx(p.x) - 7} y1={sy(p.y) - 7} x2={sx(p.x) + 7} y2={sy(p.y) + 7} />
          <line x1={sx(p.x) - 7} y1={sy(p.y) + 7} x2={sx(p.x) + 7} y2={sy(p.y) - 7} />
          <title>{`best placement: x ${mm(p.x)} mm, y ${mm(p.y)} mm`}</title>
        </g>
        <g fontSize={10} fill="#445">
          <line x1={sx(x0)} y1={sy(y0)} x2={sx(x1)} y2={sy(y0)} stroke="#99a" />
          <line x1={sx(x0)} y1={sy(y0)} x2={sx(x0)} y2={sy(y1)} stroke="#99a" />
          <text x={sx(x0)} y={sy(y0) + 14} textAnchor="start">{mm(x0)}</text>
          <text x={sx(x1)} y={sy(y0) + 14} textAnchor="end">{mm(x1)}</text>
          <text x={(sx(x0) + sx(x1)) / 2} y={sy(y0) + 28} textAnchor="middle">x (mm, cell frame) →</text>
          <text x={sx(x0) - 4} y={sy(y0)} textAnchor="end">{mm(y0)}</text>
          <text x={sx(x0) - 4} y={sy(y1) + 8} textAnchor="end">{mm(y1)}</text>
          <text x={sx(x0)} y={sy(y1) - 8} textAnchor="start">↑ y (mm)</text>
        </g>
      </svg>
      <figcaption className="sub">
        {row.name}: targets reached (count per cell, darker = more) with the base at each x, y of the region, at z {mm(c.z)} mm and yaw {deg(c.yaw)}; red dots: targets (plan view);
        cross: the best placement. A quick map (warm-started IK, no restarts); the placement itself is analysed in full.
      </figcaption>
    </figure>
  );
}

/**
 * Mount placement results: each arm at its own best placement in the region against the ranking
 * at the nominal base, with the change per arm, the placement in mm and °, a coverage map, and
 * saving a placement as the requirement set's nominal base (a new revision).
 */
export function PlacementPanel(props: {
  rows: PlacementRow[];
  placement: ShortlistPlacement;
  targets: { name: string; x: number; y: number }[];
  requirementSetId: string;
  /** The requirement-set revision the analysis used (a save refuses a set changed since). */
  requirementRevision: number | null;
  canSave: boolean;
}) {
  const router = useRouter();
  const uid = useId();
  const [shown, setShown] = useState(props.rows[0]?.id ?? "");
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [saving, setSaving] = useState(false);
  const m = props.placement.mounting;
  const range = (r: readonly number[] | undefined, f: (v: number) => string) => (r ? (r[0] === r[1] ? f(r[0]) : `${f(r[0])} … ${f(r[1])}`) : "–");
  const row = props.rows.find((r) => r.id === shown);

  async function save(r: PlacementRow) {
    if (!r.result.base) return;
    setSaving(true);
    setMsg(null);
    const cur = await api<{ revision: number; requirementSet: Record<string, unknown> }>(`/api/requirements/${props.requirementSetId}`, "GET");
    if (!cur.ok) {
      setSaving(false);
      setMsg({ ok: false, text: cur.error.message });
      return;
    }
    if (props.requirementRevision !== null && cur.data.revision !== props.requirementRevision) {
      setSaving(false);
      setMsg({ ok: false, text: `Not saved: the requirement set is at revision ${cur.data.revision}, this placement was found for revision ${props.requirementRevision}. Re-pin and analyse again.` });
      return;
    }
    const res = await api<{ revision: number }>(`/api/requirements/${props.requirementSetId}`, "PUT", {
      baseRevision: cur.data.revision,
      requirementSet: { ...cur.data.requirementSet, base: r.result.base },
    });
    setSaving(false);
    if (res.ok) {
      setMsg({ ok: true, text: `Saved ${r.name}'s placement as the nominal base: revision ${res.data.revision}. Re-pin this shortlist to analyse with it.` });
      router.refresh();
    } else setMsg({ ok: false, text: `Not saved: ${res.error.message}` });
  }

  return (
    <section className="panel" aria-labelledby={uid + "-h"} data-testid="placement">
      <h2 id={uid + "-h"}>Mount placement</h2>
      <p className="sub">
        Each arm at its own best placement in the mounting region (x {range(m.region.x, mm)} mm, y {range(m.region.y, mm)} mm, z{" "}
        {m.heights ? `pedestals ${m.heights.map(mm).join(", ")} mm` : `${range(m.region.z, mm)} mm`}, yaw {range(m.region.yaw, deg)}; {mountingClass(m.orientation)} mount), found by search:
        most must targets, then targets, then paths, then the worst dexterity margin, then clearance. Ranked with the requirement set&apos;s weights, beside the ranking at the nominal base.
      </p>
      <div className="table-wrap">
        <table className="printable" data-testid="placement-table">
          <thead>
            <tr>
              <th scope="col">Arm</th>
              <th scope="col" className="num">Rank at its placement</th>
              <th scope="col" className="num">Rank at the nominal base</th>
              <th scope="col">Change</th>
              <th scope="col" className="num">Score (nominal → placed)</th>
              <th scope="col" className="num">Targets reached</th>
              <th scope="col" className="num">Paths followed</th>
              <th scope="col" className="num">x, y, z (mm)</th>
              <th scope="col" className="num">Yaw (°)</th>
              <th scope="col" className="num">Placements evaluated</th>
              {props.canSave && <th scope="col">Nominal base</th>}
            </tr>
          </thead>
          <tbody>
            {props.rows.map((r) => {
              const a = r.result.analysis, p = r.result.placement;
              const reached = (x: ArmAnalysis) => x.targets.filter((t) => t.reached).length;
              const followed = (x: ArmAnalysis) => x.paths.filter((t) => t.verdict === "meets" || t.verdict === "marginal").length;
              return (
                <tr key={r.id} data-testid="placement-row" data-arm-id={r.id}>
                  <th scope="row">{r.name}</th>
                  <td className="num">{r.placed.disqualified ? `(${r.placed.rank})` : r.placed.rank}</td>
                  <td className="num">{r.nominal.disqualified ? `(${r.nominal.rank})` : r.nominal.rank}</td>
                  <td data-testid="placement-change">{rankChange(r.nominal.rank, r.placed.rank)}</td>
                  <td className="num">{fixed(r.nominal.score, 3)} → {fixed(r.placed.score, 3)}</td>
                  <td className="num">{a ? `${reached(r.nominalArm)} → ${reached(a)} of ${a.targets.length}` : "–"}</td>
                  <td className="num">{a ? `${followed(r.nominalArm)} → ${followed(a)} of ${a.paths.length}` : "–"}</td>
                  <td className="num">{p ? `${mm(p.x)}, ${mm(p.y)}, ${mm(p.z)}` : r.result.skipped}</td>
                  <td className="num">{p ? fixed((p.yaw * 180) / Math.PI, 1) : "–"}</td>
                  <td className="num">{r.result.evaluated}</td>
                  {props.canSave && (
                    <td>
                      {p && (
                        <button type="button" disabled={saving} onClick={() => save(r)} aria-label={`Save ${r.name}'s placement as the requirement set's nominal base (new revision)`}>
                          Save as nominal base
                        </button>
                      )}
                    </td>
                  )}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="sub">Ranks in brackets: disqualified (a failed must requirement, or a mounting the datasheet does not allow); they rank after the qualified arms.</p>
      <div aria-live="polite">{msg && <p className={`notice${msg.ok ? "" : " bad"}`}>{msg.text}</p>}</div>
      <div className="toolbar no-print-controls">
        <label htmlFor={`${uid}-arm`}>Coverage map of</label>
        <select id={`${uid}-arm`} value={shown} onChange={(e) => setShown(e.target.value)}>
          {props.rows.filter((r) => r.result.coverage).map((r) => (
            <option key={r.id} value={r.id}>{r.name}</option>
          ))}
        </select>
      </div>
      {row && <CoverageChart row={row} targets={props.targets} />}
    </section>
  );
}
