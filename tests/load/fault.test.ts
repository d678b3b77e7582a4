// Fault: the server process group is killed with SIGKILL in the middle of a burst of comment
// posts and edits from 40 members, then started again on the same database file. The database
// must pass PRAGMA integrity_check and foreign_key_check; every comment must have its complete,
// contiguous revision history with the comment row showing the newest revision; every write the
// server acknowledged before the kill must be there (no lost writes); audit events must match.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import Database from "better-sqlite3";
import { prepare, type LoadData } from "./data";
import { startServer, tempDatabase, type Server, type TempDb } from "./server";

const MEMBERS = 40;
const KILL_AFTER_ACKS = 150;

let tmp: TempDb;
let server: Server | undefined;
let data: LoadData;
beforeAll(async () => {
  tmp = tempDatabase();
  data = await prepare(MEMBERS);
  server = await startServer(tmp);
}, 180_000);
afterAll(async () => {
  await server?.kill("SIGTERM");
  tmp?.cleanup();
});

interface Acks {
  created: string[];
  edited: { id: string; revision: number; body: string }[];
  attempted: number;
}

async function burst(s: Server, acks: Acks, onAck: () => void): Promise<void> {
  const url = `${s.baseUrl}/api/shortlists/${data.shortlistId}/comments`;
  let stopped = false;
  const worker = async (w: number) => {
    for (let i = 0; !stopped; i++) {
      try {
        acks.attempted++;
        const key = `fault-${w}-${i}`;
        const res = await fetch(url, {
          method: "POST",
          headers: { cookie: data.cookies[w], "content-type": "application/json" },
          body: JSON.stringify({ body: `fault comment ${w}/${i} `.padEnd(400, "x"), clientKey: key }),
        });
        if (res.status !== 201) throw new Error(`post answered ${res.status}`);
        const { id } = (await res.json()) as { id: string };
        acks.created.push(id);
        onAck();
        acks.attempted++;
        const body = `edited ${w}/${i} `.padEnd(800, "y");
        const edit = await fetch(`${url}/${id}`, { method: "PATCH", headers: { cookie: data.cookies[w], "content-type": "application/json" }, body: JSON.stringify({ body }) });
        if (edit.status !== 200) throw new Error(`edit answered ${edit.status}`);
        const r = (await edit.json()) as { revision: number };
        acks.edited.push({ id, revision: r.revision, body });
        onAck();
      } catch {
        stopped = true; // the server is gone
      }
    }
  };
  await Promise.all(Array.from({ length: MEMBERS }, (_, w) => worker(w)));
}

describe("SIGKILL during a burst of writes", () => {
  it("restarts on a consistent database with every acknowledged write", async () => {
    const acks: Acks = { created: [], edited: [], attempted: 0 };
    let killing: Promise<void> | null = null;
    const s = server!;
    await burst(s, acks, () => {
      if (!killing && acks.created.length + acks.edited.length >= KILL_AFTER_ACKS) killing = s.kill("SIGKILL");
    });
    await killing;
    const acknowledged = acks.created.length + acks.edited.length;
    expect(acknowledged).toBeGreaterThanOrEqual(KILL_AFTER_ACKS);

    server = await startServer(tmp);
    const file = new Database(tmp.file, { readonly: true });
    try {
      expect(file.pragma("integrity_check", { simple: true })).toBe("ok");
      expect(file.pragma("foreign_key_check")).toEqual([]);
      const comments = file.prepare("SELECT id, body, revision FROM Comment").all() as { id: string; body: string; revision: number }[];
      const revs = file.prepare("SELECT commentId, revision, body FROM CommentRevision ORDER BY commentId, revision").all() as { commentId: string; revision: number; body: string }[];
      const byComment = new Map<string, { revision: number; body: string }[]>();
      for (const r of revs) byComment.set(r.commentId, [...(byComment.get(r.commentId) ?? []), r]);
      const half: string[] = [];
      for (const c of comments) {
        const list = byComment.get(c.id) ?? [];
        const contiguous = list.length === c.revision && list.every((r, i) => r.revision === i + 1);
        if (!contiguous || list[list.length - 1]?.body !== c.body) half.push(c.id);
      }
      const orphans = revs.filter((r) => !comments.some((c) => c.id === r.commentId));
      const ids = new Set(comments.map((c) => c.id));
      const lostCreates = acks.created.filter((id) => !ids.has(id));
      const lostEdits = acks.edited.filter((e) => !revs.some((r) => r.commentId === e.id && r.revision === e.revision && r.body === e.body));
      const audit = (action: string) => (file.prepare("SELECT COUNT(*) AS n FROM AuditEvent WHERE action = ?").get(action) as { n: number }).n;
      console.log(
        `[fault] SIGKILL after ${acknowledged} acknowledged writes (${acks.attempted} attempted, ${acks.attempted - acknowledged} in flight or refused): ` +
          `${comments.length} comments, ${revs.length} revisions on disk; integrity ok; half-written ${half.length}, orphan revisions ${orphans.length}, ` +
          `lost writes ${lostCreates.length + lostEdits.length}`,
      );
      expect(half).toEqual([]);
      expect(orphans).toEqual([]);
      expect(lostCreates).toEqual([]);
      expect(lostEdits).toEqual([]);
      expect(audit("comment.create")).toBe(comments.length);
      expect(audit("comment.edit")).toBe(revs.filter((r) => r.revision > 1).length);
    } finally {
      file.close();
    }

    // The restarted server takes writes again.
    const res = await fetch(`${server.baseUrl}/api/shortlists/${data.shortlistId}/comments`, {
      method: "POST",
      headers: { cookie: data.cookies[0], "content-type": "application/json" },
      body: JSON.stringify({ body: "after the restart" }),
    });
    expect(res.status).toBe(201);
  }, 240_000);
});
