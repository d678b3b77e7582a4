"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useRef, useState, type ReactNode } from "react";
import { api } from "./api";
import { PageHead } from "./PageHead";
import { utc } from "@/shared/format";

/** What a listed document (arm, requirement set) has for the list's own columns and controls. */
interface ListedDocument {
  id: string;
  name: string;
  revision: number;
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
}

/** A column between the name and the revision: its heading and its cell. */
export interface DocumentColumn<T> {
  head: string;
  /** Right-aligned number column. */
  num?: boolean;
  cell: (row: T) => ReactNode;
}

interface DocumentListProps<T extends ListedDocument> {
  rows: T[];
  canWrite: boolean;
  title: string;
  /** Singular noun for the count ("arm", "set"). */
  noun: string;
  /** API collection ("/api/arms"): `${api}/${id}/restore` and `${api}/import`. */
  api: string;
  /** Page collection ("/arms"): where "New" leads (`${page}/new`) and where an import opens. */
  page: string;
  newLabel: string;
  /** Accessible name of the file input. */
  importLabel: string;
  empty: ReactNode;
  /** data-testid of the table. */
  testId: string;
  /** The columns after Name (a link to the document) and before Revision, Updated and State. */
  columns: DocumentColumn<T>[];
  /** More actions beside New and Import JSON (shown to those who may write). */
  actions?: ReactNode;
  /** Shown under the head, above the table (e.g. an import panel). */
  children?: ReactNode;
}

/**
 * A catalog table of documents: live ones first, deleted ones under a toggle with a restore
 * button, creation and import of a JSON file for those who may write, status or problems announced.
 */
export function DocumentList<T extends ListedDocument>(props: DocumentListProps<T>) {
  const { rows, canWrite } = props;
  const router = useRouter();
  const uid = useId();
  const [showDeleted, setShowDeleted] = useState(false);
  const [status, setStatus] = useState("");
  const [problem, setProblem] = useState<string[]>([]);
  const fileRef = useRef<HTMLInputElement>(null);
  const live = rows.filter((r) => !r.deletedAt);
  const deleted = rows.filter((r) => r.deletedAt);
  const shown = showDeleted ? [...live, ...deleted] : live;

  async function restore(row: T) {
    setProblem([]);
    const r = await api(`${props.api}/${row.id}/restore`, "POST");
    if (r.ok) {
      setStatus(`Restored ${row.name}.`);
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
    const r = await api<{ id: string; notices?: string[] }>(`${props.api}/import`, "POST", text);
    if (r.ok) {
      router.push(`${props.page}/${r.data.id}${r.data.notices?.length ? "?converted=1" : ""}`);
      return;
    }
    setProblem([`${file.name} was not imported: ${r.error.message}`, ...(r.error.fieldErrors ?? []).map((f) => `${f.path}: ${f.message}`)]);
  }

  return (
    <>
      <PageHead title={props.title} count={live.length} noun={props.noun}>
        <label className="checks">
          <input type="checkbox" checked={showDeleted} onChange={(e) => setShowDeleted(e.target.checked)} /> Show deleted ({deleted.length})
        </label>
        {canWrite && (
          <>
            <Link className="button primary" href={`${props.page}/new`}>
              {props.newLabel}
            </Link>
            <button type="button" onClick={() => fileRef.current?.click()}>
              Import JSON…
            </button>
            <label htmlFor={uid + "-file"} className="visually-hidden">
              {props.importLabel}
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
            {props.actions}
          </>
        )}
      </PageHead>
      {props.children}
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
        <p className="empty">{props.empty}</p>
      ) : (
        <div className="table-wrap">
          <table data-testid={props.testId}>
            <thead>
              <tr>
                <th scope="col">Name</th>
                {props.columns.map((c) => (
                  <th key={c.head} scope="col" className={c.num ? "num" : undefined}>
                    {c.head}
                  </th>
                ))}
                <th scope="col" className="num">
                  Revision
                </th>
                <th scope="col">Updated</th>
                {showDeleted && <th scope="col">State</th>}
              </tr>
            </thead>
            <tbody>
              {shown.map((row) => (
                <tr key={row.id} className={row.deletedAt ? "deleted" : undefined}>
                  <td>
                    <Link href={`${props.page}/${row.id}`}>{row.name}</Link>
                  </td>
                  {props.columns.map((c) => (
                    <td key={c.head} className={c.num ? "num" : undefined}>
                      {c.cell(row)}
                    </td>
                  ))}
                  <td className="num">{row.revision}</td>
                  <td className="when">
                    {utc(row.updatedAt)}
                    {row.updatedBy && <span className="sub"> by {row.updatedBy}</span>}
                  </td>
                  {showDeleted && (
                    <td>
                      {row.deletedAt ? (
                        <>
                          deleted{" "}
                          {canWrite && (
                            <button type="button" className="small" onClick={() => restore(row)} aria-label={`Restore ${row.name}`}>
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
