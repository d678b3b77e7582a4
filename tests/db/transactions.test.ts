// Concurrent transactions on the provider under test: on PostgreSQL they run at Serializable and a
// transaction that loses a serialization conflict is run again, so concurrent comment posts on one
// shortlist are all stored and none answers an error (SQLite serializes writers by itself).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { armDoc, createTestDb, requirementDoc, type TestDb } from "./helpers";
import { db, isRetryable } from "@/lib/db/client";
import { createArm } from "@/lib/db/arms";
import { createComment } from "@/lib/db/comments";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createUser } from "@/lib/db/users";

let t: TestDb;
let shortlistId: string;
const users: string[] = [];
beforeAll(async () => {
  t = createTestDb();
  for (let i = 0; i < 40; i++) users.push((await createUser({ email: `c${i}@example.test`, name: `Commenter ${i}`, passwordHash: "x" })).id);
  const arm = (await createArm(null, armDoc())).id;
  const set = (await createRequirementSet(null, requirementDoc())).id;
  shortlistId = (await createShortlist(null, { name: "Busy discussion", requirementSetId: set, armIds: [arm] })).id;
});
afterAll(async () => t.cleanup());

describe(`transactions (${process.env.ARMSIFT_TEST_PROVIDER ?? "sqlite"})`, () => {
  it("tells lost serialization conflicts and deadlocks from other errors, as Prisma and as the driver adapter report them", () => {
    expect(isRetryable({ code: "P2034" })).toBe(true);
    expect(isRetryable({ name: "DriverAdapterError", cause: { originalCode: "40001", kind: "TransactionWriteConflict" } })).toBe(true);
    expect(isRetryable({ code: "P2010", meta: { driverAdapterError: { cause: { originalCode: "40P01" } } } })).toBe(true);
    expect(isRetryable({ code: "P2002" })).toBe(false);
    expect(isRetryable({ cause: { originalCode: "23505" } })).toBe(false);
    expect(isRetryable(null)).toBe(false);
  });

  it("stores every one of 120 comments posted at once on one shortlist", async () => {
    const posts = Array.from({ length: 120 }, (_, i) =>
      createComment({ kind: "member", userId: users[i % users.length] }, shortlistId, { body: `at once ${i}`, clientKey: `burst-${String(i).padStart(4, "0")}` }),
    );
    const results = await Promise.allSettled(posts);
    const failed = results.filter((r) => r.status === "rejected").map((r) => String((r as PromiseRejectedResult).reason).slice(0, 200));
    expect(failed).toEqual([]);
    expect(await t.client.comment.count({ where: { shortlistId, body: { startsWith: "at once " } } })).toBe(120);
  }, 120_000);

  it.runIf(process.env.ARMSIFT_TEST_PROVIDER === "postgres")(
    "a transaction whose COMMIT fails gives its connection back: more such failures than the pool has connections, then the client still answers",
    async () => {
      // A deferred unique constraint is checked at COMMIT, so COMMIT itself fails (SQLSTATE 23505).
      await db().$executeRawUnsafe("CREATE TABLE commit_probe (id int, CONSTRAINT commit_probe_once UNIQUE (id) DEFERRABLE INITIALLY DEFERRED)");
      for (let i = 0; i < 12; i++) {
        const outcome = await db()
          .$transaction(async (tx) => {
            await tx.$executeRawUnsafe("INSERT INTO commit_probe VALUES (1), (1)");
          })
          .then(
            () => "committed",
            (err: unknown) => String((err as Error).message ?? err),
          );
        expect(outcome).not.toBe("committed");
        expect(outcome).not.toMatch(/Unable to start a transaction/);
      }
      await db().$transaction(async (tx) => {
        await tx.$executeRawUnsafe("INSERT INTO commit_probe VALUES (2)");
      });
      expect(await db().$queryRawUnsafe<{ n: bigint }[]>("SELECT count(*) AS n FROM commit_probe")).toEqual([{ n: 1n }]);
    },
    120_000,
  );
});
