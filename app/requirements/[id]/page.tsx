import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getRequirementSet } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { RequirementEditor } from "@/components/requirements/RequirementEditor";
import { LEGACY_OBSTACLES_NOTICE } from "@/shared/schemas";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Requirement set" };

export default async function RequirementPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ created?: string; converted?: string }> }) {
  const { id } = await params;
  const { created, converted } = await searchParams;
  const user = await requireUser(`/requirements/${id}`);
  const rec = await getRequirementSet(id);
  if (!rec) notFound();
  return (
    <RequirementEditor
      key={rec.id}
      id={rec.id}
      revision={rec.revision}
      initial={rec.requirementSet}
      canWrite={allowed(user, "req:write")}
      deleted={rec.deletedAt !== null}
      created={created === "1" && rec.revision === 1}
      notices={converted === "1" && rec.revision === 1 ? [LEGACY_OBSTACLES_NOTICE] : undefined}
    />
  );
}
