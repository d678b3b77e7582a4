"use client";
import { useMemo } from "react";
import { alwaysTouchingPairs, linkGeometry, type LinkGeometry } from "@/lib/geometry/arm";
import { upTo } from "@/shared/format";
import { mToMm } from "@/shared/units";
import { CellNumber, TextField, wholeErrors } from "../fields";
import { RowActionsCell } from "../RowControls";
import { CellCaution } from "../CellCaution";
import { armFormToDoc, type ArmForm } from "./armForm";
import { CAPSULE_TEXT_KEYS, capsuleCellPaths, capsuleRow, capsuleRowPaths, newCapsuleRow, type CapsuleRow, type CapsuleTextKey } from "./collisionForm";

const COL_LABEL: Record<CapsuleTextKey, string> = { fx: "from x", fy: "from y", fz: "from z", tx: "to x", ty: "to y", tz: "to z", r: "radius" };

/** A length read at a glance, to 0.1 mm (the table above keeps the full value for editing). */
const mm = (v: number) => upTo(mToMm(v), 1);
const mm3 = (p: readonly number[]) => p.map(mm).join(", ");

/**
 * The arm's collision geometry: capsules per body (the base, link 1 … n) in that body's frame,
 * the capsules derived for links that have none (shown so they can be checked, and copied into
 * the table to override them), and the ignored pairs.
 */
export function CollisionPanel(props: { form: ArmForm; errors: Record<string, string[]>; readOnly: boolean; onChange: (patch: Partial<ArmForm>, structural?: boolean) => void }) {
  const { form, errors, readOnly } = props;
  const rows = form.capsules;
  const n = form.joints.length;
  const paths = capsuleRowPaths(rows, n);
  const set = (i: number, patch: Partial<CapsuleRow>) => props.onChange({ capsules: rows.map((r, k) => (k === i ? { ...r, ...patch } : r)) });
  const err = (list: string[]) => list.flatMap((p) => errors[p] ?? []).join("; ") || undefined;

  // The geometry the analysis will use, from the form as it stands (nothing when it does not convert).
  const geometry = useMemo((): { links: LinkGeometry[]; touching: [number, number][] } | null => {
    const { doc, errors: e } = armFormToDoc(form);
    if (e.length) return null;
    try {
      const links = linkGeometry(doc);
      return { links, touching: alwaysTouchingPairs(links, doc) };
    } catch {
      return null;
    }
  }, [form]);

  return (
    <fieldset className="panel" data-testid="collision-panel">
      <legend>Collision geometry</legend>
      <p className="hint">
        Capsules (the points within the radius of a segment from → to) on the base or on a link, in that body&apos;s frame: link k&apos;s frame is the one after joint k&apos;s transform (the
        frame of its CoM); the base&apos;s frame is the arm&apos;s base frame, before the base transform above. Ends and radius in mm. A link without capsules gets capsules derived from the
        kinematic table and its collision radius (listed below); a link with neither is not checked.
      </p>
      {rows.length === 0 ? (
        <p className="empty">No capsules entered.</p>
      ) : (
        <div className="table-wrap">
          <table className="cell-table" data-testid="capsule-table">
            <caption className="visually-hidden">Collision capsules of the base and the links</caption>
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Body</th>
                {CAPSULE_TEXT_KEYS.map((k) => (
                  <th key={k} scope="col" className="num">
                    {COL_LABEL[k]} (mm)
                  </th>
                ))}
                {!readOnly && <th scope="col">Order</th>}
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={r.key}>
                  <th scope="row" className="idx">{i + 1}</th>
                  <td>
                    <select
                      aria-label={`capsule ${i + 1} body`}
                      name={`collision.${i}.link`}
                      value={r.link}
                      disabled={readOnly}
                      aria-invalid={err(capsuleCellPaths(paths[i], i, "link")) ? true : undefined}
                      onChange={(e) => set(i, { link: e.target.value })}
                    >
                      <option value="0">base</option>
                      {Array.from({ length: Math.max(n, Number(r.link) || 0) }, (_, k) => (
                        <option key={k + 1} value={String(k + 1)}>
                          link {k + 1}
                        </option>
                      ))}
                    </select>
                    {err(capsuleCellPaths(paths[i], i, "link")) && <span className="err">{err(capsuleCellPaths(paths[i], i, "link"))}</span>}
                  </td>
                  {CAPSULE_TEXT_KEYS.map((k) => (
                    <td key={k}>
                      <CellNumber
                        className="nm"
                        label={`capsule ${i + 1} ${COL_LABEL[k]} (mm)`}
                        name={`collision.${i}.${k}`}
                        value={r[k]}
                        readOnly={readOnly}
                        error={err(capsuleCellPaths(paths[i], i, k))}
                        onChange={(v) => set(i, { [k]: v })}
                      />
                    </td>
                  ))}
                  {!readOnly && <RowActionsCell rows={rows} index={i} label={`capsule ${i + 1}`} onChange={(next) => props.onChange({ capsules: next }, true)} />}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {!readOnly && (
        <div className="toolbar">
          <button type="button" onClick={() => props.onChange({ capsules: [...rows, newCapsuleRow(rows.length === 0 ? 0 : Math.min(n, Number(rows[rows.length - 1].link) || 0))] }, true)}>
            Add capsule
          </button>
        </div>
      )}

      <h3>Geometry per link</h3>
      {!geometry ? (
        <p className="empty">Shown once the kinematic table above is complete and valid.</p>
      ) : (
        <div className="table-wrap">
          <table className="cell-table" data-testid="link-geometry">
            <caption className="visually-hidden">The capsules each link is checked with</caption>
            <thead>
              <tr>
                <th scope="col">Link</th>
                <th scope="col">Source</th>
                <th scope="col">Capsules in the link&apos;s frame: from → to, radius (mm)</th>
                {!readOnly && <th scope="col">Override</th>}
              </tr>
            </thead>
            <tbody>
              {geometry.links.map((g) => (
                <tr key={g.link}>
                  <th scope="row">link {g.link}</th>
                  <td>{g.source === "collision" ? "entered" : g.source === "derived" ? `derived (radius ${mm(g.radius!)} mm)` : "none: not checked"}</td>
                  <td>
                    {g.capsules.length === 0
                      ? "–"
                      : g.capsules.map((c, k) => (
                          <div key={k}>
                            ({mm3(c.from)}) → ({mm3(c.to)}), r {mm(c.radius)}
                          </div>
                        ))}
                    {g.stretches && <div className="hint">the part along the prismatic joint stretches with its travel (shown at q = 0)</div>}
                  </td>
                  {!readOnly && (
                    <td>
                      {g.source === "derived" && (
                        <button type="button" className="small" onClick={() => props.onChange({ capsules: [...rows, ...g.capsules.map((c) => capsuleRow(g.link, c, false))] }, true)}>
                          Copy to the table
                        </button>
                      )}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {geometry && geometry.touching.length > 0 && (
        <p className="hint" data-testid="touching-pairs">
          Not checked, because their derived capsules touch in every configuration (the links between them are shorter than the two radii):{" "}
          {geometry.touching.map(([a, b]) => `link ${a} – link ${b}`).join(", ")}.
        </p>
      )}
      <TextField
        label="Ignored pairs"
        hint="link numbers never checked against each other, 0 = base, e.g. 0-2, 3-5"
        name="ignoredPairs"
        value={form.ignoredPairs}
        readOnly={readOnly}
        error={wholeErrors(errors, "ignoredPairs") ?? err(Object.keys(errors).filter((p) => p.startsWith("ignoredPairs.")))}
        onChange={(v) => props.onChange({ ignoredPairs: v })}
      />
      <CellCaution />
    </fieldset>
  );
}
