"use client";
import { useCallback, useEffect, useMemo, useState } from "react";
import { api } from "@/components/api";
import type { AnchorOption } from "@/lib/views/anchors";
import "./discussion.css";
import { utc } from "@/shared/format";

export type { AnchorOption };

type DiscussionMode =
  | { kind: "member"; shortlistId: string; userId: string; canWrite: boolean; canResolve: boolean; canModerate: boolean }
  | { kind: "guest"; token: string; canWrite: boolean };

type Author = { kind: "member"; id: string; name: string } | { kind: "guest"; name: string } | { kind: "unknown" };
interface CommentView {
  id: string;
  parentId: string | null;
  anchor: { type: AnchorOption["type"]; id: string | null };
  author: Author;
  body: string;
  /** Sanitised on the server (lib/markdown): the only HTML this panel inserts. */
  html: string;
  /** Set when the server could not render the body; shown instead of it. */
  renderError?: string | null;
  revision: number;
  createdAt: string;
  editedAt: string | null;
  deletedAt: string | null;
  resolvedAt: string | null;
  resolvedBy: { id: string; name: string } | null;
}
interface Thread extends CommentView {
  replies: CommentView[];
}
interface Revision {
  revision: number;
  body: string;
  createdAt: string;
  editor: { id: string; name: string } | null;
  editorLabel: string | null;
}

const anchorKey = (a: { type: string; id: string | null }) => `${a.type}:${a.id ?? ""}`;
const when = (iso: string) => utc(iso);
const newKey = () => (typeof crypto !== "undefined" && "randomUUID" in crypto ? crypto.randomUUID() : `${Date.now()}-${Math.random().toString(36).slice(2)}`);

function authorName(a: Author): string {
  if (a.kind === "member") return a.name;
  if (a.kind === "guest") return `${a.name} (guest)`;
  return "former member";
}

/**
 * The discussion of a shortlist: threads anchored to the shortlist, an arm, a target, a path or
 * a compliance row; replies; edit and delete of one's own comments (with the edit history);
 * resolve and reopen; mentions with @handle. Members and comment-link guests use the same panel.
 */
export function DiscussionPanel({ mode, anchors }: { mode: DiscussionMode; anchors: AnchorOption[] }) {
  const base = mode.kind === "member" ? `/api/shortlists/${encodeURIComponent(mode.shortlistId)}/comments` : `/api/share/${encodeURIComponent(mode.token)}/comments`;
  const [threads, setThreads] = useState<Thread[] | null>(null);
  const [unread, setUnread] = useState<{ unread: number; mentions: number } | null>(null);
  const [members, setMembers] = useState<{ name: string; handle: string }[]>([]);
  const [error, setError] = useState<string | null>(null);
  const [filter, setFilter] = useState<string>("all");
  const [showResolved, setShowResolved] = useState(false);

  const labels = useMemo(() => new Map(anchors.map((a) => [anchorKey(a), a.label])), [anchors]);

  const load = useCallback(async () => {
    const r = await api<{ threads: Thread[]; unread?: { unread: number; mentions: number }; members?: { name: string; handle: string }[] }>(base, "GET");
    if (!r.ok) {
      setError(r.error.message);
      return;
    }
    setError(null);
    setThreads(r.data.threads);
    if (r.data.unread) setUnread(r.data.unread);
    if (r.data.members) setMembers(r.data.members);
    if (mode.kind === "member") await api(`${base}/read`, "POST");
  }, [base, mode.kind]);

  useEffect(() => {
    void load();
  }, [load]);

  const visible = (threads ?? []).filter((t) => (filter === "all" || anchorKey(t.anchor) === filter) && (showResolved || !t.resolvedAt));
  const resolvedCount = (threads ?? []).filter((t) => t.resolvedAt).length;

  return (
    <section className="panel discussion" aria-labelledby="discussion-h" data-testid="discussion">
      <div className="discussion-head">
        <h2 id="discussion-h">Discussion</h2>
        {unread && (unread.unread > 0 || unread.mentions > 0) && (
          <span className="unread" data-testid="unread">
            {unread.unread} new since your last visit{unread.mentions > 0 ? `, ${unread.mentions} mentioning you` : ""}
          </span>
        )}
      </div>
      <div className="toolbar">
        <label>
          Show{" "}
          <select value={filter} onChange={(e) => setFilter(e.target.value)} aria-label="Show comments about">
            <option value="all">everything</option>
            {anchors.map((a) => (
              <option key={anchorKey(a)} value={anchorKey(a)}>
                {a.label}
              </option>
            ))}
          </select>
        </label>
        {resolvedCount > 0 && (
          <label>
            <input type="checkbox" checked={showResolved} onChange={(e) => setShowResolved(e.target.checked)} /> resolved threads ({resolvedCount})
          </label>
        )}
      </div>
      {error && (
        <p className="notice bad" role="alert">
          {error}
        </p>
      )}
      {threads === null && !error && <p className="sub">Loading the discussion…</p>}
      {threads && visible.length === 0 && <p className="sub">No comments here yet.</p>}
      <ol className="threads">
        {visible.map((t) => (
          <li key={t.id} className={`thread${t.resolvedAt ? " resolved" : ""}`} data-testid="thread">
            <div className="anchor-tag">{labels.get(anchorKey(t.anchor)) ?? `${t.anchor.type} ${t.anchor.id ?? ""}`}</div>
            <CommentItem c={t} mode={mode} base={base} onChange={load} isRoot thread={t} />
            {t.replies.map((r) => (
              <CommentItem key={r.id} c={r} mode={mode} base={base} onChange={load} />
            ))}
            {mode.canWrite && !t.resolvedAt && <Composer mode={mode} base={base} parentId={t.id} onPosted={load} compact />}
          </li>
        ))}
      </ol>
      {mode.canWrite && <Composer mode={mode} base={base} anchors={anchors} onPosted={load} members={members} />}
      {!mode.canWrite && <p className="sub">You can read this discussion but not write in it.</p>}
    </section>
  );
}

function CommentItem({ c, mode, base, onChange, isRoot, thread }: { c: CommentView; mode: DiscussionMode; base: string; onChange: () => Promise<void>; isRoot?: boolean; thread?: Thread }) {
  const [editing, setEditing] = useState(false);
  const [draft, setDraft] = useState(c.body);
  const [history, setHistory] = useState<Revision[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const own = mode.kind === "member" && c.author.kind === "member" && c.author.id === mode.userId;
  const canDelete = mode.kind === "member" && (own || mode.canModerate);

  if (c.deletedAt) {
    return (
      <div className="comment deleted" data-testid="comment">
        <em>Comment deleted.</em>
      </div>
    );
  }
  const act = async (path: string, method: string, body?: unknown) => {
    const r = await api(`${base}/${encodeURIComponent(c.id)}${path}`, method, body);
    if (!r.ok) setError(r.error.message);
    else {
      setError(null);
      setEditing(false);
      await onChange();
    }
  };
  const showHistory = async () => {
    const r = await api<{ revisions: Revision[] }>(`${base}/${encodeURIComponent(c.id)}/revisions`, "GET");
    if (r.ok) setHistory(r.data.revisions);
    else setError(r.error.message);
  };

  return (
    <article className="comment" data-testid="comment">
      <header>
        <strong className="author" data-testid="comment-author">{authorName(c.author)}</strong>{" "}
        <span className="sub">
          {when(c.createdAt)}
          {c.editedAt && (
            <>
              {" · "}
              {mode.kind === "member" ? (
                <button type="button" className="linkish" onClick={showHistory}>
                  edited (revision {c.revision})
                </button>
              ) : (
                "edited"
              )}
            </>
          )}
        </span>
        {isRoot && thread?.resolvedAt && <span className="resolved-tag">resolved{thread.resolvedBy ? ` by ${thread.resolvedBy.name}` : ""}</span>}
      </header>
      {editing ? (
        <form
          onSubmit={(e) => {
            e.preventDefault();
            void act("", "PATCH", { body: draft, baseRevision: c.revision });
          }}
        >
          <label className="visually-hidden" htmlFor={`edit-${c.id}`}>
            Edit comment
          </label>
          <textarea id={`edit-${c.id}`} value={draft} onChange={(e) => setDraft(e.target.value)} rows={3} maxLength={5000} />
          <div className="row-actions">
            <button type="submit">Save edit</button>
            <button type="button" onClick={() => setEditing(false)}>
              Cancel
            </button>
          </div>
        </form>
      ) : c.renderError ? (
        <p className="comment-body unrenderable" data-testid="comment-body" role="note">
          <em>{c.renderError[0].toUpperCase() + c.renderError.slice(1)}.</em>
        </p>
      ) : (
        <div className="comment-body" data-testid="comment-body" dangerouslySetInnerHTML={{ __html: c.html }} />
      )}
      {mode.kind === "member" && !editing && (
        <div className="row-actions">
          {own && (
            <button type="button" onClick={() => { setDraft(c.body); setEditing(true); }}>
              Edit
            </button>
          )}
          {canDelete && (
            <button type="button" onClick={() => { if (window.confirm("Delete this comment? Its text stays in the audit trail.")) void act("", "DELETE"); }}>
              Delete
            </button>
          )}
          {isRoot && mode.canResolve && (
            <button type="button" onClick={() => void act("/resolve", "POST", { resolved: !thread?.resolvedAt })}>
              {thread?.resolvedAt ? "Reopen" : "Resolve"}
            </button>
          )}
        </div>
      )}
      {history && (
        <details open className="history">
          <summary>Edit history</summary>
          <ol>
            {history.map((h) => (
              <li key={h.revision}>
                <span className="sub">
                  revision {h.revision}, {when(h.createdAt)}
                  {h.editor ? ` by ${h.editor.name}` : h.editorLabel ? ` by ${h.editorLabel}` : ""}
                </span>
                <pre className="history-body">{h.body}</pre>
              </li>
            ))}
          </ol>
        </details>
      )}
      {error && (
        <p className="err" role="alert">
          {error}
        </p>
      )}
    </article>
  );
}

function Composer({ mode, base, anchors, parentId, onPosted, compact, members }: {
  mode: DiscussionMode; base: string; anchors?: AnchorOption[]; parentId?: string; onPosted: () => Promise<void>; compact?: boolean; members?: { name: string; handle: string }[];
}) {
  const [body, setBody] = useState("");
  const [name, setName] = useState("");
  const [anchor, setAnchor] = useState(anchors?.[0] ? anchorKey(anchors[0]) : "shortlist:");
  const [key, setKey] = useState(newKey);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [open, setOpen] = useState(!compact);
  const idBase = parentId ? `reply-${parentId}` : "new-comment";

  if (!open) {
    return (
      <button type="button" className="reply-open" onClick={() => setOpen(true)}>
        Reply
      </button>
    );
  }
  const submit = async () => {
    setBusy(true);
    const chosen = anchors?.find((a) => anchorKey(a) === anchor);
    const payload: Record<string, unknown> = { body, clientKey: key };
    if (parentId) payload.parentId = parentId;
    else if (chosen) payload.anchor = { type: chosen.type, id: chosen.id };
    if (mode.kind === "guest") payload.name = name;
    const r = await api(base, "POST", payload);
    setBusy(false);
    if (!r.ok) {
      setError(r.error.fieldErrors?.map((f) => `${f.path || "comment"}: ${f.message}`).join("; ") || r.error.message);
      return;
    }
    setError(null);
    setBody("");
    setKey(newKey());
    if (compact) setOpen(false);
    await onPosted();
  };
  return (
    <form
      className={`composer${compact ? " compact" : ""}`}
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      {!parentId && <h3>New comment</h3>}
      {mode.kind === "guest" && (
        <div className="field">
          <label htmlFor={`${idBase}-name`}>Your name (shown with the comment)</label>
          <input id={`${idBase}-name`} value={name} onChange={(e) => setName(e.target.value)} maxLength={60} required autoComplete="name" />
        </div>
      )}
      {!parentId && anchors && (
        <div className="field">
          <label htmlFor={`${idBase}-anchor`}>About</label>
          <select id={`${idBase}-anchor`} value={anchor} onChange={(e) => setAnchor(e.target.value)}>
            {anchors.map((a) => (
              <option key={anchorKey(a)} value={anchorKey(a)}>
                {a.label}
              </option>
            ))}
          </select>
        </div>
      )}
      <div className="field">
        <label htmlFor={`${idBase}-body`}>{parentId ? "Reply" : "Comment"}</label>
        <textarea id={`${idBase}-body`} value={body} onChange={(e) => setBody(e.target.value)} rows={compact ? 2 : 4} maxLength={5000} required />
        <span className="hint">
          Markdown: **bold**, *italic*, `code`, lists, [links](https://…). No HTML or images.
          {members && members.length > 0 && <> Mention a member with @handle: {members.slice(0, 12).map((m) => `@${m.handle}`).join(", ")}.</>}
        </span>
      </div>
      {error && (
        <p className="err" role="alert">
          {error}
        </p>
      )}
      <div className="row-actions">
        <button type="submit" disabled={busy || body.trim() === ""}>
          {parentId ? "Post reply" : "Post comment"}
        </button>
        {compact && (
          <button type="button" onClick={() => setOpen(false)}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}
