import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevision } from "@/lib/db";
import { requireUser } from "@/app/_lib/session";
import { ArmEditor } from "@/components/arm/ArmEditor";
import { RevisionMeta } from "@/components/RevisionList";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Arm revision" };

export default async function ArmRevisionPage({ params }: { params: Promise<{ id: string; rev: string }> }) {
  const { id, rev } = await params;
  await requireUser(`/arms/${id}/history/${rev}`);
  const n = Number(rev);
  const r = Number.isInteger(n) ? await getArmRevision(id, n) : null;
  if (!r) notFound();
  return (
    <>
      <RevisionMeta author={r.author?.name ?? null} createdAt={r.createdAt.toISOString()} />
      <ArmEditor id={id} initial={r.arm} canWrite={false} viewingRevision={r.revision} />
    </>
  );
}
