import { invitationRevoke } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const DELETE = invitationRevoke;
