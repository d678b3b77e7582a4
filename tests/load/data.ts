// Data for the load and fault tests, written through lib/db before the server starts: one
// shortlist and `members` signed-in viewers (session rows made as sign-in makes them).
import { randomBytes } from "node:crypto";
import { armDoc, requirementDoc } from "../db/helpers";
import { db } from "@/lib/db/client";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createUser } from "@/lib/db/users";
import { insertSession } from "@/lib/db/sessions";
import { hashToken, SESSION_TTL_MS } from "@/lib/auth/session";

export interface LoadData {
  shortlistId: string;
  cookies: string[];
}

export async function prepare(members: number): Promise<LoadData> {
  const owner = await createUser({ email: "owner@example.test", name: "Owner", passwordHash: "unused" });
  const arm = (await createArm(owner.id, armDoc())).id;
  const set = (await createRequirementSet(owner.id, requirementDoc())).id;
  const { id: shortlistId } = await createShortlist(owner.id, { name: "Load cell", requirementSetId: set, armIds: [arm] });
  const cookies: string[] = [];
  for (let i = 0; i < members; i++) {
    const u = await createUser({ email: `commenter${i}@example.test`, name: `Commenter ${i}`, passwordHash: "unused" });
    const token = randomBytes(32).toString("base64url");
    await insertSession(hashToken(token), u.id, new Date(Date.now() + SESSION_TTL_MS));
    cookies.push(`armsift_session=${token}`);
  }
  await db().$disconnect();
  return { shortlistId, cookies };
}
