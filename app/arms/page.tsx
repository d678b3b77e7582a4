import type { Metadata } from "next";
import { listArms } from "@/lib/db";
import { allowed, requireUser } from "@/app/_lib/session";
import { ArmCatalog, type ArmRow } from "@/components/arm/ArmCatalog";
import { listedFields } from "@/components/PageHead";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Arms" };

export default async function ArmsPage() {
  const user = await requireUser("/arms");
  const arms = await listArms({ deleted: "include" });
  const rows: ArmRow[] = arms.map((a) => ({
    ...listedFields(a),
    maker: a.maker,
    modelCode: a.modelCode,
    axes: a.axes,
    specs: {
      reach: a.specs.reach,
      ratedPayload: a.specs.ratedPayload,
      repeatability: a.specs.repeatability,
      ipCode: a.specs.ipCode,
      price: a.specs.price,
      currency: a.specs.currency,
    },
  }));
  return <ArmCatalog arms={rows} canWrite={allowed(user, "arm:write")} />;
}
