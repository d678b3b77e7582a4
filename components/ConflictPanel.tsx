"use client";

export interface ConflictRow {
  path: string;
  label: string;
  base: string;
  current: string;
  mine: string;
}

/**
 * Shown when a save answers 409: someone saved a newer revision since this page was opened.
 * Lists what they changed and offers to continue on top of their version or to discard.
 */
export function ConflictPanel(props: {
  what: string;
  byName: string | null;
  currentRevision: number;
  baseRevision: number;
  rows: ConflictRow[];
  onKeep: () => void;
  onDiscard: () => void;
}) {
  return (
    <section className="notice warn" role="alert" aria-labelledby="conflict-title" data-testid="conflict-panel">
      <h2 id="conflict-title">
        This {props.what} was changed by {props.byName ?? "another user"} (revision {props.currentRevision}) since you opened it
      </h2>
      <p>
        You started from revision {props.baseRevision}. Nothing of yours was saved. What they changed:
      </p>
      {props.rows.length === 0 ? (
        <p className="empty">No field differs from the revision you started from.</p>
      ) : (
        <div className="table-wrap">
          <table>
            <thead>
              <tr>
                <th scope="col">Field</th>
                <th scope="col">You started from</th>
                <th scope="col">Their value</th>
                <th scope="col">Your value</th>
              </tr>
            </thead>
            <tbody>
              {props.rows.map((r) => (
                <tr key={r.path}>
                  <td>
                    {r.label} <span className="sub mono">{r.path}</span>
                  </td>
                  <td>{r.base}</td>
                  <td>
                    <strong>{r.current}</strong>
                  </td>
                  <td>{r.mine}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="toolbar">
        <button type="button" className="primary" onClick={props.onKeep}>
          Keep editing on top of the latest
        </button>
        <button type="button" onClick={props.onDiscard}>
          Discard my edits
        </button>
      </div>
      <p className="hint">
        “Keep editing” loads revision {props.currentRevision} into the form and keeps your edits visible below for copying.
      </p>
    </section>
  );
}

/** Your edits from before a conflict reload, kept for copying. */
export function KeptEdits(props: { rows: { label: string; path: string; mine: string }[]; json: string; onDismiss: () => void }) {
  return (
    <section className="notice" aria-labelledby="kept-title" data-testid="kept-edits">
      <h2 id="kept-title">Your unsaved edits (for copying)</h2>
      <p>The form now shows the latest revision. Re-enter what you still want, then save.</p>
      {props.rows.length > 0 && (
        <ul>
          {props.rows.map((r) => (
            <li key={r.path}>
              {r.label}: <strong>{r.mine}</strong>
            </li>
          ))}
        </ul>
      )}
      <details>
        <summary>Your whole version as JSON (SI units)</summary>
        <label className="visually-hidden" htmlFor="kept-json">
          Your version as JSON
        </label>
        <textarea id="kept-json" readOnly rows={10} value={props.json} />
      </details>
      <div className="toolbar">
        <button type="button" onClick={props.onDismiss}>
          Dismiss
        </button>
      </div>
    </section>
  );
}

/** Value at a dotted path of a JSON document. */
export function valueAt(doc: unknown, path: string): unknown {
  let cur: unknown = doc;
  for (const p of path.split(".")) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string, unknown>)[p];
  }
  return cur;
}

/**
 * The changed paths that differ between two versions, compared leaf by leaf; used when the
 * server's list is coarse (whole arrays) or to find what this page changed.
 */
export function diffPaths(a: unknown, b: unknown, prefix = ""): string[] {
  if (JSON.stringify(a) === JSON.stringify(b)) return [];
  const isObj = (v: unknown) => v !== null && typeof v === "object";
  const isNumArray = (v: unknown) => Array.isArray(v) && v.every((x) => typeof x === "number");
  if (isObj(a) && isObj(b) && !isNumArray(a) && !isNumArray(b) && Array.isArray(a) === Array.isArray(b)) {
    const keys = new Set([...Object.keys(a as object), ...Object.keys(b as object)]);
    return [...keys].flatMap((k) => diffPaths((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], prefix ? `${prefix}.${k}` : k));
  }
  return [prefix];
}
