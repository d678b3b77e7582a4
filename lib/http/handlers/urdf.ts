/**
 * URDF endpoints: POST /api/arms/urdf reads a URDF file's chain and answers the arm it would make
 * with the import report (nothing is saved: the client saves the arm through /api/arms/import);
 * GET /api/arms/[id]/urdf exports the arm's current revision as URDF.
 */
import { createHash } from "node:crypto";
import { importUrdf, exportUrdf, UrdfError } from "@/lib/urdf";
import * as data from "@/lib/db";
import { urdfPreviewInput } from "@/shared/schemas/urdf";
import { ApiError, notFound } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route } from "@/lib/http/route";

/** JSON body limit: 2 MiB of URDF plus room for the JSON string escapes. */
const URDF_BODY_BYTES = 3 * 1024 * 1024;

function fileName(name: string): string {
  const slug = name.normalize("NFKD").replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 80) || "arm";
  return `${slug}.urdf`;
}

export const urdfRoutes = {
  preview: route(async (req) => {
    await requireUser(req, "arm:write");
    const input = parseWith(urdfPreviewInput, await readJsonObject(req, URDF_BODY_BYTES));
    const sha256 = createHash("sha256").update(input.text, "utf8").digest("hex");
    try {
      const { arm, report } = importUrdf(input.text, { fileName: input.fileName, sha256, base: input.base || undefined, tip: input.tip || undefined });
      return json({ arm, report });
    } catch (e) {
      if (!(e instanceof UrdfError)) throw e;
      const message = `${input.fileName}: ${e.message}`;
      throw new ApiError(400, "validation", message, { fieldErrors: [{ path: "text", message }] });
    }
  }),

  export: route<{ id: string }>(async (req, ctx) => {
    await requireUser(req, "arm:read");
    const { id } = await ctx.params;
    const r = await data.getArm(id);
    if (!r) throw notFound(`arm ${id} does not exist`);
    return new Response(exportUrdf(r.arm), {
      status: 200,
      headers: {
        "content-type": "application/xml; charset=utf-8",
        "content-disposition": `attachment; filename="${fileName(r.arm.name)}"`,
        "x-armsift-revision": String(r.revision),
      },
    });
  }),
};
