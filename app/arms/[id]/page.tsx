import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArm } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { ArmEditor } from "@/components/arm/ArmEditor";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Arm" };

export default async function ArmPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ created?: string }> }) {
  const { id } = await params;
  const { created } = await searchParams;
  const user = await requireUser(`/arms/${id}`);
  const rec = await getArm(id);
  if (!rec) notFound();
  return (
    <ArmEditor
      key={rec.id}
      id={rec.id}
      revision={rec.revision}
      initial={rec.arm}
      canWrite={allowed(user, "arm:write")}
      deleted={rec.deletedAt !== null}
      created={created === "1" && rec.revision === 1}
    />
  );
}
