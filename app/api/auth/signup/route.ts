import { signUp } from "@/lib/http/auth-routes";

export const dynamic = "force-dynamic";
export const POST = signUp;
