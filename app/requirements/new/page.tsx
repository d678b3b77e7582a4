import type { Metadata } from "next";
import { allowed, requireUser } from "@/app/_lib/session";
import { RequirementEditor } from "@/components/requirements/RequirementEditor";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "New requirement set" };

export default async function NewRequirementPage() {
  const user = await requireUser("/requirements/new");
  if (!allowed(user, "req:write")) {
    return (
      <div className="panel narrow" role="alert">
        <h1>New requirement set</h1>
        <p>Your role is viewer: you can read requirement sets but not create them. An administrator can make you an editor.</p>
      </div>
    );
  }
  return <RequirementEditor canWrite />;
}
