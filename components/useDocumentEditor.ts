"use client";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import type { FieldError } from "@/shared/schemas";
import { api, byPath } from "./api";
import { diffPaths, valueAt, type ConflictRow } from "./ConflictPanel";
import { describeError } from "./formDoc";

/** How one kind of versioned document (arm, requirement set) is edited and saved. */
export interface DocumentKind<Doc, Form> {
  /** API collection, e.g. "/api/arms": POST creates, PUT `${api}/${id}` saves a revision. */
  api: string;
  /** Page collection, e.g. "/arms". */
  page: string;
  /** Key of the document in the PUT body and in the save answer ("arm", "requirementSet"). */
  bodyKey: string;
  /** Singular noun ("arm", "requirement set"): the page says "New arm", "Create arm". */
  what: string;
  /** Plural noun for the role message ("arms", "requirement sets"). */
  plural: string;
  /** Where a deleted one is restored from ("catalog", "list"). */
  restoreFrom: string;
  fromDoc: (doc: Doc) => Form;
  empty: () => Form;
  validate: (form: Form) => { doc: Doc; errors: FieldError[] };
  pathLabel: (path: string) => string;
  /** Maps a changed leaf path to the path shown (a transform as one pose, not 16 cells). */
  groupPath: (path: string) => string;
  formatValue: (path: string, value: unknown, doc: Doc | undefined) => string;
}

interface EditorConflict<Doc> {
  byName: string | null;
  baseRevision: number;
  currentRevision: number;
  current: Doc;
  rows: ConflictRow[];
  mine: Doc;
}

interface KeptEditsState {
  rows: { label: string; path: string; mine: string }[];
  json: string;
}

/**
 * Form state and saving of a versioned document: client validation first, then create (POST) or
 * save on top of `baseRevision` (PUT); a 409 answer becomes a conflict listing what the other
 * user changed, with a reload that can keep this user's edits for copying; field errors from
 * either side are mapped to their paths.
 */
export function useDocumentEditor<Doc, Form>(
  kind: DocumentKind<Doc, Form>,
  props: { id?: string; revision?: number; initial?: Doc; created?: boolean; canWrite: boolean; viewingRevision?: number; deleted?: boolean },
) {
  const readOnly = !props.canWrite || props.viewingRevision !== undefined || props.deleted === true;
  const router = useRouter();
  const [form, setForm] = useState<Form>(() => (props.initial ? kind.fromDoc(props.initial) : kind.empty()));
  const [startDoc, setStartDoc] = useState<Doc | undefined>(props.initial);
  const [baseRevision, setBaseRevision] = useState<number | undefined>(props.revision);
  const [errors, setErrors] = useState<FieldError[]>([]);
  const [message, setMessage] = useState("");
  const [saved, setSaved] = useState(props.created ? "Created as revision 1." : "");
  const [busy, setBusy] = useState(false);
  const [conflict, setConflict] = useState<EditorConflict<Doc> | null>(null);
  const [kept, setKept] = useState<KeptEditsState | null>(null);

  const errMap = useMemo(() => byPath(errors), [errors]);
  const summary = errors.map((e) => describeError(e, kind.pathLabel));
  /** Applies a form change; a structural one (rows added, removed, moved) clears the field errors. */
  const update = (patch: Partial<Form>, structural?: boolean) => {
    setForm((f) => ({ ...f, ...patch }));
    setSaved("");
    if (structural) setErrors([]);
  };

  async function save() {
    setSaved("");
    setMessage("");
    const { doc, errors: clientErrors } = kind.validate(form);
    if (clientErrors.length) {
      setErrors(clientErrors);
      setMessage(`Not saved: ${clientErrors.length === 1 ? "1 problem" : `${clientErrors.length} problems`}, marked at the fields and listed above this bar.`);
      return;
    }
    setBusy(true);
    type Ok = { id: string; revision: number } & Record<string, unknown>;
    const res = props.id ? await api<Ok>(`${kind.api}/${props.id}`, "PUT", { baseRevision, [kind.bodyKey]: doc }) : await api<Ok>(kind.api, "POST", doc);
    setBusy(false);
    if (res.ok) {
      setErrors([]);
      if (!props.id) {
        router.push(`${kind.page}/${res.data.id}?created=1`);
        return;
      }
      const savedDoc = res.data[kind.bodyKey] as Doc;
      setBaseRevision(res.data.revision);
      setStartDoc(savedDoc);
      setForm(kind.fromDoc(savedDoc));
      setSaved(`Saved as revision ${res.data.revision}.`);
      return;
    }
    if (res.status === 409 && res.error.conflict) {
      const c = res.error.conflict;
      const current = c.current as Doc;
      let byName: string | null = null;
      const revs = await api<{ revisions: { revision: number; author: { name: string } | null }[] }>(`${kind.api}/${props.id}/revisions`, "GET");
      if (revs.ok) byName = revs.data.revisions.find((r) => r.revision === c.currentRevision)?.author?.name ?? null;
      // Leaf paths: group whole-transform changes the server may report entry by entry.
      const paths = [...new Set(c.changes.map((ch) => kind.groupPath(ch.path)))];
      const rows: ConflictRow[] = paths.map((path) => ({
        path,
        label: kind.pathLabel(path),
        base: kind.formatValue(path, valueAt(startDoc, path), startDoc),
        current: kind.formatValue(path, valueAt(current, path), current),
        mine: kind.formatValue(path, valueAt(doc, path), doc),
      }));
      setConflict({ byName, baseRevision: c.baseRevision, currentRevision: c.currentRevision, current, rows, mine: doc });
      return;
    }
    setErrors(res.error.fieldErrors ?? []);
    setMessage(res.status === 403 ? `Not saved: your role may not change ${kind.plural}.` : `Not saved: ${res.error.message}`);
  }

  /** After a conflict: load the latest revision, keeping this user's edits listed (keep) or not. */
  function loadLatest(keep: boolean) {
    if (!conflict) return;
    if (keep) {
      const changed = startDoc ? [...new Set(diffPaths(startDoc, conflict.mine).map(kind.groupPath))] : [];
      setKept({
        rows: changed.map((path) => ({ path, label: kind.pathLabel(path), mine: kind.formatValue(path, valueAt(conflict.mine, path), conflict.mine) })),
        json: JSON.stringify(conflict.mine, null, 2),
      });
    } else setKept(null);
    setForm(kind.fromDoc(conflict.current));
    setStartDoc(conflict.current);
    setBaseRevision(conflict.currentRevision);
    setErrors([]);
    setConflict(null);
    setSaved(`Loaded revision ${conflict.currentRevision}.`);
  }

  return { readOnly, form, update, errMap, summary, setErrors, message, saved, busy, baseRevision, conflict, kept, dismissKept: () => setKept(null), save, loadLatest };
}

export type DocumentEditorState<Doc, Form> = ReturnType<typeof useDocumentEditor<Doc, Form>>;
