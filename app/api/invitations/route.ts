import { invitationCreate, invitationsList } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const GET = invitationsList;
export const POST = invitationCreate;
