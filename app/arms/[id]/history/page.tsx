import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getArmHistory } from "@/lib/db";
import { requireUser } from "@/app/_lib/session";
import { RevisionList } from "@/components/RevisionList";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Arm history" };

export default async function ArmHistoryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireUser(`/arms/${id}/history`);
  const history = await getArmHistory(id);
  if (!history) notFound();
  const { record: rec, revisions } = history;
  return (
    <>
      <div className="page-head">
        <h1>History of {rec.arm.name}</h1>
        <div className="actions">
          <Link href={`/arms/${id}`}>Back to the arm</Link>
        </div>
      </div>
      <RevisionList
        baseHref={`/arms/${id}/history`}
        current={rec.revision}
        revisions={revisions.map((r) => ({ revision: r.revision, createdAt: r.createdAt.toISOString(), author: r.author?.name ?? null, summary: r.summary }))}
      />
    </>
  );
}
