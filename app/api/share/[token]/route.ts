import * as r from "@/app/api/share/_lib/routes";

export const dynamic = "force-dynamic";
export const GET = r.shareView;
