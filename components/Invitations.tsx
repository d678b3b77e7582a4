"use client";
import { useEffect, useState } from "react";
import { ROLES, type Role } from "@/shared/schemas/roles";
import { api, byPath } from "./api";
import { ErrorSummary, NumberField, SelectField, TextField, errText } from "./fields";
import { utc } from "@/shared/format";

interface Invitation {
  id: string;
  email: string | null;
  role: Role;
  createdAt: string;
  expiresAt: string;
  state: "open" | "used" | "expired" | "revoked";
}

const LABELS: Record<string, string> = { email: "Email", role: "Role", expiresInDays: "Works for" };

/** Invitations: make one (the link is shown once), list them, revoke open ones. */
export function Invitations() {
  const [list, setList] = useState<Invitation[] | null>(null);
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<Role>("viewer");
  const [days, setDays] = useState("7");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [link, setLink] = useState<string | null>(null);
  const [problem, setProblem] = useState("");

  async function load() {
    const r = await api<{ invitations: Invitation[] }>("/api/invitations", "GET");
    if (r.ok) setList(r.data.invitations);
    else setProblem(r.error.message);
  }
  useEffect(() => {
    void load();
  }, []);

  async function create(e: React.FormEvent) {
    e.preventDefault();
    setProblem("");
    setLink(null);
    const n = Number(days);
    if (!/^\d+$/.test(days.trim()) || n < 1) {
      setErrors({ expiresInDays: ["must be a whole number of days, at least 1"] });
      return;
    }
    const r = await api<{ path: string }>("/api/invitations", "POST", { email: email.trim() || null, role, expiresInDays: n });
    if (!r.ok) {
      setErrors(byPath(r.error.fieldErrors));
      if (!r.error.fieldErrors?.length) setProblem(r.error.message);
      return;
    }
    setErrors({});
    setEmail("");
    setLink(new URL(r.data.path, window.location.origin).href);
    await load();
  }

  async function revoke(inv: Invitation) {
    setProblem("");
    const r = await api(`/api/invitations/${encodeURIComponent(inv.id)}`, "DELETE");
    if (!r.ok) setProblem(r.error.message);
    await load();
  }

  const messages = Object.entries(errors).flatMap(([p, ms]) => ms.map((m) => `${LABELS[p] ?? p}: ${m}`));
  return (
    <section className="panel" aria-labelledby="inv-title" data-testid="invitations">
      <h2 id="inv-title">Invitations</h2>
      <p className="sub">An invitation link creates one account with the role it names, at once, whatever the sign-up mode. Hand it on privately: anyone holding it can use it.</p>
      <form onSubmit={create} noValidate className="narrow">
        <ErrorSummary title={messages.length ? "Invitation not made" : undefined} messages={messages} />
        <TextField label="Email" type="email" name="email" hint="optional: only this address may use it" value={email} onChange={setEmail} error={errText(errors, "email")} />
        <SelectField label="Role" name="role" value={role} onChange={setRole} options={ROLES.map((r) => ({ value: r, label: r }))} error={errText(errors, "role")} />
        <NumberField label="Works for" name="expiresInDays" hint="1 to 90" unit="days" value={days} onChange={setDays} error={errText(errors, "expiresInDays")} />
        <div className="toolbar">
          <button type="submit" className="primary">
            Make invitation link
          </button>
        </div>
      </form>
      <div aria-live="polite" role="status">
        {link && (
          <div className="notice" data-testid="invitation-link">
            <label htmlFor="inv-link">Invitation link (shown once; copy it now)</label>
            <input id="inv-link" readOnly value={link} onFocus={(e) => e.target.select()} style={{ width: "100%" }} />
          </div>
        )}
        {problem && <p className="notice bad">{problem}</p>}
      </div>
      {list && list.length > 0 && (
        <div className="table-wrap">
          <table>
            <thead>
              <tr>
                <th scope="col">For</th>
                <th scope="col">Role</th>
                <th scope="col">Made</th>
                <th scope="col">Works until</th>
                <th scope="col">State</th>
                <th scope="col">
                  <span className="visually-hidden">Action</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {list.map((inv) => (
                <tr key={inv.id}>
                  <td>{inv.email ?? "anyone with the link"}</td>
                  <td>{inv.role}</td>
                  <td>{utc(inv.createdAt)}</td>
                  <td>{utc(inv.expiresAt)}</td>
                  <td>{inv.state}</td>
                  <td>
                    {inv.state === "open" && (
                      <button type="button" className="small" onClick={() => revoke(inv)} aria-label={`Revoke the invitation for ${inv.email ?? "anyone"} made ${utc(inv.createdAt)}`}>
                        Revoke
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
