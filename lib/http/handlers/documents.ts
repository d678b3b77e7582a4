import type { z } from "zod";
import { documentListQuery, documentUpdateInput } from "@/shared/schemas/documents";
import type { Action } from "@/lib/auth/permissions";
import type { DeletedFilter } from "@/lib/db";
import { notFound } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { documentExport } from "@/lib/export";
import { download, json, parseWith, requireUser, route } from "@/lib/http/route";

/** What the generic document endpoints need from one kind of revisioned document. */
export interface DocumentStore<D> {
  /** Response key of the document: "arm" or "requirementSet". */
  key: string;
  /** Human name, e.g. "arm" or "requirement set". */
  noun: string;
  read: Action;
  write: Action;
  schema: z.ZodType<D>;
  list(opts: { deleted?: DeletedFilter }): Promise<unknown[]>;
  get(id: string): Promise<{ id: string; revision: number; createdAt: Date; updatedAt: Date; deletedAt: Date | null; doc: D } | null>;
  create(userId: string, doc: D, action: "create" | "import"): Promise<{ id: string; revision: number; doc: D }>;
  update(userId: string, id: string, baseRevision: number, doc: D): Promise<{ id: string; revision: number; doc: D }>;
  softDelete(userId: string, id: string): Promise<{ id: string; deletedAt: Date | null }>;
  restore(userId: string, id: string): Promise<{ id: string; deletedAt: Date | null }>;
  revisions(id: string): Promise<unknown[] | null>;
  revision(id: string, rev: number): Promise<{ revision: number; createdAt: Date; author: unknown; doc: D } | null>;
  /** What the schema converted in a document as sent (e.g. an earlier form of a field); shown to the sender. */
  notices?(raw: unknown): string[];
}


/** Route handlers for list/get/create/update/delete/restore/revisions/export/import of one kind. */
export function documentRoutes<D extends { name: string }>(store: DocumentStore<D>) {
  const updateBody = documentUpdateInput(store.key, store.schema);
  const missing = (id: string) => notFound(`${store.noun} ${id} does not exist`);
  const noticesOf = (raw: unknown): { notices?: string[] } => {
    const notices = store.notices?.(raw) ?? [];
    return notices.length ? { notices } : {};
  };

  return {
    list: route(async (req) => {
      await requireUser(req, store.read);
      const q = parseWith(documentListQuery, Object.fromEntries(new URL(req.url).searchParams));
      return json({ [`${store.key === "arm" ? "arms" : "requirementSets"}`]: await store.list({ deleted: q.deleted }) });
    }),

    create: route(async (req) => {
      const user = await requireUser(req, store.write);
      const raw = await readJsonObject(req);
      const doc = parseWith(store.schema, raw);
      const r = await store.create(user.id, doc, "create");
      return json({ id: r.id, revision: r.revision, [store.key]: r.doc, ...noticesOf(raw) }, 201);
    }),

    import: route(async (req) => {
      const user = await requireUser(req, store.write);
      const raw = await readJsonObject(req);
      const doc = parseWith(store.schema, raw);
      const r = await store.create(user.id, doc, "import");
      return json({ id: r.id, revision: r.revision, [store.key]: r.doc, ...noticesOf(raw) }, 201);
    }),

    get: route<{ id: string }>(async (req, ctx) => {
      await requireUser(req, store.read);
      const { id } = await ctx.params;
      const r = await store.get(id);
      if (!r) throw missing(id);
      return json({ id: r.id, revision: r.revision, [store.key]: r.doc, createdAt: r.createdAt, updatedAt: r.updatedAt, deletedAt: r.deletedAt });
    }),

    update: route<{ id: string }>(async (req, ctx) => {
      const user = await requireUser(req, store.write);
      const { id } = await ctx.params;
      const body = parseWith(updateBody, await readJsonObject(req)) as { baseRevision: number } & Record<string, unknown>;
      const r = await store.update(user.id, id, body.baseRevision, body[store.key] as D);
      return json({ id: r.id, revision: r.revision, [store.key]: r.doc });
    }),

    remove: route<{ id: string }>(async (req, ctx) => {
      const user = await requireUser(req, store.write);
      const { id } = await ctx.params;
      return json(await store.softDelete(user.id, id));
    }),

    restore: route<{ id: string }>(async (req, ctx) => {
      const user = await requireUser(req, store.write);
      const { id } = await ctx.params;
      return json(await store.restore(user.id, id));
    }),

    revisions: route<{ id: string }>(async (req, ctx) => {
      await requireUser(req, store.read);
      const { id } = await ctx.params;
      const revisions = await store.revisions(id);
      if (!revisions) throw missing(id);
      return json({ revisions });
    }),

    revision: route<{ id: string; rev: string }>(async (req, ctx) => {
      await requireUser(req, store.read);
      const { id, rev } = await ctx.params;
      const n = /^[1-9]\d{0,8}$/.test(rev) ? Number(rev) : NaN;
      const r = Number.isInteger(n) ? await store.revision(id, n) : null;
      if (!r) throw notFound(`${store.noun} ${id} has no revision ${rev}`);
      return json({ revision: r.revision, [store.key]: r.doc, createdAt: r.createdAt, author: r.author });
    }),

    export: route<{ id: string }>(async (req, ctx) => {
      await requireUser(req, store.read);
      const { id } = await ctx.params;
      const r = await store.get(id);
      if (!r) throw missing(id);
      return download(documentExport(r.doc, store.key === "arm" ? "arm" : "requirements"), { "x-armsift-revision": String(r.revision) });
    }),
  };
}
