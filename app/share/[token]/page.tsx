import type { Metadata } from "next";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { can } from "@/lib/auth/permissions";
import { lookUpShareToken } from "@/lib/auth/share-access";
import { clientAddress } from "@/lib/http/forwarded";
import { shortlistForGuest } from "@/lib/views/share-view";
import { CAUTION } from "@/lib/analysis/shortlist";
import { anchorOptions } from "@/lib/views/anchors";
import { DiscussionPanel } from "@/components/discussion/DiscussionPanel";
import { GuestResult } from "@/components/share/GuestResult";
import "@/components/discussion/discussion.css";
import { utcDate } from "@/shared/format";

export const dynamic = "force-dynamic";
// The address holds the token: never send it on as a Referer, never index it.
export const metadata: Metadata = { title: "Shared shortlist", referrer: "no-referrer", robots: { index: false, follow: false } };

/**
 * The share view of a link guest. Unknown, malformed, expired and revoked tokens all get the
 * same not-found page; token lookups are rate limited per client address like the API's.
 */
export default async function SharePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const lookup = await lookUpShareToken(clientAddress(new Request("http://share.invalid/", { headers: await headers() })), token);
  if (lookup.kind !== "guest") notFound();
  const guest = lookup.guest;
  if (!can(guest, "shortlist:read", { shortlistId: guest.shortlistId })) notFound();
  const view = await shortlistForGuest(guest);
  if (!view) notFound();

  const anchors = anchorOptions({
    arms: view.shortlist.arms,
    targets: (view.analysis?.targets ?? []).map((t) => t.name),
    paths: (view.analysis?.paths ?? []).map((p) => p.name),
    compliance: view.analysis?.compliance ?? [],
  });

  return (
    <div className="share-view">
      <div className="page-head">
        <h1>
          Shared shortlist: <span data-testid="share-name">{view.shortlist.name}</span>
        </h1>
        <span className="sub">
          {guest.access === "comment" ? "view and comment link" : "view-only link"}
          {guest.expiresAt ? `, works until ${utcDate(guest.expiresAt)}` : ""}
        </span>
      </div>
      <section className="panel visibility" aria-labelledby="visibility-h" data-testid="visibility">
        <h2 id="visibility-h">What guests can see</h2>
        <ul>
          {view.visibility.statements.map((s) => (
            <li key={s}>{s}</li>
          ))}
        </ul>
      </section>
      <p className="caution-top" data-testid="caution">
        {view.caution ?? CAUTION}
      </p>
      <GuestResult view={view} />
      <DiscussionPanel anchors={anchors} mode={{ kind: "guest", token, canWrite: can(guest, "comment:write", { shortlistId: guest.shortlistId }) }} />
      <p className="caution">{CAUTION}</p>
    </div>
  );
}
