import { usersList } from "@/lib/http/handlers/auth";

export const dynamic = "force-dynamic";
export const GET = usersList;
