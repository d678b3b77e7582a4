import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getRequirementRevision } from "@/lib/db";
import { requireUser } from "@/app/_lib/session";
import { RequirementEditor } from "@/components/requirements/RequirementEditor";
import { RevisionMeta } from "@/components/RevisionList";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Requirement-set revision" };

export default async function RequirementRevisionPage({ params }: { params: Promise<{ id: string; rev: string }> }) {
  const { id, rev } = await params;
  await requireUser(`/requirements/${id}/history/${rev}`);
  const n = Number(rev);
  const r = Number.isInteger(n) ? await getRequirementRevision(id, n) : null;
  if (!r) notFound();
  return (
    <>
      <RevisionMeta author={r.author?.name ?? null} createdAt={r.createdAt.toISOString()} />
      <RequirementEditor id={id} initial={r.requirementSet} canWrite={false} viewingRevision={r.revision} />
    </>
  );
}
