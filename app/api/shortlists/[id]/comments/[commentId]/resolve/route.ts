import * as r from "@/lib/http/handlers/discussion";

export const dynamic = "force-dynamic";
export const POST = r.resolveThread;
