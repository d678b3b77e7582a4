// The data layer: the only Prisma user. Everything outside lib/db (pages, route handlers, the
// runner, scripts) imports it from here, never a module below; every module is server-only.
// The lint configuration enforces both.
import "server-only";

export * from "./arms";
export * from "./requirements";
export * from "./users";
export * from "./sessions";
export * from "./errors";
export * from "./shortlists";
export { readResultArm, readResultArms, readResultHead, storedResultSize } from "./results";
export * from "./comments";
export * from "./shares";
export * from "./settings";
export * from "./invitations";
export { listAuditEvents } from "./audit-read";
export * from "./workers";
export { databaseUrl, dbProvider, disconnectDb, pingDatabase, type DbProvider, type Tx } from "./client";
export { seedDemo } from "./seed";
export type { Change } from "./errors";
export type { UserRef, DeletedFilter } from "./documents";
