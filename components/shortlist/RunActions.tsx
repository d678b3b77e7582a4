"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { api } from "../api";

/** "Re-pin to latest" and "Run again": POST, then reload the page (which shows the new run). */
export function RunAction({ shortlistId, kind, label }: { shortlistId: string; kind: "repin" | "runs"; label: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState("");
  return (
    <span className="run-action">
      <button
        type="button"
        className={kind === "repin" ? "primary" : undefined}
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          setProblem("");
          const r = await api<{ run: { id: string } }>(`/api/shortlists/${shortlistId}/${kind}`, "POST");
          setBusy(false);
          if (r.ok) router.push(`/shortlists/${shortlistId}`);
          else setProblem(r.error.message);
          router.refresh();
        }}
      >
        {busy ? "Working…" : label}
      </button>
      {problem && (
        <span role="alert" className="err">
          {" "}
          {problem}
        </span>
      )}
    </span>
  );
}

/** Opens the browser's print dialog (print stylesheet: a clean report). */
export function PrintButton() {
  return (
    <button type="button" onClick={() => window.print()}>
      Print / PDF
    </button>
  );
}
