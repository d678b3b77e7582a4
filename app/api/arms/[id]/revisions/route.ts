import { armRoutes as r } from "@/lib/http/handlers/stores";

export const dynamic = "force-dynamic";
export const GET = r.revisions;
