import { armRoutes as r } from "@/lib/http/api-stores";

export const dynamic = "force-dynamic";
export const GET = r.export;
