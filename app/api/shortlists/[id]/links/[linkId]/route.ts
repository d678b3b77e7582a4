import * as r from "@/lib/http/handlers/discussion";

export const dynamic = "force-dynamic";
export const DELETE = r.revokeLink;
