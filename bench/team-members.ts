// Helper process of bench/team.ts: makes N signed-in members on DATABASE_URL through the data
// layer (as sign-in would) and prints their session cookies as JSON.
// `node --import tsx --conditions=react-server bench/team-members.ts <n>`
import { randomBytes } from "node:crypto";
import { createUser, disconnectDb, insertSession } from "@/lib/db";
import { hashToken, SESSION_TTL_MS } from "@/lib/auth/session";

async function main(): Promise<void> {
  const n = Number(process.argv[2]);
  const cookies: string[] = [];
  for (let i = 0; i < n; i++) {
    const u = await createUser({ email: `commenter${i}@example.test`, name: `Commenter ${i}`, passwordHash: "unused" });
    const token = randomBytes(32).toString("base64url");
    await insertSession(hashToken(token), u.id, new Date(Date.now() + SESSION_TTL_MS));
    cookies.push(`armsift_session=${token}`);
  }
  process.stdout.write(JSON.stringify(cookies));
  await disconnectDb();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
