import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getShortlistCatalog } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { CreateShortlist } from "@/components/shortlist/CreateShortlist";
import { armListing } from "@/lib/views/listing";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "New shortlist" };

export default async function NewShortlistPage() {
  const user = await requireUser("/shortlists/new");
  if (!allowed(user, "shortlist:write")) redirect("/shortlists");
  const { arms, sets } = await getShortlistCatalog();

  return <CreateShortlist arms={arms.map(armListing)} sets={sets.map((s) => ({ id: s.id, name: s.name, revision: s.revision, targets: s.targets, paths: s.paths }))} />;
}
