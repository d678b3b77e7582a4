import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { armDoc, createTestDb, type TestDb } from "./helpers";
import {
  createArm,
  getArm,
  getArmRevision,
  listArmRevisions,
  listArms,
  restoreArm,
  softDeleteArm,
  updateArm,
} from "@/lib/db/arms";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/db/errors";
import { createUser } from "@/lib/db/users";
import { insertSession } from "@/lib/db/sessions";
import { db } from "@/lib/db/client";

let t: TestDb;
let userId: string;

beforeAll(async () => {
  t = createTestDb();
  userId = (await createUser({ email: "editor@example.test", name: "Edna Editor", passwordHash: "scrypt$1$1$1$AAAAAAAAAAA=$AAAAAAAAAAAAAAAAAAAAAA==" })).id;
});
afterAll(async () => t.cleanup());

describe("arm revisions", () => {
  it("every save makes a new revision and old ones stay readable", async () => {
    const { id, revision } = await createArm(userId, armDoc());
    expect(revision).toBe(1);
    const r2 = await updateArm(userId, id, 1, armDoc({ name: "Test arm TA-3 mk2" }));
    expect(r2.revision).toBe(2);
    const r3 = await updateArm(userId, id, 2, armDoc({ name: "Test arm TA-3 mk2", specs: { ratedPayload: 6 } }));
    expect(r3.revision).toBe(3);

    const current = await getArm(id);
    expect(current?.revision).toBe(3);
    expect(current?.arm.specs).toEqual({ ratedPayload: 6 });
    expect((await getArmRevision(id, 1))?.arm.name).toBe("Test arm TA-3");
    expect((await getArmRevision(id, 2))?.arm.name).toBe("Test arm TA-3 mk2");
    expect(await getArmRevision(id, 4)).toBeNull();

    const history = await listArmRevisions(id);
    expect(history?.map((h) => h.revision)).toEqual([3, 2, 1]);
    expect(history?.[0].author).toEqual({ id: userId, name: "Edna Editor" });
    expect(history?.[1].summary).toBe("changed name");
    expect(history?.[2].summary).toBe("created");
    expect(history?.[0].summary).toMatch(/^changed specs\.ratedPayload, specs\.reach, specs\.repeatability and \d+ more$/);
  });

  it("refuses UPDATE and DELETE on revision rows (database triggers)", async () => {
    const { id } = await createArm(userId, armDoc());
    const rev = await t.client.armRevision.findUniqueOrThrow({ where: { armId_revision: { armId: id, revision: 1 } } });
    await expect(t.client.armRevision.update({ where: { id: rev.id }, data: { summary: "edited" } })).rejects.toThrow();
    await expect(t.client.armRevision.delete({ where: { id: rev.id } })).rejects.toThrow();
    await expect(t.client.$executeRaw`UPDATE "ArmRevision" SET "document" = '{}' WHERE "id" = ${rev.id}`).rejects.toThrow(/immutable/);
    await expect(t.client.$executeRaw`DELETE FROM "ArmRevision" WHERE "armId" = ${id}`).rejects.toThrow(/immutable/);
    const after = await t.client.armRevision.findUniqueOrThrow({ where: { id: rev.id } });
    expect(after).toEqual(rev);
  });

  it("refuses a second revision with the same number (unique armId, revision)", async () => {
    const { id } = await createArm(userId, armDoc());
    await expect(
      t.client.armRevision.create({ data: { id: "dup-" + id, armId: id, revision: 1, document: "{}", summary: "x" } }),
    ).rejects.toMatchObject({ code: "P2002" });
  });
});

describe("concurrent edits", () => {
  it("a stale baseRevision is refused with what changed between base and current", async () => {
    const { id } = await createArm(userId, armDoc());
    const theirs = armDoc();
    theirs.joints[2].max = 2.0;
    theirs.specs = { ...theirs.specs, price: 19000 };
    await updateArm(userId, id, 1, theirs);

    const mine = armDoc({ description: "my edit" });
    const err = await updateArm(userId, id, 1, mine).catch((e) => e);
    expect(err).toBeInstanceOf(ConflictError);
    expect(err.baseRevision).toBe(1);
    expect(err.currentRevision).toBe(2);
    expect(err.current.joints[2].max).toBe(2.0);
    expect(err.changes).toEqual([
      { path: "joints.2.max", base: 2.5, current: 2.0 },
      { path: "specs.price", base: 21000, current: 19000 },
    ]);
    expect((await getArm(id))?.arm.description).toBeUndefined();
  });

  it("two racing updates from the same base: exactly one wins", async () => {
    const { id } = await createArm(userId, armDoc());
    const results = await Promise.allSettled([
      updateArm(userId, id, 1, armDoc({ name: "Racer A" })),
      updateArm(userId, id, 1, armDoc({ name: "Racer B" })),
    ]);
    const won = results.filter((r) => r.status === "fulfilled");
    const lost = results.filter((r) => r.status === "rejected");
    expect(won).toHaveLength(1);
    expect(lost).toHaveLength(1);
    expect((lost[0] as PromiseRejectedResult).reason).toBeInstanceOf(ConflictError);
    const winner = (won[0] as PromiseFulfilledResult<{ arm: { name: string } }>).value.arm.name;
    expect((await getArm(id))?.arm.name).toBe(winner);
    expect((await listArmRevisions(id))?.map((r) => r.revision)).toEqual([2, 1]);
  });

  it("two server processes saving from the same base: exactly one wins", async () => {
    const { id } = await createArm(userId, armDoc());
    const run = promisify(execFile);
    const script = path.join(__dirname, "race-update.ts");
    const tsx = path.resolve(__dirname, "..", "..", "node_modules", ".bin", "tsx");
    const outputs = await Promise.all(
      ["Process A", "Process B"].map((name) =>
        run(tsx, ["--conditions=react-server", script, id, name], { env: { ...process.env, DATABASE_URL: t.url }, cwd: path.resolve(__dirname, "..", "..") }).then((r) => JSON.parse(r.stdout.trim())),
      ),
    );
    expect(outputs.map((o) => o.outcome).sort()).toEqual(["conflict", "saved"]);
    const history = await listArmRevisions(id);
    expect(history?.map((r) => r.revision)).toEqual([2, 1]);
  });

  it("a plain write that arrives during a transaction that fails is kept", async () => {
    const token = "plain-write-during-rollback";
    let outside: Promise<void> | undefined;
    const failed = db()
      .$transaction(async (tx) => {
        await tx.arm.updateMany({ where: { id: "none" }, data: { name: "x" } });
        outside = insertSession(token, userId, new Date(Date.now() + 60_000)); // not part of the transaction
        await new Promise((r) => setTimeout(r, 100));
        throw new Error("roll back");
      })
      .catch((e: Error) => e.message);
    expect(await failed).toBe("roll back");
    await outside;
    expect(await t.client.session.count({ where: { id: token } })).toBe(1);
  });

  it("a baseRevision newer than the current one is a field error", async () => {
    const { id } = await createArm(userId, armDoc());
    const err = await updateArm(userId, id, 7, armDoc()).catch((e) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect(err.fieldErrors[0].path).toBe("baseRevision");
  });
});

describe("soft delete", () => {
  it("hides a deleted arm from the list, keeps it readable and restores it", async () => {
    const { id } = await createArm(userId, armDoc({ name: "Deletable arm" }));
    await softDeleteArm(userId, id);
    expect((await listArms()).some((a) => a.id === id)).toBe(false);
    expect((await listArms({ deleted: "only" })).map((a) => a.id)).toContain(id);
    expect((await getArm(id))?.deletedAt).toBeInstanceOf(Date);
    await expect(updateArm(userId, id, 1, armDoc())).rejects.toBeInstanceOf(NotFoundError);

    await restoreArm(userId, id);
    const listed = (await listArms()).find((a) => a.id === id);
    expect(listed).toMatchObject({ name: "Deletable arm", axes: 3, revision: 1, deletedAt: null, updatedBy: { id: userId, name: "Edna Editor" } });
    expect(listed?.specs.ratedPayload).toBe(5);
    expect((await getArmRevision(id, 1))?.arm.name).toBe("Deletable arm");
  });

  it("unknown ids are not found", async () => {
    expect(await getArm("no-such-arm")).toBeNull();
    expect(await listArmRevisions("no-such-arm")).toBeNull();
    await expect(softDeleteArm(userId, "no-such-arm")).rejects.toBeInstanceOf(NotFoundError);
    await expect(updateArm(userId, "no-such-arm", 1, armDoc())).rejects.toBeInstanceOf(NotFoundError);
  });

  it("records an audit event for every change", async () => {
    const { id } = await createArm(userId, armDoc());
    await updateArm(userId, id, 1, armDoc({ name: "Audited" }));
    await softDeleteArm(userId, id);
    await restoreArm(userId, id);
    const events = await t.client.auditEvent.findMany({ where: { entityId: id }, orderBy: { at: "asc" } });
    expect(events.map((e) => e.action)).toEqual(["arm.create", "arm.update", "arm.delete", "arm.restore"]);
    expect(events.every((e) => e.actorId === userId)).toBe(true);
  });
});
