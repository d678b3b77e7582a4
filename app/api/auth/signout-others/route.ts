import { signOutOthers } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const POST = signOutOthers;
