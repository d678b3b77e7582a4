"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useRef, useState } from "react";
import { api } from "../api";

export interface RequirementRow {
  id: string;
  name: string;
  targets: number;
  paths: number;
  revision: number;
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
}

const when = (iso: string) => new Date(iso).toISOString().slice(0, 16).replace("T", " ") + " UTC";

export function RequirementList({ sets, canWrite }: { sets: RequirementRow[]; canWrite: boolean }) {
  const router = useRouter();
  const uid = useId();
  const [showDeleted, setShowDeleted] = useState(false);
  const [status, setStatus] = useState("");
  const [problem, setProblem] = useState<string[]>([]);
  const fileRef = useRef<HTMLInputElement>(null);
  const live = sets.filter((s) => !s.deletedAt);
  const deleted = sets.filter((s) => s.deletedAt);
  const shown = showDeleted ? [...live, ...deleted] : live;

  async function restore(s: RequirementRow) {
    setProblem([]);
    const r = await api(`/api/requirements/${s.id}/restore`, "POST");
    if (r.ok) {
      setStatus(`Restored ${s.name}.`);
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
    const r = await api<{ id: string }>("/api/requirements/import", "POST", text);
    if (r.ok) router.push(`/requirements/${r.data.id}`);
    else setProblem([`${file.name} was not imported: ${r.error.message}`, ...(r.error.fieldErrors ?? []).map((f) => `${f.path}: ${f.message}`)]);
  }

  return (
    <>
      <div className="page-head">
        <h1>Requirement sets</h1>
        <span className="sub">
          {live.length} set{live.length === 1 ? "" : "s"}
        </span>
        <div className="actions">
          <label className="checks">
            <input type="checkbox" checked={showDeleted} onChange={(e) => setShowDeleted(e.target.checked)} /> Show deleted ({deleted.length})
          </label>
          {canWrite && (
            <>
              <Link className="button primary" href="/requirements/new">
                New requirement set
              </Link>
              <button type="button" onClick={() => fileRef.current?.click()}>
                Import JSON…
              </button>
              <label htmlFor={uid + "-file"} className="visually-hidden">
                Requirement-set JSON file to import
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
        <p className="empty">No requirement sets yet.</p>
      ) : (
        <div className="table-wrap">
          <table data-testid="requirement-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col" className="num">
                  Targets
                </th>
                <th scope="col" className="num">
                  Paths
                </th>
                <th scope="col" className="num">
                  Revision
                </th>
                <th scope="col">Updated</th>
                {showDeleted && <th scope="col">State</th>}
              </tr>
            </thead>
            <tbody>
              {shown.map((s) => (
                <tr key={s.id} className={s.deletedAt ? "deleted" : undefined}>
                  <td>
                    <Link href={`/requirements/${s.id}`}>{s.name}</Link>
                  </td>
                  <td className="num">{s.targets}</td>
                  <td className="num">{s.paths}</td>
                  <td className="num">{s.revision}</td>
                  <td className="when">
                    {when(s.updatedAt)}
                    {s.updatedBy && <span className="sub"> by {s.updatedBy}</span>}
                  </td>
                  {showDeleted && (
                    <td>
                      {s.deletedAt ? (
                        <>
                          deleted{" "}
                          {canWrite && (
                            <button type="button" className="small" onClick={() => restore(s)} aria-label={`Restore ${s.name}`}>
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
