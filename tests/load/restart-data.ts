// Shared by the restart tests: an admin with a session and analysis inputs written through lib/db
// before the server starts, and a small API client for the built server.
import { randomBytes } from "node:crypto";
import { armDoc } from "../db/helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createUser } from "@/lib/db/users";
import { insertSession } from "@/lib/db/sessions";
import { hashToken, SESSION_TTL_MS } from "@/lib/auth/session";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import type { Server } from "./server";

export interface Inputs {
  cookie: string;
  heavyArms: string[];
  heavySet: string;
  tinyArm: string;
}

/** An admin with a session, the heavy inputs (seed arms twice, the deburring cell) and a tiny arm. */
export async function prepare(): Promise<Inputs> {
  const owner = await createUser({ email: "owner@example.test", name: "Owner", passwordHash: "unused" });
  const token = randomBytes(32).toString("base64url");
  await insertSession(hashToken(token), owner.id, new Date(Date.now() + SESSION_TTL_MS));
  const heavyArms: string[] = [];
  for (const [i, arm] of [...loadSeedArms(), ...loadSeedArms()].entries()) heavyArms.push((await createArm(owner.id, { ...arm, name: `${arm.name} (${i})` })).id);
  const heavySet = (await createRequirementSet(owner.id, loadSeedRequirementSets().find((s) => s.paths.length > 0)!)).id;
  const tinyArm = (await createArm(owner.id, armDoc())).id;
  return { cookie: `armsift_session=${token}`, heavyArms, heavySet, tinyArm };
}

/** The parts of API answers the restart tests read. */
export interface ApiBody {
  id?: string;
  run?: { id: string; status: string; progress: number; queuePosition: number | null; attempt: number; error: string | null };
  [key: string]: unknown;
}

export async function api(s: Server, cookie: string, path: string, body?: unknown): Promise<{ status: number; body: ApiBody }> {
  const res = await fetch(`${s.baseUrl}${path}`, {
    method: body === undefined ? "GET" : "POST",
    headers: { cookie, "content-type": "application/json", origin: s.baseUrl },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json()) as ApiBody };
}

