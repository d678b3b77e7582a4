"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useRef, useState } from "react";
import { api } from "../api";
import { show } from "../pose";
import { mToMm } from "@/shared/units";

export interface ArmRow {
  id: string;
  name: string;
  maker: string | null;
  modelCode: string | null;
  axes: number;
  revision: number;
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
  specs: {
    reach?: number;
    ratedPayload?: number;
    repeatability?: number;
    ipCode?: string;
    price?: number;
    currency?: string;
  };
}

const dash = "–";
const when = (iso: string) => new Date(iso).toISOString().slice(0, 16).replace("T", " ") + " UTC";

/** The arm catalog table, deleted arms under a toggle, import of an arm JSON file. */
export function ArmCatalog({ arms, canWrite }: { arms: ArmRow[]; canWrite: boolean }) {
  const router = useRouter();
  const uid = useId();
  const [showDeleted, setShowDeleted] = useState(false);
  const [status, setStatus] = useState("");
  const [problem, setProblem] = useState<string[]>([]);
  const fileRef = useRef<HTMLInputElement>(null);
  const live = arms.filter((a) => !a.deletedAt);
  const deleted = arms.filter((a) => a.deletedAt);
  const shown = showDeleted ? [...live, ...deleted] : live;

  async function restore(a: ArmRow) {
    setProblem([]);
    const r = await api(`/api/arms/${a.id}/restore`, "POST");
    if (r.ok) {
      setStatus(`Restored ${a.name}.`);
      router.refresh();
    } else setProblem([r.error.message]);
  }

  async function importFile(file: File) {
    setStatus("");
    setProblem([]);
    const text = await file.text();
    try {
      JSON.parse(text);
    } catch {
      setProblem([`${file.name} is not valid JSON.`]);
      return;
    }
    const r = await api<{ id: string }>("/api/arms/import", "POST", text);
    if (r.ok) {
      router.push(`/arms/${r.data.id}`);
      return;
    }
    setProblem([`${file.name} was not imported: ${r.error.message}`, ...(r.error.fieldErrors ?? []).map((f) => `${f.path}: ${f.message}`)]);
  }

  return (
    <>
      <div className="page-head">
        <h1>Arms</h1>
        <span className="sub">
          {live.length} arm{live.length === 1 ? "" : "s"}
        </span>
        <div className="actions">
          <label className="checks">
            <input type="checkbox" checked={showDeleted} onChange={(e) => setShowDeleted(e.target.checked)} /> Show deleted ({deleted.length})
          </label>
          {canWrite && (
            <>
              <Link className="button primary" href="/arms/new">
                New arm
              </Link>
              <button type="button" onClick={() => fileRef.current?.click()}>
                Import JSON…
              </button>
              <label htmlFor={uid + "-file"} className="visually-hidden">
                Arm JSON file to import
              </label>
              <input
                id={uid + "-file"}
                ref={fileRef}
                type="file"
                accept="application/json,.json"
                className="visually-hidden"
                tabIndex={-1}
                onChange={(e) => {
                  const f = e.target.files?.[0];
                  e.target.value = "";
                  if (f) void importFile(f);
                }}
              />
            </>
          )}
        </div>
      </div>
      <div aria-live="polite" role="status">
        {status && <p className="notice">{status}</p>}
        {problem.length > 0 && (
          <div className="notice bad">
            <ul>
              {problem.map((p, i) => (
                <li key={i}>{p}</li>
              ))}
            </ul>
          </div>
        )}
      </div>
      {shown.length === 0 ? (
        <p className="empty">No arms yet.{canWrite && " Create one or import a JSON file."}</p>
      ) : (
        <div className="table-wrap">
          <table data-testid="arm-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Maker</th>
                <th scope="col">Model code</th>
                <th scope="col" className="num">
                  Axes
                </th>
                <th scope="col" className="num">
                  Reach (mm)
                </th>
                <th scope="col" className="num">
                  Rated payload (kg)
                </th>
                <th scope="col" className="num">
                  Repeatability (mm)
                </th>
                <th scope="col">IP code</th>
                <th scope="col" className="num">
                  Price
                </th>
                <th scope="col" className="num">
                  Revision
                </th>
                <th scope="col">Updated</th>
                {showDeleted && <th scope="col">State</th>}
              </tr>
            </thead>
            <tbody>
              {shown.map((a) => (
                <tr key={a.id} className={a.deletedAt ? "deleted" : undefined}>
                  <td>
                    <Link href={`/arms/${a.id}`}>{a.name}</Link>
                  </td>
                  <td>{a.maker ?? dash}</td>
                  <td>{a.modelCode ?? dash}</td>
                  <td className="num">{a.axes}</td>
                  <td className="num">{a.specs.reach !== undefined ? show(Math.round(mToMm(a.specs.reach) * 10) / 10) : dash}</td>
                  <td className="num">{a.specs.ratedPayload !== undefined ? show(a.specs.ratedPayload) : dash}</td>
                  <td className="num">{a.specs.repeatability !== undefined ? show(Math.round(mToMm(a.specs.repeatability) * 1000) / 1000) : dash}</td>
                  <td>{a.specs.ipCode ?? dash}</td>
                  <td className="num">
                    {a.specs.price !== undefined ? `${a.specs.price.toLocaleString("en-US", { maximumFractionDigits: 2 })} ${a.specs.currency ?? ""}`.trim() : dash}
                  </td>
                  <td className="num">{a.revision}</td>
                  <td className="when">
                    {when(a.updatedAt)}
                    {a.updatedBy && <span className="sub"> by {a.updatedBy}</span>}
                  </td>
                  {showDeleted && (
                    <td>
                      {a.deletedAt ? (
                        <>
                          deleted{" "}
                          {canWrite && (
                            <button type="button" className="small" onClick={() => restore(a)} aria-label={`Restore ${a.name}`}>
                              Restore
                            </button>
                          )}
                        </>
                      ) : (
                        "active"
                      )}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
