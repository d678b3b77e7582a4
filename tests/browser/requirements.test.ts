// The requirement-set editor through the browser: a set with targets and a path, saved and read back.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

const ADMIN = { email: "rita@example.test", name: "Rita Cell", password: "a long planner passphrase" };

describe("requirement-set editor", () => {
  let h: Harness;
  let a: Browser;
  let t: TrackedPage;

  beforeAll(async () => {
    h = await startHarness();
    a = await h.browser();
    t = await a.open("/signup");
    await signUp(t, ADMIN);
  });
  afterAll(async () => {
    await h?.close();
  });

  it("creates a set with targets and a path, and reads it back in mm and degrees", async () => {
    const p = t.page;
    await p.goto("/requirements");
    await p.getByRole("link", { name: "New requirement set" }).click();
    await p.waitForURL("**/requirements/new");
    await p.getByTestId("rpy-convention").getByText("R = Rz(yaw)·Ry(pitch)·Rx(roll)", { exact: false }).waitFor();

    await p.getByLabel("Name", { exact: true }).fill("Bench screwdriving cell");
    const base = p.getByTestId("base");
    await base.getByLabel("z", { exact: true }).fill("750");
    await p.getByLabel("Payload mass", { exact: true }).fill("1.5");
    await p.getByLabel("Payload CoG z", { exact: true }).fill("40");

    await p.getByRole("button", { name: "Add target" }).click();
    await p.getByRole("button", { name: "Add target" }).click();
    await p.getByLabel("target 1 name").fill("Screw A");
    await p.getByLabel("target 1 x (mm)").fill("420");
    await p.getByLabel("target 1 y (mm)").fill("-80");
    await p.getByLabel("target 2 name").fill("Screw B");
    await p.getByLabel("target 2 constraint mode").selectOption("axis");
    await p.getByLabel("target 2 Fz (N)").fill("-60");

    await p.getByRole("button", { name: "Add path" }).click();
    await p.getByRole("button", { name: "Add waypoint to path 1" }).click();
    await p.getByLabel("path 1 waypoint 3 x (mm)").fill("350");
    await p.getByLabel("Required tool speed", { exact: true }).fill("150");

    await p.getByRole("button", { name: "Add spec requirement" }).click();
    await p.getByLabel("spec requirement 1 field").selectOption("reach");
    await p.getByLabel("spec requirement 1 value (mm)").fill("600");

    // A duplicate target name is refused, naming both rows; the typed values stay.
    await p.getByLabel("target 2 name").fill("Screw A");
    await p.getByRole("button", { name: "Create requirement set" }).click();
    await p.getByTestId("error-summary").getByText('target name "Screw A" is used twice (rows 1 and 2)', { exact: false }).waitFor();
    expect(await p.getByLabel("target 1 x (mm)").inputValue()).toBe("420");
    await p.getByLabel("target 2 name").fill("Screw B");

    await p.getByRole("button", { name: "Create requirement set" }).click();
    await p.waitForURL(/\/requirements\/[0-9a-f-]{36}/);
    await p.getByText("revision 1", { exact: true }).waitFor();
    const id = new URL(p.url()).pathname.split("/")[2];

    // Read back through the page and through the API (SI units there).
    expect(await p.getByLabel("target 1 x (mm)").inputValue()).toBe("420");
    expect(await p.getByLabel("target 2 constraint mode").inputValue()).toBe("axis");
    expect(await p.getByLabel("path 1 waypoint 3 x (mm)").inputValue()).toBe("350");
    expect(await p.getByLabel("spec requirement 1 value (mm)").inputValue()).toBe("600");
    const saved = await p.evaluate(async (rid) => (await (await fetch(`/api/requirements/${rid}`)).json()).requirementSet, id);
    expect(saved.targets.map((x: { name: string }) => x.name)).toEqual(["Screw A", "Screw B"]);
    expect(saved.targets[0].position[0]).toBeCloseTo(0.42, 12);
    expect(saved.targets[1].force).toEqual([0, 0, -60]);
    expect(saved.paths[0].waypoints).toHaveLength(3);
    expect(saved.paths[0].speed).toBeCloseTo(0.15, 12);
    expect(saved.specs[0]).toMatchObject({ field: "reach", comparator: "atLeast", priority: "must" });
    expect(saved.specs[0].value).toBeCloseTo(0.6, 12);
    expect(saved.base[11]).toBeCloseTo(0.75, 12);
    // Default target orientation roll 180°: the rotation block is diag(1, −1, −1).
    expect(saved.targets[0].rpy[0]).toBeCloseTo(Math.PI, 12);

    await p.goto("/requirements");
    const row = p.getByTestId("requirement-table").locator("tbody tr", { hasText: "Bench screwdriving cell" });
    expect(await row.innerText()).toMatch(/2\s+1\s+1/);
    expect(t.errors()).toEqual([]);
  });
});
