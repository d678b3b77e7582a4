import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getRequirementHistory } from "@/lib/db";
import { requireUser } from "@/app/_lib/session";
import { RevisionList } from "@/components/RevisionList";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Requirement-set history" };

export default async function RequirementHistoryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireUser(`/requirements/${id}/history`);
  const history = await getRequirementHistory(id);
  if (!history) notFound();
  const { record: rec, revisions } = history;
  return (
    <>
      <div className="page-head">
        <h1>History of {rec.requirementSet.name}</h1>
        <div className="actions">
          <Link href={`/requirements/${id}`}>Back to the requirement set</Link>
        </div>
      </div>
      <RevisionList
        baseHref={`/requirements/${id}/history`}
        current={rec.revision}
        revisions={revisions.map((r) => ({ revision: r.revision, createdAt: r.createdAt.toISOString(), author: r.author?.name ?? null, summary: r.summary }))}
      />
    </>
  );
}
