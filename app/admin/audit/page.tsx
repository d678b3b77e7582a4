import type { Metadata } from "next";
import Link from "next/link";
import { allowed, requireUser } from "@/app/_lib/session";
import { listAuditEvents } from "@/lib/db";
import "@/components/discussion/discussion.css";
import { utc } from "@/shared/format";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Audit trail" };

const TYPES = ["arm", "requirement", "shortlist", "comment", "user"] as const;
const LIMIT = 300;

/** Who changed what and when: arms, requirement sets, shortlists, share links, comments, accounts. Admins only. */
export default async function AuditPage({ searchParams }: { searchParams: Promise<{ type?: string | string[] }> }) {
  const user = await requireUser("/admin/audit");
  if (!allowed(user, "audit:read")) {
    return (
      <div className="panel narrow" role="alert">
        <h1>Audit trail</h1>
        <p>Only administrators read the audit trail.</p>
      </div>
    );
  }
  const sp = await searchParams;
  const type = typeof sp.type === "string" && (TYPES as readonly string[]).includes(sp.type) ? sp.type : undefined;
  const events = await listAuditEvents({ entityType: type, limit: LIMIT });
  return (
    <>
      <div className="page-head">
        <h1>Audit trail</h1>
        <span className="sub">newest first, at most {LIMIT} events; share links are listed under their shortlist</span>
      </div>
      <nav className="toolbar" aria-label="Filter by kind">
        <Link href="/admin/audit" aria-current={type ? undefined : "page"}>
          everything
        </Link>
        {TYPES.map((t) => (
          <Link key={t} href={`/admin/audit?type=${t}`} aria-current={type === t ? "page" : undefined}>
            {t}
          </Link>
        ))}
      </nav>
      <div className="panel table-wrap">
        <table className="audit-table" data-testid="audit-table">
          <thead>
            <tr>
              <th>When (UTC)</th>
              <th>Who</th>
              <th>What</th>
              <th>On</th>
              <th>Details</th>
            </tr>
          </thead>
          <tbody>
            {events.map((e) => (
              <tr key={e.id}>
                <td>{utc(e.at, { seconds: true })}</td>
                <td>{e.actor?.name ?? (e.detail && typeof e.detail === "object" && "guest" in e.detail ? `${String((e.detail as { guest: unknown }).guest)} (guest)` : "—")}</td>
                <td>{e.action}</td>
                <td>
                  {e.entityType === "shortlist" ? <Link href={`/shortlists/${encodeURIComponent(e.entityId)}`}>shortlist {e.entityId.slice(0, 8)}</Link> : e.entityType === "arm" ? <Link href={`/arms/${encodeURIComponent(e.entityId)}`}>arm {e.entityId.slice(0, 8)}</Link> : e.entityType === "requirement" ? <Link href={`/requirements/${encodeURIComponent(e.entityId)}`}>requirement set {e.entityId.slice(0, 8)}</Link> : `${e.entityType} ${e.entityId.slice(0, 8)}`}
                </td>
                <td>{e.detail === null ? "" : <code>{JSON.stringify(e.detail)}</code>}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {events.length === 0 && <p className="sub">No events.</p>}
      </div>
    </>
  );
}
