import { describe, expect, it } from "vitest";
import { sampleArm, sampleRequirementSet } from "../db/helpers";
import * as arms from "@/app/api/arms/route";
import * as armById from "@/app/api/arms/[id]/route";
import * as armRestore from "@/app/api/arms/[id]/restore/route";
import * as armRevisions from "@/app/api/arms/[id]/revisions/route";
import * as armRevision from "@/app/api/arms/[id]/revisions/[rev]/route";
import * as armExport from "@/app/api/arms/[id]/export/route";
import * as armImport from "@/app/api/arms/import/route";
import * as reqs from "@/app/api/requirements/route";
import * as reqById from "@/app/api/requirements/[id]/route";
import * as reqExport from "@/app/api/requirements/[id]/export/route";
import * as reqImport from "@/app/api/requirements/import/route";
import * as reqRevisions from "@/app/api/requirements/[id]/revisions/route";
import { call, expectFieldError } from "./client";
import { withAccounts } from "./setup";

const { acc } = withAccounts();

const createArm = async (cookie: string, arm: unknown = sampleArm()) => call(arms.POST, "/api/arms", { cookie, body: arm });

describe("arms API: roles and status codes", () => {
  it("anonymous 401, viewer reads but may not write (403), editor writes", async () => {
    expect((await call(arms.GET, "/api/arms")).status).toBe(401);
    expect((await createArm("")).status).toBe(401);
    const v = await createArm(acc.viewer);
    expect(v.status).toBe(403);
    expect(v.body.error.code).toBe("forbidden");

    const c = await createArm(acc.editor);
    expect(c.status).toBe(201);
    expect(c.body).toMatchObject({ revision: 1, arm: { name: "Test arm TA-3" } });
    const id = c.body.id as string;

    const list = await call(arms.GET, "/api/arms", { cookie: acc.viewer });
    expect(list.status).toBe(200);
    expect(list.body.arms.find((a: { id: string }) => a.id === id)).toMatchObject({
      id,
      name: "Test arm TA-3",
      maker: "Example Works",
      modelCode: "TA-3",
      axes: 3,
      revision: 1,
      updatedBy: { id: acc.ids.editor, name: "Ed Editor" },
      deletedAt: null,
      specs: { ratedPayload: 5, ipCode: "IP54" },
    });

    const got = await call(armById.GET, `/api/arms/${id}`, { cookie: acc.viewer, params: { id } });
    expect(got.status).toBe(200);
    expect(Object.keys(got.body).sort()).toEqual(["arm", "createdAt", "deletedAt", "id", "revision", "updatedAt"]);

    const put = (cookie: string) => call(armById.PUT, `/api/arms/${id}`, { method: "PUT", cookie, params: { id }, body: { baseRevision: 1, arm: sampleArm({ name: "Renamed" }) } });
    expect((await put(acc.viewer)).status).toBe(403);
    expect((await call(armById.DELETE, `/api/arms/${id}`, { method: "DELETE", cookie: acc.viewer, params: { id } })).status).toBe(403);
    const ok = await put(acc.admin);
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ id, revision: 2, arm: { name: "Renamed" } });
  });

  it("404 on an unknown id for every per-arm endpoint", async () => {
    const id = "does-not-exist";
    const o = { cookie: acc.editor, params: { id } };
    expect((await call(armById.GET, `/api/arms/${id}`, o)).status).toBe(404);
    expect((await call(armById.PUT, `/api/arms/${id}`, { ...o, method: "PUT", body: { baseRevision: 1, arm: sampleArm() } })).status).toBe(404);
    expect((await call(armById.DELETE, `/api/arms/${id}`, { ...o, method: "DELETE" })).status).toBe(404);
    expect((await call(armRestore.POST, `/api/arms/${id}/restore`, { ...o, method: "POST" })).status).toBe(404);
    expect((await call(armRevisions.GET, `/api/arms/${id}/revisions`, o)).status).toBe(404);
    expect((await call(armExport.GET, `/api/arms/${id}/export`, o)).status).toBe(404);
    const rev = await call(armRevision.GET, `/api/arms/${id}/revisions/1`, { cookie: acc.editor, params: { id, rev: "1" } });
    expect(rev.status).toBe(404);
    expect(rev.body.error.code).toBe("not-found");
  });

  it("409 on a stale update, with what changed between base and current", async () => {
    const id = (await createArm(acc.editor)).body.id as string;
    const theirs = sampleArm();
    theirs.joints[0].maxSpeed = 2.5;
    expect((await call(armById.PUT, `/api/arms/${id}`, { method: "PUT", cookie: acc.editor, params: { id }, body: { baseRevision: 1, arm: theirs } })).status).toBe(200);
    const r = await call(armById.PUT, `/api/arms/${id}`, { method: "PUT", cookie: acc.admin, params: { id }, body: { baseRevision: 1, arm: sampleArm({ name: "Mine" }) } });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe("conflict");
    expect(r.body.error.conflict).toMatchObject({ baseRevision: 1, currentRevision: 2, current: { name: "Test arm TA-3" } });
    expect(r.body.error.conflict.changes).toEqual([{ path: "joints.0.maxSpeed", base: 3, current: 2.5 }]);
  });

  it("soft delete, list filters and restore; revision history and a single revision", async () => {
    const id = (await createArm(acc.editor, sampleArm({ name: "Short-lived" }))).body.id as string;
    await call(armById.PUT, `/api/arms/${id}`, { method: "PUT", cookie: acc.editor, params: { id }, body: { baseRevision: 1, arm: sampleArm({ name: "Short-lived v2" }) } });
    const del = await call(armById.DELETE, `/api/arms/${id}`, { method: "DELETE", cookie: acc.editor, params: { id } });
    expect(del.status).toBe(200);
    expect(del.body.deletedAt).toEqual(expect.any(String));
    const ids = async (query: string) => (await call(arms.GET, "/api/arms", { cookie: acc.viewer, query })).body.arms.map((a: { id: string }) => a.id);
    expect(await ids("")).not.toContain(id);
    expect(await ids("?deleted=only")).toEqual([id]);
    expect(await ids("?deleted=include")).toContain(id);
    expectFieldError(await call(arms.GET, "/api/arms", { cookie: acc.viewer, query: "?deleted=maybe" }), "deleted");

    const res = await call(armRestore.POST, `/api/arms/${id}/restore`, { method: "POST", cookie: acc.editor, params: { id } });
    expect(res.status).toBe(200);
    expect(res.body.deletedAt).toBeNull();
    expect(await ids("")).toContain(id);

    const hist = await call(armRevisions.GET, `/api/arms/${id}/revisions`, { cookie: acc.viewer, params: { id } });
    expect(hist.body.revisions.map((r: { revision: number; summary: string }) => [r.revision, r.summary])).toEqual([
      [2, "changed name"],
      [1, "created"],
    ]);
    expect(hist.body.revisions[0].author).toEqual({ id: acc.ids.editor, name: "Ed Editor" });
    const one = await call(armRevision.GET, `/api/arms/${id}/revisions/1`, { cookie: acc.viewer, params: { id, rev: "1" } });
    expect(one.status).toBe(200);
    expect(one.body).toMatchObject({ revision: 1, arm: { name: "Short-lived" }, author: { name: "Ed Editor" } });
    expect((await call(armRevision.GET, `/api/arms/${id}/revisions/x`, { cookie: acc.viewer, params: { id, rev: "x" } })).status).toBe(404);
  });

  it("export is an attachment holding the arm document; importing it makes an equal arm", async () => {
    const original = sampleArm({ description: "round trip", specs: { ipCode: "ip67", reach: 0.7 } });
    const id = (await createArm(acc.editor, original)).body.id as string;
    const ex = await call(armExport.GET, `/api/arms/${id}/export`, { cookie: acc.viewer, params: { id } });
    expect(ex.status).toBe(200);
    expect(ex.res.headers.get("content-disposition")).toBe('attachment; filename="Test-arm-TA-3.arm.json"');
    expect(ex.res.headers.get("content-type")).toMatch(/^application\/json/);
    expect(ex.body.specs.ipCode).toBe("IP67"); // normalised on the way in

    const im = await call(armImport.POST, "/api/arms/import", { cookie: acc.editor, body: JSON.stringify(ex.body) });
    expect(im.status).toBe(201);
    expect(im.body.id).not.toBe(id);
    expect(im.body.revision).toBe(1);
    const back = await call(armById.GET, `/api/arms/${im.body.id}`, { cookie: acc.viewer, params: { id: im.body.id } });
    expect(back.body.arm).toEqual(ex.body);
    const hist = await call(armRevisions.GET, "", { cookie: acc.viewer, params: { id: im.body.id } });
    expect(hist.body.revisions[0].summary).toBe("imported");
    expect((await call(armImport.POST, "/api/arms/import", { cookie: acc.viewer, body: ex.body })).status).toBe(403);
  });
});

describe("requirement sets API", () => {
  it("create, list, update with conflict, export and import", async () => {
    expect((await call(reqs.GET, "/api/requirements")).status).toBe(401);
    expect((await call(reqs.POST, "/api/requirements", { cookie: acc.viewer, body: sampleRequirementSet() })).status).toBe(403);
    const c = await call(reqs.POST, "/api/requirements", { cookie: acc.editor, body: sampleRequirementSet() });
    expect(c.status).toBe(201);
    const id = c.body.id as string;
    expect(c.body.requirementSet.weights.coverage).toBe(4);

    const list = await call(reqs.GET, "/api/requirements", { cookie: acc.viewer });
    expect(list.body.requirementSets).toEqual([
      expect.objectContaining({ id, name: "Test cell: pick and place", targets: 2, paths: 0, revision: 1, deletedAt: null, updatedBy: { id: acc.ids.editor, name: "Ed Editor" } }),
    ]);

    const put = (body: unknown) => call(reqById.PUT, `/api/requirements/${id}`, { method: "PUT", cookie: acc.editor, params: { id }, body });
    expect((await put({ baseRevision: 1, requirementSet: sampleRequirementSet({ name: "Cell v2" }) })).status).toBe(200);
    const stale = await put({ baseRevision: 1, requirementSet: sampleRequirementSet({ description: "x" }) });
    expect(stale.status).toBe(409);
    expect(stale.body.error.conflict.changes).toEqual([{ path: "name", base: "Test cell: pick and place", current: "Cell v2" }]);
    expectFieldError(await put({ baseRevision: 2, requirementSet: sampleRequirementSet({ targets: [{ name: "t", position: [0, 0], rpy: [0, 0, 0], mode: "fly" }] }) }), "requirementSet.targets.0.mode");
    expectFieldError(await put({ baseRevision: 2, requirementSet: sampleRequirementSet({ targets: [{ name: "t", position: [0, 0], rpy: [0, 0, 0], mode: "pose" }] }) }), "requirementSet.targets.0.position");

    const ex = await call(reqExport.GET, "", { cookie: acc.viewer, params: { id } });
    expect(ex.res.headers.get("content-disposition")).toBe('attachment; filename="Cell-v2.requirements.json"');
    const im = await call(reqImport.POST, "/api/requirements/import", { cookie: acc.editor, body: ex.body });
    expect(im.status).toBe(201);
    expect(im.body.requirementSet).toEqual(ex.body);
    expect((await call(reqRevisions.GET, "", { cookie: acc.viewer, params: { id } })).body.revisions).toHaveLength(2);
    expect((await call(reqById.GET, "", { cookie: acc.viewer, params: { id: "nope" } })).status).toBe(404);
  });
});
