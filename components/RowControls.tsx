"use client";
import { moveItem } from "./pose";

/** A copy of the list without item i. */
function removeAt<T>(list: T[], i: number): T[] {
  return list.filter((_, k) => k !== i);
}

/**
 * The last cell of an editable table row: move up, move down and remove. `label` names the row
 * in the buttons' accessible names ("joint 3" → "Move joint 3 up", "Remove joint 3"). `onChange`
 * receives the reordered or shortened list.
 */
export function RowActionsCell<T>(props: { rows: T[]; index: number; label: string; onChange: (rows: T[]) => void; canRemove?: boolean }) {
  const { rows, index: i, label } = props;
  return (
    <td>
      <div className="row-actions">
        <button type="button" className="small" aria-label={`Move ${label} up`} disabled={i === 0} onClick={() => props.onChange(moveItem(rows, i, -1))}>
          ↑
        </button>
        <button type="button" className="small" aria-label={`Move ${label} down`} disabled={i === rows.length - 1} onClick={() => props.onChange(moveItem(rows, i, 1))}>
          ↓
        </button>
        <button type="button" className="small danger" aria-label={`Remove ${label}`} disabled={props.canRemove === false} onClick={() => props.onChange(removeAt(rows, i))}>
          Remove
        </button>
      </div>
    </td>
  );
}

/** The last cell of an editable table row that can only be removed ("Remove spec requirement 2"). */
export function RemoveRowCell<T>(props: { rows: T[]; index: number; label: string; onChange: (rows: T[]) => void }) {
  return (
    <td>
      <button type="button" className="small danger" aria-label={`Remove ${props.label}`} onClick={() => props.onChange(removeAt(props.rows, props.index))}>
        Remove
      </button>
    </td>
  );
}
