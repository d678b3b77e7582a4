import * as r from "@/lib/http/handlers/shortlists";

export const dynamic = "force-dynamic";
export const POST = r.cancel;
