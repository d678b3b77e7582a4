import { z } from "zod";

/** Body of POST /api/arms/urdf: a URDF file's text and the chain to take from it. */
export const urdfPreviewInput = z.object({
  /** File name as chosen (recorded in the arm's source). */
  fileName: z.string().trim().min(1, "must not be empty").max(255, "must be at most 255 characters"),
  /** The file's text (UTF-8). */
  text: z.string({ error: "must be the file's text" }),
  /** Base link (default: the root link). */
  base: z.string().trim().max(255).optional(),
  /** Tip link (default: the end of the longest chain below the base). */
  tip: z.string().trim().max(255).optional(),
});
