import "server-only";
import { randomUUID } from "node:crypto";
import type { Tx } from "./client";

/** Appends one audit event inside the caller's transaction. */
export async function recordAudit(
  tx: Tx,
  event: { actorId: string | null; action: string; entityType: string; entityId: string; detail?: unknown },
): Promise<void> {
  await tx.auditEvent.create({
    data: {
      id: randomUUID(),
      actorId: event.actorId,
      action: event.action,
      entityType: event.entityType,
      entityId: event.entityId,
      detail: event.detail === undefined ? null : JSON.stringify(event.detail),
    },
  });
}
