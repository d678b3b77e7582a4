/**
 * What the list pages show of stored documents, shaped for the client list components (ISO
 * times, the editor's name): the one place these rows are made.
 */
import type { ArmSpecs } from "@/shared/schemas";
import type { ArmSummary } from "@/lib/db";

/** The list fields of a stored document, as the client list components take them (ISO times). */
export function listedFields(r: { id: string; name: string; revision: number; updatedAt: Date; updatedBy: { name: string } | null; deletedAt: Date | null }) {
  return {
    id: r.id,
    name: r.name,
    revision: r.revision,
    updatedAt: r.updatedAt.toISOString(),
    updatedBy: r.updatedBy?.name ?? null,
    deletedAt: r.deletedAt ? r.deletedAt.toISOString() : null,
  };
}

/** One arm of a list (the catalog, the choice of a new shortlist's arms): ArmSummary with ISO times. */
export type ArmListing = Pick<ArmSummary, "id" | "name" | "maker" | "modelCode" | "axes" | "revision"> & {
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
  /** The datasheet figures lists show (SI: reach and repeatability in m, payload in kg). */
  specs: Pick<ArmSpecs, "reach" | "ratedPayload" | "repeatability" | "ipCode" | "price" | "currency">;
};

export function armListing(a: ArmSummary): ArmListing {
  return {
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
  };
}
