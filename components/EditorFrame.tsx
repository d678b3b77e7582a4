"use client";
import Link from "next/link";
import { useId, type ReactNode } from "react";
import { ConflictPanel, KeptEdits } from "./ConflictPanel";
import { DeleteControl } from "./DeleteControl";
import { ErrorSummary } from "./fields";
import type { DocumentEditorState, DocumentKind } from "./useDocumentEditor";

/**
 * The frame of a document editor page: the form with its head (title, revision, history,
 * export, delete), the read-only and deleted notices, the conflict panel and kept edits, then the
 * caller's fields, the error summary and the sticky save bar.
 */
export function EditorFrame<Doc, Form>(props: {
  editor: DocumentEditorState<Doc, Form>;
  kind: Pick<DocumentKind<Doc, Form>, "api" | "page" | "what" | "restoreFrom">;
  /** More export links beside Export JSON (e.g. the arm's URDF), given the document id. */
  exports?: (id: string) => ReactNode;
  /** The document's name as typed, for the title. */
  name: string;
  /** The editor's own props: which document, who, which revision. */
  of: { id?: string; canWrite: boolean; viewingRevision?: number; deleted?: boolean; notices?: string[] };
  children: ReactNode;
}) {
  const uid = useId();
  const { editor: ed, name } = props;
  const { readOnly } = ed;
  const { id, canWrite, viewingRevision, deleted } = props.of;
  const { api, page, what } = props.kind;
  const title = viewingRevision !== undefined ? `${name} · revision ${viewingRevision}` : id ? name || what.charAt(0).toUpperCase() + what.slice(1) : `New ${what}`;
  return (
    <form
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (!readOnly) void ed.save();
      }}
      aria-labelledby={uid + "-title"}
    >
      <div className="page-head">
        <h1 id={uid + "-title"}>{title}</h1>
        {id && ed.baseRevision !== undefined && viewingRevision === undefined && <span className="sub">revision {ed.baseRevision}</span>}
        <div className="actions no-print">
          {id && (
            <>
              <Link href={`${page}/${id}/history`}>History</Link>
              <a className="button" href={`${api}/${id}/export`} download>
                Export JSON
              </a>
              {props.exports?.(id)}
            </>
          )}
          {id && canWrite && viewingRevision === undefined && !deleted && <DeleteControl url={`${api}/${id}`} what={what} afterHref={page} />}
        </div>
      </div>
      {props.of.notices?.map((n, i) => (
        <p key={i} className="notice warn" data-testid="document-notice">
          {n}
        </p>
      ))}
      {viewingRevision !== undefined && (
        <p className="notice">
          A past revision, read-only. <Link href={`${page}/${id}`}>Open the latest revision</Link>.
        </p>
      )}
      {deleted && (
        <p className="notice warn">
          This {what} is deleted. Restore it from the {props.kind.restoreFrom} to edit it.
        </p>
      )}
      {!canWrite && viewingRevision === undefined && (
        <p className="notice" data-testid="read-only-note">
          Read-only: your role is viewer. An administrator can make you an editor.
        </p>
      )}
      {ed.conflict && (
        <ConflictPanel
          what={what}
          byName={ed.conflict.byName}
          baseRevision={ed.conflict.baseRevision}
          currentRevision={ed.conflict.currentRevision}
          rows={ed.conflict.rows}
          onKeep={() => ed.loadLatest(true)}
          onDiscard={() => ed.loadLatest(false)}
        />
      )}
      {ed.kept && <KeptEdits rows={ed.kept.rows} json={ed.kept.json} onDismiss={ed.dismissKept} />}

      {props.children}

      <ErrorSummary messages={ed.summary} />
      {!readOnly && (
        <div className="save-bar">
          <button type="submit" className="primary" disabled={ed.busy}>
            {ed.busy ? "Saving…" : id ? "Save new revision" : `Create ${what}`}
          </button>
          <span aria-live="polite" role="status" className="ok" data-testid="save-status">
            {ed.saved}
          </span>
          <span className="err" aria-live="assertive">
            {ed.message}
          </span>
        </div>
      )}
    </form>
  );
}
