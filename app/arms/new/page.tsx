import type { Metadata } from "next";
import { allowed, requireUser } from "@/app/_lib/session";
import { ArmEditor } from "@/components/arm/ArmEditor";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "New arm" };

export default async function NewArmPage() {
  const user = await requireUser("/arms/new");
  if (!allowed(user, "arm:write")) {
    return (
      <div className="panel narrow" role="alert">
        <h1>New arm</h1>
        <p>Your role is viewer: you can read arms but not create them. An administrator can make you an editor.</p>
      </div>
    );
  }
  return <ArmEditor canWrite />;
}
