import { usersList } from "@/lib/http/auth-routes";

export const dynamic = "force-dynamic";
export const GET = usersList;
