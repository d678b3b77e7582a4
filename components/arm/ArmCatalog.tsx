"use client";
import { useState } from "react";
import { DocumentList, type DocumentColumn } from "../DocumentList";
import { UrdfImport } from "./UrdfImport";
import { show } from "../pose";
import { mToMm } from "@/shared/units";
import { price } from "@/shared/format";

export interface ArmRow {
  id: string;
  name: string;
  maker: string | null;
  modelCode: string | null;
  axes: number;
  revision: number;
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
  specs: {
    reach?: number;
    ratedPayload?: number;
    repeatability?: number;
    ipCode?: string;
    price?: number;
    currency?: string;
  };
}

const dash = "–";

const ARM_COLUMNS: DocumentColumn<ArmRow>[] = [
  { head: "Maker", cell: (a) => a.maker ?? dash },
  { head: "Model code", cell: (a) => a.modelCode ?? dash },
  { head: "Axes", num: true, cell: (a) => a.axes },
  { head: "Reach (mm)", num: true, cell: (a) => (a.specs.reach !== undefined ? show(Math.round(mToMm(a.specs.reach) * 10) / 10) : dash) },
  { head: "Rated payload (kg)", num: true, cell: (a) => (a.specs.ratedPayload !== undefined ? show(a.specs.ratedPayload) : dash) },
  { head: "Repeatability (mm)", num: true, cell: (a) => (a.specs.repeatability !== undefined ? show(Math.round(mToMm(a.specs.repeatability) * 1000) / 1000) : dash) },
  { head: "IP code", cell: (a) => a.specs.ipCode ?? dash },
  {
    head: "Price",
    num: true,
    cell: (a) => (a.specs.price !== undefined ? price(a.specs.price, a.specs.currency) : dash),
  },
];

/** The arm catalog table, deleted arms under a toggle, import of an arm JSON file or a URDF file. */
export function ArmCatalog({ arms, canWrite }: { arms: ArmRow[]; canWrite: boolean }) {
  const [urdfOpen, setUrdfOpen] = useState(false);
  return (
    <DocumentList
      rows={arms}
      canWrite={canWrite}
      title="Arms"
      noun="arm"
      api="/api/arms"
      page="/arms"
      newLabel="New arm"
      importLabel="Arm JSON file to import"
      empty={<>No arms yet.{canWrite && " Create one or import a JSON file."}</>}
      testId="arm-table"
      columns={ARM_COLUMNS}
      actions={
        <button type="button" onClick={() => setUrdfOpen(true)} aria-expanded={urdfOpen} aria-controls="urdf-import">
          Import URDF…
        </button>
      }
    >
      {urdfOpen && <UrdfImport onClose={() => setUrdfOpen(false)} />}
    </DocumentList>
  );
}
