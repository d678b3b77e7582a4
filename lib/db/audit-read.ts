import "server-only";
import { db } from "./client";

interface AuditEventRecord {
  id: string;
  at: Date;
  actor: { id: string; name: string } | null;
  action: string;
  entityType: string;
  entityId: string;
  detail: unknown;
}

/** Audit events, newest first, optionally for one entity. */
export async function listAuditEvents(opts: { entityType?: string; entityId?: string; limit?: number } = {}): Promise<AuditEventRecord[]> {
  const rows = await db().auditEvent.findMany({
    where: { entityType: opts.entityType, entityId: opts.entityId },
    orderBy: [{ at: "desc" }, { id: "asc" }],
    take: Math.min(Math.max(opts.limit ?? 100, 1), 1000),
    include: { actor: { select: { id: true, name: true } } },
  });
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    actor: r.actor,
    action: r.action,
    entityType: r.entityType,
    entityId: r.entityId,
    detail: r.detail === null ? null : JSON.parse(r.detail),
  }));
}
