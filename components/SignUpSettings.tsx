"use client";
import { useEffect, useState } from "react";
import { SIGN_UP_MODES, type SignUpMode } from "@/shared/schemas/roles";
import { api } from "./api";

const MODE_TEXT: Record<SignUpMode, { label: string; help: string }> = {
  open: { label: "Open", help: "anyone who can reach the server gets a viewer account at once and reads every arm, price, shortlist and discussion" },
  approval: { label: "Approval required", help: "new accounts wait until an administrator approves them on this page (the default)" },
  invitation: { label: "Invitation only", help: "only someone with an invitation link made below can create an account" },
};

/** The sign-up mode: a radio group saved at once. */
export function SignUpSettings() {
  const [mode, setMode] = useState<SignUpMode | null>(null);
  const [status, setStatus] = useState("");
  const [problem, setProblem] = useState("");

  useEffect(() => {
    let live = true;
    api<{ mode: SignUpMode }>("/api/settings/sign-up", "GET").then((r) => {
      if (!live) return;
      if (r.ok) setMode(r.data.mode);
      else setProblem(r.error.message);
    });
    return () => {
      live = false;
    };
  }, []);

  async function choose(next: SignUpMode) {
    const before = mode;
    setMode(next);
    setStatus("");
    setProblem("");
    const r = await api<{ mode: SignUpMode }>("/api/settings/sign-up", "PUT", { mode: next });
    if (r.ok) {
      setMode(r.data.mode);
      setStatus(`Sign-up is now: ${MODE_TEXT[r.data.mode].label.toLowerCase()}.`);
    } else {
      setMode(before);
      setProblem(`Not changed: ${r.error.fieldErrors?.map((f) => f.message).join("; ") || r.error.message}`);
    }
  }

  return (
    <fieldset className="panel" data-testid="signup-settings">
      <legend>Who can create an account</legend>
      {mode === null ? (
        !problem && <p className="sub">Loading…</p>
      ) : (
        SIGN_UP_MODES.map((m) => (
          <div key={m} className="radio-row">
            <input type="radio" id={`signup-${m}`} name="signUpMode" value={m} checked={mode === m} onChange={() => choose(m)} />
            <label htmlFor={`signup-${m}`}>
              <strong>{MODE_TEXT[m].label}</strong> <span className="hint">({MODE_TEXT[m].help})</span>
            </label>
          </div>
        ))
      )}
      <div aria-live="polite" role="status">
        {status && <p className="notice">{status}</p>}
        {problem && <p className="notice bad">{problem}</p>}
      </div>
    </fieldset>
  );
}
