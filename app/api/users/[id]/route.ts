import { userUpdate } from "@/lib/http/auth-routes";

export const dynamic = "force-dynamic";
export const PATCH = userUpdate;
