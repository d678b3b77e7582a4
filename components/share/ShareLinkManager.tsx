"use client";
import { useCallback, useEffect, useState } from "react";
import { api } from "@/components/api";
import "@/components/discussion/discussion.css";
import { utcDate } from "@/shared/format";

interface LinkView {
  id: string;
  access: "view" | "comment";
  label: string | null;
  hidePrices: boolean;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  expiresAt: string | null;
  revokedAt: string | null;
  state: "active" | "expired" | "revoked";
}

const day = (iso: string | null) => utcDate(iso, "never");

/**
 * Share links of a shortlist: make a view or comment link (optional expiry, hide prices), see the
 * address once, revoke at once. Editors see and revoke the links they made; admins all links.
 */
export function ShareLinkManager({ shortlistId, userId, canRevokeAll }: { shortlistId: string; userId: string; canRevokeAll: boolean }) {
  const base = `/api/shortlists/${encodeURIComponent(shortlistId)}/links`;
  const [links, setLinks] = useState<LinkView[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [access, setAccess] = useState<"view" | "comment">("view");
  const [days, setDays] = useState("30");
  const [hidePrices, setHidePrices] = useState(true);
  const [label, setLabel] = useState("");
  const [made, setMade] = useState<string | null>(null);

  const load = useCallback(async () => {
    const r = await api<{ links: LinkView[] }>(base, "GET");
    if (r.ok) setLinks(r.data.links);
    else setError(r.error.message);
  }, [base]);
  useEffect(() => {
    void load();
  }, [load]);

  const create = async () => {
    const expiresInDays = days.trim() === "" ? null : Number(days);
    const r = await api<{ path: string }>(base, "POST", { access, expiresInDays, hidePrices, label: label || undefined });
    if (!r.ok) {
      setError(r.error.fieldErrors?.map((f) => `${f.path}: ${f.message}`).join("; ") || r.error.message);
      return;
    }
    setError(null);
    setMade(`${window.location.origin}${r.data.path}`);
    setLabel("");
    await load();
  };
  const revoke = async (id: string) => {
    const r = await api(`${base}/${encodeURIComponent(id)}`, "DELETE");
    if (!r.ok) setError(r.error.message);
    await load();
  };

  return (
    <section className="panel share-links no-print" aria-labelledby="share-h" data-testid="share-links">
      <h2 id="share-h">Share links</h2>
      <p className="sub">
        A link lets someone without an account see this shortlist (and, for a comment link, write in its discussion under a name they give). Anyone holding the
        address can use it until it expires or is revoked.
      </p>
      <form
        className="toolbar"
        onSubmit={(e) => {
          e.preventDefault();
          void create();
        }}
      >
        <label>
          Access{" "}
          <select value={access} onChange={(e) => setAccess(e.target.value as "view" | "comment")}>
            <option value="view">view only</option>
            <option value="comment">view and comment</option>
          </select>
        </label>
        <label>
          Expires after (days, empty = never){" "}
          <input type="number" min={1} max={366} value={days} onChange={(e) => setDays(e.target.value)} style={{ width: "5em" }} />
        </label>
        <label>
          <input type="checkbox" checked={hidePrices} onChange={(e) => setHidePrices(e.target.checked)} /> hide prices from guests
        </label>
        <label>
          Label <input value={label} onChange={(e) => setLabel(e.target.value)} maxLength={80} placeholder="e.g. integrator review" />
        </label>
        <button type="submit">Make link</button>
      </form>
      {made && (
        <div className="new-token" role="status" data-testid="new-link">
          <strong>New link</strong> (shown once; copy it now): <code>{made}</code>{" "}
          <button type="button" onClick={() => void navigator.clipboard?.writeText(made)}>
            Copy
          </button>
        </div>
      )}
      {error && (
        <p className="err" role="alert">
          {error}
        </p>
      )}
      {links && links.length === 0 && <p className="sub">{canRevokeAll ? "No links yet." : "You have made no links for this shortlist."}</p>}
      {links && links.length > 0 && (
        <table>
          <thead>
            <tr>
              <th>Label</th>
              <th>Access</th>
              <th>Prices</th>
              <th>Made</th>
              <th>Expires</th>
              <th>State</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {links.map((l) => (
              <tr key={l.id} data-testid="link-row">
                <td>{l.label ?? "—"}</td>
                <td>{l.access}</td>
                <td>{l.hidePrices ? "hidden" : "shown"}</td>
                <td>
                  {day(l.createdAt)}
                  {l.createdBy ? ` by ${l.createdBy.name}` : ""}
                </td>
                <td>{day(l.expiresAt)}</td>
                <td>{l.state}</td>
                <td>
                  {l.state === "active" && (canRevokeAll || l.createdBy?.id === userId) && (
                    <button type="button" onClick={() => void revoke(l.id)}>
                      Revoke
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
