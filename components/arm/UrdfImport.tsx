"use client";
/**
 * The arm catalog's URDF import: choose a file, see the chain the server reads from it (base and
 * tip selectable from the candidates), the joint table and what was merged, converted or skipped,
 * accept suggested capsules for mesh-only links, then save the arm (as an import, with its
 * source file name and hash). Nothing is saved before "Save arm".
 */
import { useRouter } from "next/navigation";
import { useId, useRef, useState } from "react";
import type { ArmDocument, ChainJointSpec } from "@/shared/schemas";
import type { UrdfImportReport } from "@/lib/urdf";
import { jointSpeedUnit, jointToDisplay, jointTorqueUnit, jointUnit, mToMm } from "@/shared/units";
import { api } from "../api";
import { show } from "../pose";
import { count } from "@/shared/format";

interface Preview {
  arm: ArmDocument;
  report: UrdfImportReport;
}

const fmt = (v: number | undefined, digits = 1) => (v === undefined ? "–" : show(Math.round(v * 10 ** digits) / 10 ** digits));

/** The import panel (the catalog's "Import URDF…" button opens it). */
export function UrdfImport({ onClose }: { onClose: () => void }) {
  const router = useRouter();
  const uid = useId();
  const fileRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [accepted, setAccepted] = useState<Set<number>>(new Set());

  async function read(f: { name: string; text: string }, base?: string, tip?: string) {
    setBusy(true);
    setProblem(null);
    const r = await api<Preview>("/api/arms/urdf", "POST", { fileName: f.name, text: f.text, ...(base ? { base } : {}), ...(tip ? { tip } : {}) });
    setBusy(false);
    if (r.ok) {
      setPreview(r.data);
      setAccepted(new Set());
    } else {
      setPreview(null);
      setProblem(r.error.message);
    }
  }

  async function save() {
    if (!preview) return;
    const arm = structuredClone(preview.arm);
    for (const s of preview.report.suggestions) {
      if (!accepted.has(s.body)) continue;
      if (s.body === 0) arm.baseCollision = [...(arm.baseCollision ?? []), s.capsule];
      else arm.joints[s.body - 1].collision = [...(arm.joints[s.body - 1].collision ?? []), s.capsule];
    }
    setBusy(true);
    const r = await api<{ id: string }>("/api/arms/import", "POST", arm);
    setBusy(false);
    if (r.ok) router.push(`/arms/${r.data.id}`);
    else setProblem(`${preview.arm.name} was not saved: ${r.error.message}${(r.error.fieldErrors ?? []).map((e) => `; ${e.path}: ${e.message}`).join("")}`);
  }

  const rep = preview?.report;
  const joints = (preview?.arm.joints ?? []) as ChainJointSpec[];
  return (
        <section id="urdf-import" className="panel urdf-import" role="dialog" aria-modal="false" aria-labelledby={`${uid}-title`} data-testid="urdf-import">
          <h2 id={`${uid}-title`}>Import a URDF robot description</h2>
          <p className="hint">
            The serial chain from a base link to a tip link becomes an arm with a general joint chain. Revolute, continuous, prismatic and fixed joints are read;
            floating, planar and mimic joints are refused on the chain. Xacro files must be expanded first. At most 2 MiB and 200 links.
          </p>
          <div className="toolbar">
            <label htmlFor={`${uid}-file`}>URDF file</label>
            <input
              id={`${uid}-file`}
              ref={fileRef}
              type="file"
              accept=".urdf,.xml,application/xml,text/xml"
              onChange={async (e) => {
                const f = e.target.files?.[0];
                e.target.value = "";
                if (!f) return;
                if (f.size > 2 * 1024 * 1024) {
                  setPreview(null);
                  setProblem(`${f.name} is ${count(f.size)} bytes; the limit is 2 MiB.`);
                  return;
                }
                const next = { name: f.name, text: await f.text() };
                setFile(next);
                await read(next);
              }}
            />
            {file && <span className="hint">read: {file.name}</span>}
            <button type="button" onClick={onClose}>
              Close
            </button>
          </div>
          <div aria-live="polite" role="status">
            {busy && <p className="hint">Reading…</p>}
            {problem && <p className="notice bad" data-testid="urdf-error">{problem}</p>}
          </div>
          {preview && rep && file && (
            <div data-testid="urdf-preview">
              <div className="grid wide">
                <label className="field">
                  <span>Base link</span>
                  <select value={rep.baseLink} disabled={busy} onChange={(e) => void read(file, e.target.value)} name="urdf-base">
                    {rep.baseCandidates.map((b) => (
                      <option key={b} value={b}>
                        {b}
                      </option>
                    ))}
                  </select>
                </label>
                <label className="field">
                  <span>Tip link (tool point)</span>
                  <select value={rep.tipLink} disabled={busy} onChange={(e) => void read(file, rep.baseLink, e.target.value)} name="urdf-tip">
                    {rep.tipCandidates.map((t) => (
                      <option key={t.link} value={t.link} disabled={t.blockedBy !== null}>
                        {t.link} ({t.movingJoints} moving joint{t.movingJoints === 1 ? "" : "s"}{t.blockedBy ? `; not usable: ${t.blockedBy}` : ""})
                      </option>
                    ))}
                  </select>
                </label>
              </div>
              <p data-testid="urdf-chain">
                <strong>{preview.arm.name}</strong>: chain from link <code>{rep.baseLink}</code> to link <code>{rep.tipLink}</code>, {rep.joints.length} moving joints.
              </p>
              <div className="table-wrap">
                <table className="cell-table" data-testid="urdf-joints">
                  <caption className="visually-hidden">Joints of the imported chain</caption>
                  <thead>
                    <tr>
                      <th scope="col">Joint</th>
                      <th scope="col">Name in the file</th>
                      <th scope="col">Type</th>
                      <th scope="col">Parent → child link</th>
                      <th scope="col" className="num">Origin x y z (mm)</th>
                      <th scope="col" className="num">min … max</th>
                      <th scope="col" className="num">Max speed</th>
                      <th scope="col" className="num">Max torque / force</th>
                      <th scope="col" className="num">Link mass (kg)</th>
                      <th scope="col">Fixed joints merged in</th>
                    </tr>
                  </thead>
                  <tbody>
                    {rep.joints.map((r, i) => {
                      const j = joints[i];
                      return (
                        <tr key={r.name}>
                          <th scope="row">{r.joint}</th>
                          <td>{r.name}</td>
                          <td>{r.urdfType === r.type ? r.type : `${r.urdfType} → ${r.type}`}</td>
                          <td>
                            {r.parent} → {r.child}
                          </td>
                          <td className="num">{j.origin.xyz.map((v) => fmt(mToMm(v))).join(" ")}</td>
                          <td className="num">
                            {fmt(jointToDisplay(j.type, j.min))} … {fmt(jointToDisplay(j.type, j.max))} {jointUnit(j.type)}
                          </td>
                          <td className="num">{j.maxSpeed === undefined ? "not stated" : `${fmt(jointToDisplay(j.type, j.maxSpeed))} ${jointSpeedUnit(j.type)}`}</td>
                          <td className="num">{j.maxTorque === undefined ? "not stated" : `${fmt(j.maxTorque)} ${jointTorqueUnit(j.type)}`}</td>
                          <td className="num">{fmt(j.mass, 3)}</td>
                          <td>{r.mergedFixed.length ? r.mergedFixed.join(", ") : "–"}</td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
              </div>
              <ReportList title="Merged" testId="urdf-merged" items={rep.merged} />
              <ReportList title="Converted" testId="urdf-converted" items={rep.converted} />
              <ReportList title="Skipped" testId="urdf-skipped" items={rep.skipped} />
              {rep.suggestions.length > 0 && (
                <fieldset className="field" data-testid="urdf-suggestions">
                  <legend>Suggested capsules for links described only by meshes (check them against the real housing)</legend>
                  {rep.suggestions.map((s) => (
                    <label key={s.body} className="checks">
                      <input
                        type="checkbox"
                        checked={accepted.has(s.body)}
                        onChange={(e) => {
                          const next = new Set(accepted);
                          if (e.target.checked) next.add(s.body);
                          else next.delete(s.body);
                          setAccepted(next);
                        }}
                      />
                      {s.body === 0 ? "base" : `link ${s.body}`} ({s.link}): from {s.capsule.from.map((v) => fmt(mToMm(v))).join(" ")} to {s.capsule.to.map((v) => fmt(mToMm(v))).join(" ")} mm, radius{" "}
                      {fmt(mToMm(s.capsule.radius))} mm
                    </label>
                  ))}
                </fieldset>
              )}
              <ReportList title="Notes" testId="urdf-notes" items={rep.notes} />
              <div className="toolbar">
                <button type="button" className="primary" disabled={busy} onClick={() => void save()}>
                  Save arm
                </button>
                <span className="hint">
                  Saved as a new arm with source {rep.fileName} (SHA-256 {rep.sha256?.slice(0, 12)}…). Add the datasheet specs in the editor afterwards.
                </span>
              </div>
            </div>
          )}
        </section>
  );
}

function ReportList({ title, items, testId }: { title: string; items: string[]; testId: string }) {
  if (items.length === 0) return null;
  return (
    <div data-testid={testId}>
      <h3>{title}</h3>
      <ul>
        {items.map((m, i) => (
          <li key={i}>{m}</li>
        ))}
      </ul>
    </div>
  );
}
