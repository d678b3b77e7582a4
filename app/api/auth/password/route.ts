import { changePassword } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const POST = changePassword;
