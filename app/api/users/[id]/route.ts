import { userUpdate } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const PATCH = userUpdate;
