import type { Metadata } from "next";
import { listRequirementSets } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { RequirementList } from "@/components/requirements/RequirementList";
import { listedFields } from "@/lib/views/listing";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Requirement sets" };

export default async function RequirementsPage() {
  const user = await requireUser("/requirements");
  const sets = await listRequirementSets({ deleted: "include" });
  return (
    <RequirementList
      canWrite={allowed(user, "req:write")}
      sets={sets.map((s) => ({ ...listedFields(s), targets: s.targets, paths: s.paths }))}
    />
  );
}
