import { health } from "@/lib/http/handlers/health";

export const dynamic = "force-dynamic";
export const GET = health;
