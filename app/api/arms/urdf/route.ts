import { urdfRoutes } from "@/lib/http/handlers/urdf";

export const dynamic = "force-dynamic";
export const POST = urdfRoutes.preview;
