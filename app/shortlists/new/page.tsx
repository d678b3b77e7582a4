import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getShortlistCatalog } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { CreateShortlist, type CatalogArm } from "@/components/shortlist/CreateShortlist";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "New shortlist" };

export default async function NewShortlistPage() {
  const user = await requireUser("/shortlists/new");
  if (!allowed(user, "shortlist:write")) redirect("/shortlists");
  const { arms, sets } = await getShortlistCatalog();
  const rows: CatalogArm[] = arms.map((a) => ({
    id: a.id, name: a.name, maker: a.maker, modelCode: a.modelCode, axes: a.axes, revision: a.revision,
    reach: a.specs.reach ?? null, ratedPayload: a.specs.ratedPayload ?? null, ipCode: a.specs.ipCode ?? null,
    price: a.specs.price ?? null, currency: a.specs.currency ?? null,
  }));
  return <CreateShortlist arms={rows} sets={sets.map((s) => ({ id: s.id, name: s.name, revision: s.revision, targets: s.targets, paths: s.paths }))} />;
}
