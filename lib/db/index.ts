// Data access for server code (route handlers, server components). Everything here runs on the
// server only; scripts and tests import the modules below directly.
import "server-only";

export * from "./arms";
export * from "./requirements";
export * from "./users";
export * from "./sessions";
export * from "./errors";
export { listAuditEvents } from "./audit-read";
export type { UserRef, DeletedFilter } from "./documents";
