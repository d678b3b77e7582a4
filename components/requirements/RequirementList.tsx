"use client";
import { DocumentList, type DocumentColumn } from "../DocumentList";

interface RequirementRow {
  id: string;
  name: string;
  targets: number;
  paths: number;
  revision: number;
  updatedAt: string;
  updatedBy: string | null;
  deletedAt: string | null;
}

const SET_COLUMNS: DocumentColumn<RequirementRow>[] = [
  { head: "Targets", num: true, cell: (s) => s.targets },
  { head: "Paths", num: true, cell: (s) => s.paths },
];

/** The requirement-set list, deleted sets under a toggle, import of a requirement-set JSON file. */
export function RequirementList({ sets, canWrite }: { sets: RequirementRow[]; canWrite: boolean }) {
  return (
    <DocumentList
      rows={sets}
      canWrite={canWrite}
      title="Requirement sets"
      noun="set"
      api="/api/requirements"
      page="/requirements"
      newLabel="New requirement set"
      importLabel="Requirement-set JSON file to import"
      empty="No requirement sets yet."
      testId="requirement-table"
      columns={SET_COLUMNS}
    />
  );
}
