// Malformed input never causes a 500: every case is a 400 with a field-level error naming the field.
import { beforeAll, describe, expect, it } from "vitest";
import { sampleArm, sampleRequirementSet } from "../db/helpers";
import * as arms from "@/app/api/arms/route";
import * as armById from "@/app/api/arms/[id]/route";
import * as reqs from "@/app/api/requirements/route";
import { call, expectFieldError, type Body } from "./client";
import { withAccounts } from "./setup";

const { acc, t } = withAccounts();
let armId: string;
beforeAll(async () => {
  armId = (await call(arms.POST, "/api/arms", { cookie: acc.editor, body: sampleArm() })).body.id;
});

const post = (body: unknown, headers?: Record<string, string>) => call(arms.POST, "/api/arms", { cookie: acc.editor, body, headers });
const withJoint0 = (patch: Record<string, unknown>) => {
  const arm: Body = sampleArm();
  arm.joints[0] = { ...arm.joints[0], ...patch };
  return arm;
};

describe("arm validation over the API", () => {
  it('"NaN" as a string where a number goes', async () => {
    expectFieldError(await post(withJoint0({ a: "NaN" })), "joints.0.a", /must be a number/);
  });

  it("NaN through JSON.stringify (which writes null)", async () => {
    const text = JSON.stringify(withJoint0({ d: NaN }));
    expect(text).toContain('"d":null');
    expectFieldError(await post(text), "joints.0.d", /must be a number/);
  });

  it("Infinity written as 1e999 in the JSON text", async () => {
    const text = JSON.stringify(withJoint0({ theta: 12345 })).replace('"theta":12345', '"theta":1e999');
    expect(text).toContain("1e999");
    expectFieldError(await post(text), "joints.0.theta", /finite|number/);
  });

  it("strings where numbers go, and a wrong joint type", async () => {
    const r = await post(withJoint0({ min: "-3", max: "three", type: "hinge" }));
    expectFieldError(r, "joints.0.min", /must be a number/);
    expectFieldError(r, "joints.0.max", /must be a number/);
    expectFieldError(r, "joints.0.type", /revolute or prismatic/);
  });

  it("min above max names the joint and both values in degrees", async () => {
    const arm: Body = sampleArm();
    arm.joints[2] = { ...arm.joints[2], min: (20 * Math.PI) / 180, max: (-10 * Math.PI) / 180 };
    expectFieldError(await post(arm), "joints.2.max", /^joint 3 max \(-10\.0°\) is below min \(20\.0°\)$/);
  });

  it("zero joints and 50 joints", async () => {
    expectFieldError(await post(sampleArm({ joints: [] })), "joints", /at least 1 joint/);
    const fifty = Array.from({ length: 50 }, () => sampleArm().joints[0]);
    expectFieldError(await post(sampleArm({ joints: fifty })), "joints", /at most 12 joints/);
  });

  it("a 10 MB body is refused with its declared size and the limit, or as more than the limit when streamed", async () => {
    const big = JSON.stringify({ ...sampleArm(), description: "x".repeat(10 * 1024 * 1024) });
    const size = Buffer.byteLength(big).toLocaleString("en-GB");
    expect(size).toMatch(/^10,48\d,\d{3}$/);
    const message = new RegExp(`^request body is ${size} bytes; the limit is 1,048,576 bytes \\(1 MiB\\)$`);
    const declared = await post(big, { "content-length": String(Buffer.byteLength(big)) });
    expectFieldError(declared, "", message);
    const streamed = await call(arms.POST, "/api/arms", {
      cookie: acc.editor,
      body: big,
    });
    expectFieldError(streamed, "", /^request body is more than 1,048,576 bytes; the limit is 1,048,576 bytes \(1 MiB\)$/);
  });

  it("100 000 levels of nesting (arrays and objects)", async () => {
    const depth = 100_000;
    expectFieldError(await post("[".repeat(depth) + "]".repeat(depth)), "", /nested more than 64 levels/);
    const objects = '{"a":'.repeat(depth) + "1" + "}".repeat(depth);
    expectFieldError(await post(objects), "", /nested more than 64 levels/);
    const inDoc = JSON.stringify(sampleArm()).replace('"convention":"dh"', `"convention":${"[".repeat(depth)}${"]".repeat(depth)}`);
    expectFieldError(await post(inDoc), "", /nested/);
  });

  it("a top level that is not an object", async () => {
    for (const body of ["[1,2,3]", '"an arm"', "42", "null", "true"]) {
      expectFieldError(await post(body), "", /expected a JSON object, got/);
    }
  });

  it("text that is not JSON is bad-json", async () => {
    const r = await post('{"name": NaN}');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("bad-json");
    expect(r.body.error.fieldErrors[0]).toEqual({ path: "", message: expect.stringMatching(/^request body is not valid JSON.*Unexpected token 'N'/) });
    const late = await post('{\n  "name": "x",\n  "joints": [1,, 2]\n}');
    expect(late.body.error.code).toBe("bad-json");
    expect((await post("")).body.error.code).toBe("bad-json");
    expect((await post('{"name": "unterminated')).body.error.code).toBe("bad-json");
  });

  it("an update body: missing baseRevision, a wrong arm, a non-integer revision", async () => {
    const put = (body: unknown) => call(armById.PUT, `/api/arms/${armId}`, { method: "PUT", cookie: acc.editor, params: { id: armId }, body });
    expectFieldError(await put({ arm: sampleArm() }), "baseRevision");
    expectFieldError(await put({ baseRevision: 1.5, arm: sampleArm() }), "baseRevision", /integer/);
    expectFieldError(await put({ baseRevision: "1", arm: sampleArm() }), "baseRevision");
    expectFieldError(await put({ baseRevision: 1 }), "arm");
    const arm: Body = sampleArm();
    arm.joints[1].maxTorque = -5;
    expectFieldError(await put({ baseRevision: 1, arm }), "arm.joints.1.maxTorque", /> 0/);
    expectFieldError(await put({ baseRevision: 1, arm: sampleArm({ tool: [1, 0, 0] }) }), "arm.tool", /16 numbers/);
    expectFieldError(await put({ baseRevision: 1, arm: sampleArm({ specs: { ipCode: "waterproof" } }) }), "arm.specs.ipCode", /IP code/);
  });

  it("requirement sets: a wrong top level and bad fields", async () => {
    const rp = (body: unknown) => call(reqs.POST, "/api/requirements", { cookie: acc.editor, body });
    expectFieldError(await rp("[]"), "", /expected a JSON object/);
    const r = await rp({ name: "", base: [1, 2], tool: {}, payload: { mass: "heavy", cog: [0, 0, 0] }, targets: [], paths: [], specs: [] });
    expectFieldError(r, "name");
    expectFieldError(r, "base", /16 numbers/);
    expectFieldError(r, "tool.tcp");
    expectFieldError(r, "payload.mass", /must be a number/);
  });

  it("collision geometry: negative radius, zero size, unknown and duplicate names, NaN capsule ends, bad link numbers", async () => {
    expectFieldError(await post(withJoint0({ collision: [{ from: [0, 0, 0], to: [0, null, 0.1], radius: 0.05 }] })), "joints.0.collision.0.to.1", /must be a number/);
    expectFieldError(await post(withJoint0({ collision: [{ from: [0, 0, 0], to: [0, 0, 0.1], radius: -0.05 }] })), "joints.0.collision.0.radius", /> 0/);
    expectFieldError(await post(sampleArm({ ignoredPairs: [[1, 40]] })), "ignoredPairs.0.1", /names link 40/);
    expectFieldError(await post(sampleArm({ baseCollision: [{ from: "origin", to: [0, 0, 0.1], radius: 0.1 }] })), "baseCollision.0.from");
    const rp = (body: unknown) => call(reqs.POST, "/api/requirements", { cookie: acc.editor, body });
    const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
    const r = await rp(sampleRequirementSet({
      cell: {
        clearance: -1,
        obstacles: [
          { name: "bench", shape: "box", pose: I, size: [1, 0, 0.04] },
          { name: "bench", shape: "sphere", center: [0, 0, 0], radius: 0.1 },
          { name: "post", shape: "cylinder", pose: [1, 2, 3], radius: 0.05, length: 1 },
        ],
      },
    }));
    expectFieldError(r, "cell.clearance", /≥ 0/);
    expectFieldError(r, "cell.obstacles.0.size.1", /> 0/);
    expectFieldError(r, "cell.obstacles.2.pose", /16 numbers/);
    const dup = await rp(sampleRequirementSet({ cell: { obstacles: [{ name: "bench", shape: "sphere", center: [0, 0, 0], radius: 0.1 }, { name: "bench", shape: "sphere", center: [1, 0, 0], radius: 0.1 }] } }));
    expectFieldError(dup, "cell.obstacles.1.name", /used twice/);
    const req = sampleRequirementSet();
    const contact = await rp({ ...req, targets: req.targets.map((t: Body, i: number) => (i === 0 ? { ...t, contact: ["ghost"] } : t)) });
    expectFieldError(contact, "targets.0.contact.0", /no obstacle of that name/);
  });

  it("a file with the earlier obstacles imports, converted, with a notice", async () => {
    const imp = await import("@/app/api/requirements/import/route");
    const r = await call(imp.POST, "/api/requirements/import", { cookie: acc.editor, body: sampleRequirementSet({ name: "earlier obstacles", obstacles: [{ shape: "box", center: [0.3, 0, 0.1], size: [0.1, 0.1, 0.1] }] }) });
    expect(r.status).toBe(201);
    expect(r.body.notices[0]).toMatch(/1 obstacle in the earlier form/);
    expect(r.body.requirementSet.cell.obstacles[0]).toEqual({ name: "obstacle 1", shape: "box", pose: [1, 0, 0, 0.3, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], size: [0.1, 0.1, 0.1] });
    expect(r.body.requirementSet.obstacles).toBeUndefined();
  });

  it("nothing invalid was stored", async () => {
    const list = await call(arms.GET, "/api/arms", { cookie: acc.viewer, query: "?deleted=include" });
    expect(list.body.arms).toHaveLength(1);
    expect(await t.client.armRevision.count()).toBe(1);
  });
});
