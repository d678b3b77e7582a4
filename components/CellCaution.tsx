import { CELL_CAUTION } from "@/shared/cell-caution";

/** The caution shown wherever collision geometry or clearance is entered or presented. */
export function CellCaution() {
  return (
    <p className="hint caution" data-testid="cell-caution">
      {CELL_CAUTION}
    </p>
  );
}
