// URDF through the browser: a hostile file is refused in the import panel, an invented tree is
// imported with a chosen tip (preview, merged and skipped items, a suggested capsule accepted),
// saved, run in a shortlist, and exported; the export reads back to the same forward kinematics
// (the product's FK, checked against Orocos KDL in tests/reference/urdf_kdl.test.ts).
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { importUrdf } from "@/lib/urdf";
import type { ArmDocument } from "@/shared/schemas";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

const ROOT = path.resolve(__dirname, "..", "..");
const USER = { email: "urdf@example.test", name: "Uma Importer", password: "a long import passphrase" };
const SCENARIO = "Bench assembly: sensor housing press-fit";

describe("URDF import and export in the browser", () => {
  let h: Harness;
  let b: Browser;
  let t: TrackedPage;
  let tmp = "";
  let armId = "";

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "armsift-urdf-"));
    h = await startHarness();
    b = await h.browser();
    t = await b.open("/signup");
    await signUp(t, USER);
  });
  afterAll(async () => {
    await h?.close();
  });

  it("refuses a hostile file in the import panel, naming the element", async () => {
    const p = t.page;
    await p.goto("/arms");
    await p.getByRole("button", { name: "Import URDF…" }).click();
    const panel = p.getByTestId("urdf-import");
    const bad = path.join(tmp, "laughs.urdf");
    writeFileSync(bad, '<?xml version="1.0"?>\n<!DOCTYPE r [<!ENTITY a "aaaa"><!ENTITY b "&a;&a;&a;">]>\n<robot name="&b;"/>\n');
    t.expect(/400/);
    await panel.getByLabel("URDF file").setInputFiles(bad);
    await panel.getByTestId("urdf-error").getByText("laughs.urdf: <!DOCTYPE> (line 2): DOCTYPE and entity declarations are refused", { exact: false }).waitFor();
    expect(await panel.getByTestId("urdf-preview").count()).toBe(0);
  });

  it("imports a tree with a chosen tip: preview, merged and skipped items, a suggested capsule, save", async () => {
    const p = t.page;
    const panel = p.getByTestId("urdf-import");
    await panel.getByLabel("URDF file").setInputFiles(path.join(ROOT, "seed-data", "urdf", "offset-wrist-8.urdf"));
    await panel.getByTestId("urdf-chain").getByText("6 moving joints", { exact: false }).waitFor();
    // A tree: the second test file has two arms; choose the right arm's tool frame as the tip.
    await panel.getByLabel("URDF file").setInputFiles(path.join(ROOT, "tests", "reference", "urdf", "twin-branch.urdf"));
    await panel.getByTestId("urdf-chain").getByText("to link finger_a", { exact: false }).waitFor();
    await panel.getByLabel("Tip link (tool point)").selectOption("right_tool");
    await panel.getByTestId("urdf-chain").getByText("to link right_tool, 5 moving joints", { exact: false }).waitFor();
    const rows = panel.getByTestId("urdf-joints").locator("tbody tr");
    expect(await rows.count()).toBe(5);
    expect(await rows.nth(1).textContent()).toContain("right_shoulder");
    await panel.getByTestId("urdf-merged").getByText('fixed joint "right_tool_joint" merged into the tool transform', { exact: false }).waitFor();
    await panel.getByTestId("urdf-merged").getByText('link "camera" (fixed joint "camera_mount", off the chain) merged into link 1', { exact: false }).waitFor();
    await panel.getByTestId("urdf-skipped").getByText('link "left_upper" and 3 links below it', { exact: false }).waitFor();
    expect(await panel.getByRole("option", { name: /finger_b .*not usable: mimic joint "finger_b_joint"/ }).isDisabled()).toBe(true);

    // The mesh-described arm offers suggested capsules; accept one and save that arm.
    await panel.getByLabel("URDF file").setInputFiles(path.join(ROOT, "seed-data", "urdf", "offset-wrist-8.urdf"));
    await panel.getByTestId("urdf-skipped").getByText('link "upper_arm": 1 mesh collision shape', { exact: false }).waitFor();
    await panel.getByTestId("urdf-converted").getByText('continuous joint "wrist_3" → revolute joint with range −360° … +360°', { exact: false }).waitFor();
    await panel.getByTestId("urdf-suggestions").getByLabel(/link 2 \(upper_arm\)/).check();
    await panel.getByRole("button", { name: "Save arm" }).click();
    await p.waitForURL(/\/arms\/[0-9a-f-]{36}$/);
    armId = new URL(p.url()).pathname.split("/")[2];
    await p.getByTestId("arm-source").getByText("offset-wrist-8.urdf", { exact: false }).waitFor();
    expect(await p.getByLabel("joint 1 origin z (mm)", { exact: true }).inputValue()).toBe("160");
    const saved = (await p.evaluate(async (id) => (await (await fetch(`/api/arms/${id}`)).json()).arm, armId)) as ArmDocument;
    expect(saved.convention).toBe("chain");
    expect(saved.source?.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(saved.joints[1].collision).toHaveLength(1);
    expect(t.errors()).toEqual([]);
  });

  it("runs a shortlist with the imported arm", async () => {
    const p = t.page;
    await p.goto("/shortlists/new");
    await p.getByLabel("Name", { exact: true }).fill("Imported arm check");
    await p.getByLabel("Requirement set").selectOption({ label: `${SCENARIO} (rev 1; 9 targets, 0 paths)` });
    await p.getByLabel("Choose Offset Wrist 8").first().check();
    await p.getByRole("button", { name: "Create shortlist and analyse" }).click();
    await p.waitForURL(/\/shortlists\/[0-9a-f-]{36}$/);
    await p.getByTestId("ranking").waitFor({ timeout: 120_000 });
    await p.getByTestId("ranking").getByText("Offset Wrist 8", { exact: false }).first().waitFor();
    expect(t.errors()).toEqual([]);
  });

  it("exports the arm as URDF that imports back to the same forward kinematics", async () => {
    const p = t.page;
    await p.goto(`/arms/${armId}`);
    const link = p.getByRole("link", { name: "Export URDF" });
    expect(await link.getAttribute("href")).toBe(`/api/arms/${armId}/urdf`);
    const { text, arm } = (await p.evaluate(async (id) => ({ text: await (await fetch(`/api/arms/${id}/urdf`)).text(), arm: (await (await fetch(`/api/arms/${id}`)).json()).arm }), armId)) as { text: string; arm: ArmDocument };
    const back = importUrdf(text).arm;
    const ma = createModel(arm), mb = createModel(back), da = createData(ma), db = createData(mb);
    const q = [0.4, -1.1, 0.9, 0.3, -0.6, 2.0];
    forwardKinematics(ma, da, q);
    forwardKinematics(mb, db, q);
    for (let i = 0; i < 16; i++) expect(Math.abs(da.toolPose[i] - db.toolPose[i])).toBeLessThan(1e-12);
    expect(back.joints[1].collision).toEqual(arm.joints[1].collision?.map((c) => ({ ...c, from: c.from.map((v) => expect.closeTo(v, 12)), to: c.to.map((v) => expect.closeTo(v, 12)) })));
    // And the same file as the original description's FK.
    const original = importUrdf(readFileSync(path.join(ROOT, "seed-data", "urdf", "offset-wrist-8.urdf"), "utf8")).arm;
    const mo = createModel(original), dorig = createData(mo);
    forwardKinematics(mo, dorig, q);
    for (let i = 0; i < 16; i++) expect(Math.abs(dorig.toolPose[i] - db.toolPose[i])).toBeLessThan(1e-12);
  });
});
