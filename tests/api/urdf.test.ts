// URDF through the API: the preview answers the arm and the import report without saving; the arm
// is saved through /api/arms/import with its source; hostile files are a 400 naming the element
// (never a 500); the export is URDF that reads back to the same forward kinematics (the product's
// FK, checked against Orocos KDL in tests/reference/urdf_kdl.test.ts).
import { readFileSync } from "node:fs";
import path from "node:path";
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import * as arms from "@/app/api/arms/route";
import * as armImport from "@/app/api/arms/import/route";
import * as urdfPreview from "@/app/api/arms/urdf/route";
import * as urdfExport from "@/app/api/arms/[id]/urdf/route";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { importUrdf } from "@/lib/urdf";
import { call } from "./client";
import { withAccounts } from "./setup";
import { maxAbsDiff } from "../helpers/fd";

const twin = readFileSync(path.join(__dirname, "../reference/urdf/twin-branch.urdf"), "utf8");
const { acc } = withAccounts();

const preview = (body: unknown, cookie = acc.editor) => call(urdfPreview.POST, "/api/arms/urdf", { cookie, body });

describe("POST /api/arms/urdf (preview)", () => {
  it("answers the arm, the joint table, the candidates and what was merged or skipped; saves nothing", async () => {
    const before = (await call(arms.GET, "/api/arms", { cookie: acc.editor })).body.arms.length;
    const r = await preview({ fileName: "twin-branch.urdf", text: twin, tip: "right_tool" });
    expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBe(200);
    expect(r.body.arm.convention).toBe("chain");
    expect(r.body.arm.source).toEqual({ format: "urdf", file: "twin-branch.urdf", sha256: createHash("sha256").update(twin).digest("hex"), baseLink: "pedestal", tipLink: "right_tool" });
    expect(r.body.report.joints.map((j: { name: string }) => j.name)).toEqual(["waist", "right_shoulder", "right_elbow", "right_twist", "right_bend"]);
    expect(r.body.report.tipCandidates.map((c: { link: string }) => c.link)).toContain("left_tip");
    expect(r.body.report.merged.join("\n")).toMatch(/right_tool_joint/);
    expect(r.body.report.skipped.join("\n")).toMatch(/left_upper/);
    expect((await call(arms.GET, "/api/arms", { cookie: acc.editor })).body.arms.length).toBe(before);
  });

  it("viewers may not import (403), anonymous 401", async () => {
    expect((await preview({ fileName: "x.urdf", text: twin }, acc.viewer)).status).toBe(403);
    expect((await preview({ fileName: "x.urdf", text: twin }, "")).status).toBe(401);
  });

  it.each([
    ["billion laughs", `<!DOCTYPE r [<!ENTITY a "aaaa"><!ENTITY b "&a;&a;&a;&a;">]><robot name="&b;"/>`, /<!DOCTYPE> \(line 1\): DOCTYPE and entity declarations are refused/],
    ["external entity", `<!DOCTYPE r [<!ENTITY x SYSTEM "file:///etc/passwd">]><robot name="&x;"/>`, /<!DOCTYPE>/],
    ["10 000 joints", `<robot name="x">${'<joint name="j" type="fixed"><parent link="a"/><child link="b"/></joint>'.repeat(10_000)}</robot>`, /<joint>: the file has more than 400 joint elements/],
    ["a cycle", `<robot name="x"><link name="r"/><link name="a"/><link name="b"/><joint name="ab" type="fixed"><parent link="a"/><child link="b"/></joint><joint name="ba" type="fixed"><parent link="b"/><child link="a"/></joint></robot>`, /closes a cycle/],
    ["a missing parent link", `<robot name="x"><link name="b"/><joint name="j" type="fixed"><parent link="ghost"/><child link="b"/></joint></robot>`, /joint "j" <parent>: link "ghost" does not exist/],
    ["two roots", `<robot name="x"><link name="a"/><link name="b"/></robot>`, /the description has 2 root links/],
    ["a mimic joint", twin, /joint "finger_b_joint" <mimic>/],
    ["NaN", `<robot name="x"><link name="a"><inertial><mass value="NaN"/></inertial></link></robot>`, /<mass> value: "NaN" is not a number/],
    ["an empty file", "", /file: is empty/],
    ["not XML", "{\"name\": 1}", /is not well-formed XML/],
  ])("%s → 400 naming the element, quickly", async (label, text, message) => {
    const start = performance.now();
    const r = await preview({ fileName: "bad.urdf", text, ...(label === "a mimic joint" ? { tip: "finger_b" } : {}) });
    const ms = performance.now() - start;
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("validation");
    expect(r.body.error.fieldErrors[0].path).toBe("text");
    expect(r.body.error.message).toMatch(/^bad\.urdf: /);
    expect(r.body.error.message).toMatch(message);
    expect(ms).toBeLessThan(10_000); // a hang guard only; timings are in npm run bench
  });

  it("a 20 MB file is refused by the body limit before it is read, a 2.5 MB one by the URDF limit", async () => {
    const huge = await preview({ fileName: "huge.urdf", text: " ".repeat(20 * 1024 * 1024) });
    expect(huge.status).toBe(400);
    expect(huge.body.error.message).toMatch(/the limit is 3,145,728 bytes \(3 MiB\)/);
    const big = await preview({ fileName: "big.urdf", text: `<robot name="x">${" ".repeat(2_500_000)}</robot>` });
    expect(big.status).toBe(400);
    expect(big.body.error.message).toMatch(/^big\.urdf: file: is 2,500,024 bytes; the limit is 2 MiB/);
  });

  it("a missing file name or text is a field error", async () => {
    const r = await preview({ text: twin });
    expect(r.status).toBe(400);
    expect(r.body.error.fieldErrors[0].path).toBe("fileName");
  });
});

describe("saving an imported arm and exporting it", () => {
  it("the previewed arm saves through /api/arms/import with its source, and exports as URDF that reads back to the same FK", async () => {
    const p = await preview({ fileName: "twin-branch.urdf", text: twin, base: "torso", tip: "left_tip" });
    const saved = await call(armImport.POST, "/api/arms/import", { cookie: acc.editor, body: p.body.arm });
    expect(saved.status).toBe(201);
    expect(saved.body.arm.source.sha256).toMatch(/^[0-9a-f]{64}$/);
    const ex = await call(urdfExport.GET, `/api/arms/${saved.body.id}/urdf`, { cookie: acc.viewer, params: { id: saved.body.id } });
    expect(ex.status).toBe(200);
    expect(ex.res.headers.get("content-type")).toBe("application/xml; charset=utf-8");
    expect(ex.res.headers.get("content-disposition")).toBe('attachment; filename="twin_branch.urdf"');
    const back = importUrdf(ex.body as string).arm;
    const a = createModel(saved.body.arm), b = createModel(back);
    const da = createData(a), db = createData(b);
    const q = [0.5, -1.2, 0.7];
    forwardKinematics(a, da, q);
    forwardKinematics(b, db, q);
    expect(maxAbsDiff(da.toolPose, db.toolPose)).toBeLessThan(1e-12);
    expect((await call(urdfExport.GET, "/api/arms/nope/urdf", { cookie: acc.viewer, params: { id: "nope" } })).status).toBe(404);
  });
});
