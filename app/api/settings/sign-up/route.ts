import { signUpModeGet, signUpModeSet } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const GET = signUpModeGet;
export const PUT = signUpModeSet;
