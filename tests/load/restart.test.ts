// The web server restarted (SIGKILL, then started again) during an analysis on SQLite, against the
// built server (`next start`): the run was the server's own (a worker thread), so it dies with it;
// at the next start it is marked failed with the reason, and the run that waited behind it in the
// queue is analysed. (The PostgreSQL counterpart, where a worker owns the run: tests/queue/restart.test.ts.)
import { afterAll, describe, expect, it } from "vitest";
import { db } from "@/lib/db/client";
import { loadSeedRequirementSets } from "@/seed-data/index";
import { startServer, tempDatabase, type Server } from "./server";
import { api, prepare } from "./restart-data";
import { waitFor } from "../queue/workers";

const servers: Server[] = [];
afterAll(async () => {
  for (const s of servers) await s.kill("SIGKILL");
});

describe("web server restarted during an analysis", () => {
  it("the run dies with the server, is marked failed at the next start, and the queued one is analysed", async () => {
    const file = tempDatabase();
    const inputs = await prepare();
    await db().$disconnect();
    const env = { ARMSIFT_ANALYSIS_CONCURRENCY: "1" };
    const s1 = await startServer(file, { env });
    servers.push(s1);
    const heavy = await api(s1, inputs.cookie, "/api/shortlists", { name: "Restart, own runner", requirementSetId: inputs.heavySet, armIds: inputs.heavyArms });
    expect(heavy.status, JSON.stringify(heavy.body)).toBe(201);
    const setB = (await api(s1, inputs.cookie, "/api/requirements", loadSeedRequirementSets()[0])).body;
    const waiting = await api(s1, inputs.cookie, "/api/shortlists", { name: "Waiting behind it", requirementSetId: setB.id, armIds: [inputs.tinyArm] });
    expect(waiting.status, JSON.stringify(waiting.body)).toBe(201);
    const heavyRun = `/api/shortlists/${heavy.body.id}/runs/${heavy.body.run!.id}`;
    const waitingRun = `/api/shortlists/${waiting.body.id}/runs/${waiting.body.run!.id}`;
    await waitFor("the heavy run in progress", async () => {
      const r = await api(s1, inputs.cookie, heavyRun);
      return r.body.run?.status === "running" && r.body.run.progress > 0 ? true : undefined;
    }, 60_000, 100);
    // One at a time: the second waits, first in the queue.
    expect((await api(s1, inputs.cookie, waitingRun)).body.run).toMatchObject({ status: "queued", queuePosition: 1 });
    await s1.kill("SIGKILL");

    const s2 = await startServer(file, { env });
    servers.push(s2);
    expect((await api(s2, inputs.cookie, heavyRun)).body.run).toMatchObject({
      status: "failed",
      error: "the server stopped while this analysis was running; start it again",
    });
    const done = await waitFor("the queued run analysed", async () => {
      const r = await api(s2, inputs.cookie, waitingRun);
      return r.body.run?.status === "done" ? r.body.run : undefined;
    }, 120_000, 250);
    expect(done.error).toBeNull();
  }, 300_000);
});
