import { me } from "@/lib/http/auth-routes";

export const dynamic = "force-dynamic";
export const GET = me;
