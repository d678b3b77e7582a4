// Load: 100 concurrent commenters (one connection and one session each) post 800 comments to
// one shortlist over loopback against the built server, driven by autocannon (bounded by request
// count and per-request timeout). Every acknowledged comment must be stored exactly once, with
// its first revision and audit event; nothing may fail. The p99 latency is printed, not asserted
// (timings belong to benchmarks). Also checks the database runs in WAL mode with a busy timeout.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import autocannon from "autocannon";
import Database from "better-sqlite3";
import { createDb, BUSY_TIMEOUT_MS } from "@/lib/db/client";
import { prepare, type LoadData } from "./data";
import { startServer, tempDatabase, type Server, type TempDb } from "./server";

const COMMENTERS = 100;
const REQUESTS = 800;

let tmp: TempDb;
let server: Server;
let data: LoadData;
beforeAll(async () => {
  tmp = tempDatabase();
  data = await prepare(COMMENTERS);
  server = await startServer(tmp);
}, 180_000);
afterAll(async () => {
  await server?.kill("SIGTERM");
  tmp?.cleanup();
});

describe("100 concurrent commenters", () => {
  it("stores every comment exactly once", async () => {
    // setupRequest also runs for requests that autocannon prepares but never sends: `built` is a superset of what was sent.
    const built = new Set<string>();
    const statuses = new Map<number, number>();
    const ids: string[] = [];
    let next = 0;
    let seq = 0;
    const result = await autocannon({
      url: server.baseUrl,
      connections: COMMENTERS,
      amount: REQUESTS,
      timeout: 120,
      setupClient(client) {
        client.setHeaders({ cookie: data.cookies[next++ % data.cookies.length], "content-type": "application/json" });
      },
      requests: [
        {
          method: "POST",
          path: `/api/shortlists/${data.shortlistId}/comments`,
          setupRequest(req) {
            const n = seq++;
            const body = `load comment ${n}: payload margin looks **fine** at the pick target`;
            built.add(body);
            return { ...req, body: JSON.stringify({ body, clientKey: `load-${String(n).padStart(6, "0")}` }) };
          },
          onResponse(status, body) {
            statuses.set(status, (statuses.get(status) ?? 0) + 1);
            if (status === 201) ids.push(JSON.parse(body).id);
          },
        },
      ],
    });
    const p99 = result.latency.p99;
    console.log(
      `[load] ${COMMENTERS} commenters, ${result.requests.total} requests in ${result.duration.toFixed(1)} s: ` +
        `statuses ${JSON.stringify(Object.fromEntries(statuses))}, errors ${result.errors}, timeouts ${result.timeouts}; ` +
        `latency p50 ${result.latency.p50} ms, p90 ${result.latency.p90} ms, p97.5 ${result.latency.p97_5} ms, p99 ${p99} ms, max ${result.latency.max} ms`,
    );

    expect(result.errors).toBe(0);
    expect(result.timeouts).toBe(0);
    expect(Object.fromEntries(statuses)).toEqual({ 201: REQUESTS });

    const file = new Database(tmp.file, { readonly: true });
    try {
      const rows = file.prepare("SELECT id, body FROM Comment WHERE shortlistId = ?").all(data.shortlistId) as { id: string; body: string }[];
      const storedIds = new Set(rows.map((r) => r.id));
      const perBody = new Map<string, number>();
      for (const r of rows) perBody.set(r.body, (perBody.get(r.body) ?? 0) + 1);
      const lost = ids.filter((id) => !storedIds.has(id));
      const doubled = [...perBody.values()].filter((n) => n !== 1).length;
      const unknown = rows.filter((r) => !built.has(r.body) || !ids.includes(r.id));
      console.log(`[load] acknowledged ${ids.length}, stored ${rows.length}, lost ${lost.length}, stored more than once ${doubled}, stored without acknowledgement ${unknown.length}`);
      expect(lost).toEqual([]);
      expect(doubled).toBe(0);
      expect(unknown).toEqual([]);
      expect(rows.length).toBe(REQUESTS);
      expect(new Set(ids).size).toBe(REQUESTS);
      const revisions = file.prepare("SELECT COUNT(*) AS n FROM CommentRevision r JOIN Comment c ON c.id = r.commentId WHERE c.shortlistId = ? AND r.revision = 1").get(data.shortlistId) as { n: number };
      expect(revisions.n).toBe(REQUESTS);
      const audits = file.prepare("SELECT COUNT(*) AS n FROM AuditEvent WHERE action = 'comment.create'").get() as { n: number };
      expect(audits.n).toBe(REQUESTS);
      expect(file.pragma("journal_mode", { simple: true })).toBe("wal");
    } finally {
      file.close();
    }
  }, 300_000);

  it("opens every connection with a busy timeout", async () => {
    const client = createDb(`file:${tmp.file}`);
    try {
      const rows = (await client.$queryRawUnsafe("PRAGMA busy_timeout")) as Record<string, unknown>[];
      expect(Number(Object.values(rows[0])[0])).toBe(BUSY_TIMEOUT_MS);
      expect(BUSY_TIMEOUT_MS).toBeGreaterThanOrEqual(1000);
      const mode = (await client.$queryRawUnsafe("PRAGMA journal_mode")) as Record<string, unknown>[];
      expect(String(Object.values(mode[0])[0]).toLowerCase()).toBe("wal");
    } finally {
      await client.$disconnect();
    }
  });
});
