"use client";
import { useEffect, useState } from "react";
import { api } from "./api";

interface User {
  id: string;
  email: string;
  name: string;
  role: "admin" | "editor" | "viewer";
  status: "active" | "pending" | "refused";
}
const STATUS_WORDS: Record<User["status"], string> = { active: "active", pending: "waits for approval", refused: "refused" };
const ROLES = ["admin", "editor", "viewer"] as const;

/**
 * Lists accounts and lets an administrator change their role and approve or refuse accounts that
 * wait for approval (the server checks it too).
 */
export function UserRoles({ currentUserId }: { currentUserId: string }) {
  const [users, setUsers] = useState<User[] | null>(null);
  const [status, setStatus] = useState<string>("");
  const [problem, setProblem] = useState<string>("");

  useEffect(() => {
    let live = true;
    api<{ users: User[] }>("/api/users", "GET").then((r) => {
      if (!live) return;
      if (r.ok) setUsers(r.data.users);
      else setProblem(r.error.message);
    });
    return () => {
      live = false;
    };
  }, []);

  async function changeRole(u: User, role: User["role"]) {
    setStatus("");
    setProblem("");
    const r = await api<{ user: User }>(`/api/users/${encodeURIComponent(u.id)}`, "PATCH", { role });
    if (r.ok) {
      setUsers((list) => list?.map((x) => (x.id === u.id ? { ...x, role } : x)) ?? null);
      setStatus(`${u.name} is now ${role}.`);
    } else {
      setProblem(`${u.name}: ${r.error.fieldErrors?.map((f) => f.message).join("; ") || r.error.message}`);
    }
  }

  async function decide(u: User, decision: "approve" | "refuse") {
    setStatus("");
    setProblem("");
    const r = await api<{ user: User }>(`/api/users/${encodeURIComponent(u.id)}/approval`, "POST", { decision });
    if (r.ok) {
      setUsers((list) => list?.map((x) => (x.id === u.id ? { ...x, status: r.data.user.status } : x)) ?? null);
      setStatus(decision === "approve" ? `${u.name} can sign in now.` : `${u.name} was refused and cannot sign in.`);
    } else {
      setProblem(`${u.name}: ${r.error.fieldErrors?.map((f) => f.message).join("; ") || r.error.message}`);
    }
  }

  const waiting = users?.filter((u) => u.status === "pending").length ?? 0;
  return (
    <>
      {waiting > 0 && (
        <p className="notice warn" data-testid="pending-count">
          {waiting === 1 ? "1 account waits" : `${waiting} accounts wait`} for your approval.
        </p>
      )}
      <div aria-live="polite" role="status">
        {status && <p className="notice">{status}</p>}
        {problem && <p className="notice bad">{problem}</p>}
      </div>
      {users === null ? (
        !problem && <p className="sub">Loading accounts…</p>
      ) : (
        <div className="table-wrap">
          <table>
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Email</th>
                <th scope="col">Role</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {users.map((u) => (
                <tr key={u.id}>
                  <td>
                    {u.name}
                    {u.id === currentUserId && <span className="sub"> (you)</span>}
                  </td>
                  <td>{u.email}</td>
                  <td>
                    <label className="visually-hidden" htmlFor={`role-${u.id}`}>
                      Role of {u.name}
                    </label>
                    <select id={`role-${u.id}`} value={u.role} onChange={(e) => changeRole(u, e.target.value as User["role"])}>
                      {ROLES.map((r) => (
                        <option key={r} value={r}>
                          {r}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td data-testid={`status-${u.email}`}>
                    {STATUS_WORDS[u.status]}
                    {u.status !== "active" && (
                      <span className="row-actions">
                        <button type="button" className="small" onClick={() => decide(u, "approve")} aria-label={`Approve ${u.name}`}>
                          Approve
                        </button>
                        {u.status === "pending" && (
                          <button type="button" className="small" onClick={() => decide(u, "refuse")} aria-label={`Refuse ${u.name}`}>
                            Refuse
                          </button>
                        )}
                      </span>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <p className="sub">
        Viewers read arms and requirement sets; editors also create and change them; administrators also manage accounts.
      </p>
    </>
  );
}
