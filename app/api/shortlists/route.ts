import * as r from "./_lib/routes";

export const dynamic = "force-dynamic";
export const GET = r.list;
export const POST = r.create;
