// The web server restarted (SIGKILL, then started again) during an analysis, against the built
// server (`next start`) on PostgreSQL with a worker process: the run belongs to the queue and its
// worker, so it finishes as if nothing happened (one attempt) and the restarted server shows the
// result. (The SQLite counterpart, where the run dies with the server: tests/load/restart.test.ts.)
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb } from "../db/helpers";
import { db } from "@/lib/db/client";
import { logFolder, startServer, type Server } from "../load/server";
import { killWorkers, startWorkerProcess, waitFor } from "./workers";
import { api, prepare } from "../load/restart-data";

const servers: Server[] = [];
afterAll(async () => {
  killWorkers();
  for (const s of servers) await s.kill("SIGKILL");
});

describe("web server restarted during an analysis", () => {
  describe("PostgreSQL with a worker", () => {
    let t: TestDb;
    beforeAll(() => {
      t = createTestDb();
    });
    afterAll(async () => t?.cleanup());

    it("the run finishes on the worker and the restarted server shows it", async () => {
      const inputs = await prepare();
      await db().$disconnect();
      startWorkerProcess("W", t.url);
      const s1 = await startServer(logFolder(), { databaseUrl: t.url });
      servers.push(s1);
      const created = await api(s1, inputs.cookie, "/api/shortlists", { name: "Restart on the queue", requirementSetId: inputs.heavySet, armIds: inputs.heavyArms });
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      const { id } = created.body;
      const runId = created.body.run!.id as string;
      await waitFor("the run in progress", async () => {
        const r = await api(s1, inputs.cookie, `/api/shortlists/${id}/runs/${runId}`);
        return r.body.run?.status === "running" && r.body.run.progress > 0 ? true : undefined;
      }, 60_000, 100);
      await s1.kill("SIGKILL");
      const s2 = await startServer(logFolder(), { databaseUrl: t.url });
      servers.push(s2);
      const done = await waitFor("the run finished", async () => {
        const r = await api(s2, inputs.cookie, `/api/shortlists/${id}/runs/${runId}`);
        return r.body.run?.status === "done" || r.body.run?.status === "failed" ? r.body.run : undefined;
      }, 120_000, 250);
      expect(done).toMatchObject({ status: "done", attempt: 1, error: null });
      const health = await api(s2, "", "/api/health");
      expect(health.body.runner).toMatchObject({ kind: "queue", liveWorkers: 1 });
    }, 300_000);
  });

});
