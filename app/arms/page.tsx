import type { Metadata } from "next";
import { listArms } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { ArmCatalog } from "@/components/arm/ArmCatalog";
import { armListing } from "@/lib/views/listing";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Arms" };

export default async function ArmsPage() {
  const user = await requireUser("/arms");
  const arms = await listArms({ deleted: "include" });

  return <ArmCatalog arms={arms.map(armListing)} canWrite={allowed(user, "arm:write")} />;
}
