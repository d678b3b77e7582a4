"use client";
import { useState } from "react";
import { api, byPath } from "./api";
import { ErrorSummary, TextField, errText } from "./fields";
import { PASSWORD_ADVICE } from "./passwordAdvice";

const LABELS: Record<string, string> = { currentPassword: "Current password", newPassword: "New password", repeat: "Repeat the new password" };
const sessions = (n: number) => (n === 1 ? "1 other session was" : `${n} other sessions were`);

/** Password change and "sign out my other sessions" for the signed-in member. */
export function AccountSettings() {
  const [current, setCurrent] = useState("");
  const [next, setNext] = useState("");
  const [repeat, setRepeat] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function changePassword(e: React.FormEvent) {
    e.preventDefault();
    setNotice(null);
    setProblem(null);
    if (next !== repeat) {
      setErrors({ repeat: ["does not match the new password"] });
      return;
    }
    setBusy(true);
    const r = await api<{ changed: boolean; endedSessions: number }>("/api/auth/password", "POST", { currentPassword: current, newPassword: next });
    setBusy(false);
    if (!r.ok) {
      setErrors(byPath(r.error.fieldErrors));
      if (!r.error.fieldErrors?.length) setProblem(r.status === 429 ? "Too many wrong passwords. Wait a minute and try again." : r.error.message);
      return;
    }
    setErrors({});
    setCurrent("");
    setNext("");
    setRepeat("");
    setNotice(`Password changed. ${sessions(r.data.endedSessions)} signed out; this one stays signed in.`);
  }

  async function signOutOthers() {
    setNotice(null);
    setProblem(null);
    setBusy(true);
    const r = await api<{ endedSessions: number }>("/api/auth/signout-others", "POST", {});
    setBusy(false);
    if (!r.ok) setProblem(r.error.message);
    else setNotice(`${sessions(r.data.endedSessions)} signed out; this one stays signed in.`.replace(/^./, (c) => c.toUpperCase()));
  }

  const messages = Object.entries(errors).flatMap(([p, ms]) => ms.map((m) => `${LABELS[p] ?? p}: ${m}`));
  return (
    <>
      <div aria-live="polite" role="status">
        {notice && (
          <p className="notice" data-testid="account-notice">
            {notice}
          </p>
        )}
        {problem && <p className="notice bad">{problem}</p>}
      </div>
      <form onSubmit={changePassword} noValidate className="panel narrow" aria-labelledby="pw-title">
        <h2 id="pw-title">Change password</h2>
        <ErrorSummary title={messages.length ? "Password not changed" : undefined} messages={messages} />
        <TextField label="Current password" type="password" name="currentPassword" autoComplete="current-password" value={current} onChange={setCurrent} error={errText(errors, "currentPassword")} required />
        <TextField
          label="New password"
          type="password"
          name="newPassword"
          autoComplete="new-password"
          hint="at least 10 characters"
          value={next}
          onChange={setNext}
          error={errText(errors, "newPassword")}
          required
        />
        <p className="hint">{PASSWORD_ADVICE}</p>
        <TextField label="Repeat the new password" type="password" name="repeat" autoComplete="new-password" value={repeat} onChange={setRepeat} error={errText(errors, "repeat")} required />
        <p className="sub">Changing the password signs out your other sessions (other browsers and devices).</p>
        <div className="toolbar">
          <button type="submit" className="primary" disabled={busy}>
            Change password
          </button>
        </div>
      </form>
      <section className="panel narrow" aria-labelledby="sessions-title">
        <h2 id="sessions-title">Sessions</h2>
        <p className="sub">Signed in somewhere you no longer use, or on a shared computer? End every session of your account except this one.</p>
        <div className="toolbar">
          <button type="button" onClick={signOutOthers} disabled={busy}>
            Sign out my other sessions
          </button>
        </div>
      </section>
    </>
  );
}
