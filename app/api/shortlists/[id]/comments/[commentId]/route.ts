import * as r from "@/lib/http/handlers/discussion";

export const dynamic = "force-dynamic";
export const PATCH = r.editOwnComment;
export const DELETE = r.deleteOwnComment;
