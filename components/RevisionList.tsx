import Link from "next/link";
import { utc } from "@/shared/format";

interface RevisionRow {
  revision: number;
  createdAt: string;
  author: string | null;
  summary: string;
}

const when = (iso: string) => utc(iso, { seconds: true });

/** Revisions newest first, each opening a read-only view. */
export function RevisionList({ revisions, baseHref, current }: { revisions: RevisionRow[]; baseHref: string; current: number }) {
  return (
    <div className="table-wrap">
      <table data-testid="revision-table">
        <thead>
          <tr>
            <th scope="col">Revision</th>
            <th scope="col">Saved</th>
            <th scope="col">Author</th>
            <th scope="col">Summary</th>
          </tr>
        </thead>
        <tbody>
          {revisions.map((r) => (
            <tr key={r.revision}>
              <td>
                <Link href={`${baseHref}/${r.revision}`}>Revision {r.revision}</Link>
                {r.revision === current && <span className="sub"> (current)</span>}
              </td>
              <td className="when">{when(r.createdAt)}</td>
              <td>{r.author ?? "–"}</td>
              <td>{r.summary}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function RevisionMeta({ author, createdAt }: { author: string | null; createdAt: string }) {
  return (
    <p className="sub">
      Saved {when(createdAt)}
      {author ? ` by ${author}` : ""}.
    </p>
  );
}
