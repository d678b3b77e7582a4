import { CYCLE_CAUTION } from "@/shared/cycle-caution";

/** The caution shown wherever cycle times are entered or presented. */
export function CycleCaution() {
  return (
    <p className="hint caution" data-testid="cycle-caution">
      {CYCLE_CAUTION}
    </p>
  );
}
