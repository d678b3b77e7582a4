import * as r from "../../../../_lib/routes";

export const dynamic = "force-dynamic";
export const POST = r.cancel;
