"use client";
import { useState } from "react";
import { api } from "./api";

/** Delete (soft) with an inline confirmation; deleted items can be restored from the list. */
export function DeleteControl({ url, what, afterHref }: { url: string; what: string; afterHref: string }) {
  const [asking, setAsking] = useState(false);
  const [problem, setProblem] = useState("");
  async function confirmDelete() {
    const r = await api(url, "DELETE");
    if (r.ok) window.location.assign(afterHref);
    else setProblem(r.error.message);
  }
  return (
    <span className="toolbar" style={{ margin: 0 }}>
      {!asking ? (
        <button type="button" className="danger" onClick={() => setAsking(true)}>
          Delete…
        </button>
      ) : (
        <span role="group" aria-label={`Confirm deleting this ${what}`} className="toolbar" style={{ margin: 0 }}>
          <span>Delete this {what}? It can be restored from the list.</span>
          <button type="button" className="danger solid" onClick={confirmDelete} autoFocus>
            Yes, delete
          </button>
          <button type="button" onClick={() => setAsking(false)}>
            Cancel
          </button>
        </span>
      )}
      <span aria-live="polite" className="err">
        {problem}
      </span>
    </span>
  );
}
