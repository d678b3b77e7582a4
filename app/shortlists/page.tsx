import type { Metadata } from "next";
import Link from "next/link";
import { listShortlistsFor } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { PageHead } from "@/components/PageHead";
import { utc } from "@/shared/format";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Shortlists" };

export default async function ShortlistsPage() {
  const user = await requireUser("/shortlists");
  // With the comments by others since the signed-in member last read each discussion.
  const rows = await listShortlistsFor(user.id);
  return (
    <>
      <PageHead title="Shortlists" count={rows.length} noun="shortlist">
        {allowed(user, "shortlist:write") && (
          <Link className="button primary" href="/shortlists/new">
            New shortlist
          </Link>
        )}
      </PageHead>
      {rows.length === 0 ? (
        <p className="empty">No shortlists yet.</p>
      ) : (
        <div className="table-wrap">
          <table data-testid="shortlist-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Requirement set</th>
                <th scope="col" className="num">Arms</th>
                <th scope="col">Latest analysis</th>
                <th scope="col">Comments</th>
                <th scope="col">Created</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id}>
                  <td>
                    <Link href={`/shortlists/${r.id}`}>{r.name}</Link>
                  </td>
                  <td>
                    {r.requirementName} <span className="sub">rev {r.requirementRevision}</span>
                  </td>
                  <td className="num">{r.arms}</td>
                  <td>{r.latestRun ? `${r.latestRun.status}${r.latestRun.finishedAt ? `, ${utc(r.latestRun.finishedAt)}` : ""}` : "none"}</td>
                  <td data-testid="unread-count">
                    <UnreadCell count={r.unread} />
                  </td>
                  <td>
                    {utc(r.createdAt)}
                    {r.createdBy && <span className="sub"> by {r.createdBy.name}</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}

/** "N unread" in words (never colour alone); mentions of the member are named beside it. */
function UnreadCell({ count }: { count: { unread: number; mentions: number } }) {
  if (count.unread === 0) return <span className="sub">0 unread</span>;
  return (
    <strong>
      {count.unread} unread
      {count.mentions > 0 && <span className="sub">, {count.mentions} mentioning you</span>}
    </strong>
  );
}
