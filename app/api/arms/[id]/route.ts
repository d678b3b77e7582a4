import { armRoutes as r } from "@/lib/http/handlers/stores";

export const dynamic = "force-dynamic";
export const GET = r.get;
export const PUT = r.update;
export const DELETE = r.remove;
