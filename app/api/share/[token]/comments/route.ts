import * as r from "@/lib/http/handlers/discussion";

export const dynamic = "force-dynamic";
export const GET = r.shareComments;
export const POST = r.sharePostComment;
