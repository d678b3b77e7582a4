import { describe, expect, it } from "vitest";
import { checkSpec, compareIpAtLeast, parseIpCode, waterCovers } from "@/lib/analysis/spec";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { specRequirementSchema, type SpecRequirement } from "@/shared/schemas/requirements";

// IEC 60529 digit meanings (from memory; the standard's text was not read): numerals up to 6
// imply the lower ones; a water numeral 7 or 8 does not imply 5 or 6 (jets) unless dual-marked.
const IP_TABLE: [string, string, "meets" | "fails" | "unknown"][] = [
  ["IP67", "IP65", "fails"], // 7 (immersion) does not imply 5 (jets)
  ["IP65", "IP67", "fails"],
  ["IP67", "IPX6", "fails"],
  ["IP68", "IPX5", "fails"],
  ["IP65/IP67", "IP65", "meets"], // dual-marked
  ["IP65/67", "IP67", "meets"],
  ["IP66", "IP65", "meets"], // 6 implies 5
  ["IP65", "IP66", "fails"],
  ["IP54", "IP54", "meets"],
  ["IP65", "IP54", "meets"],
  ["IP54", "IP64", "fails"],
  ["IP67", "IP54", "meets"], // 7 implies 4 (only the jets are excepted)
  ["IP68", "IPX7", "meets"], // 8 is beyond 7
  ["IP67", "IPX8", "fails"],
  ["IP6X", "IP65", "unknown"], // water not tested
  ["IPX7", "IP54", "unknown"], // solids not tested
  ["IP6X", "IP6X", "meets"],
  ["IP69K", "IPX9", "meets"],
  ["IP69K", "IP65", "fails"], // 9 implies no other numeral
  ["IP40", "IP4X", "meets"],
  ["IP20", "IP21", "fails"],
];

describe("IP codes digit by digit (IEC 60529)", () => {
  for (const [arm, req, verdict] of IP_TABLE) {
    it(`${arm} against required ${req}: ${verdict}`, () => {
      expect(compareIpAtLeast(parseIpCode(arm)!, parseIpCode(req)!).verdict).toBe(verdict);
    });
  }
  it("water numeral coverage table", () => {
    const covers = (h: number) => [0, 1, 2, 3, 4, 5, 6, 7, 8, 9].filter((n) => waterCovers(h, n));
    expect(covers(4)).toEqual([0, 1, 2, 3, 4]);
    expect(covers(6)).toEqual([0, 1, 2, 3, 4, 5, 6]);
    expect(covers(7)).toEqual([0, 1, 2, 3, 4, 7]);
    expect(covers(8)).toEqual([0, 1, 2, 3, 4, 7, 8]);
    expect(covers(9)).toEqual([0, 9]);
  });
  it("parses letters and rejects nonsense", () => {
    expect(parseIpCode("ip54d")).toMatchObject({ solid: 5, water: [4] });
    expect(parseIpCode("IP7X")).toBeNull();
    expect(parseIpCode("IP65/IP57")).toBeNull();
  });
});

const arm: ArmDocument = armSchema.parse({
  name: "Test arm", convention: "dh",
  joints: Array.from({ length: 6 }, () => ({ type: "revolute", a: 0.1, alpha: 0, d: 0, theta: 0, min: -3, max: 3 })),
  specs: { ratedPayload: 8, reach: 1.3, repeatability: 3e-5, ipCode: "IP67", mounting: ["floor", "ceiling"], price: 30000, currency: "EUR" },
});
const req = (r: unknown): SpecRequirement => specRequirementSchema.parse(r);

describe("checkSpec", () => {
  it("numbers compare in SI with units, lengths shown in mm", () => {
    const r = checkSpec(arm, req({ field: "reach", comparator: "atLeast", value: 1.2, priority: "must" }), 0);
    expect(r).toMatchObject({ verdict: "meets", value: 1.3, unit: "m", valueDisplay: "1300", displayUnit: "mm" });
    expect(checkSpec(arm, req({ field: "repeatability", comparator: "atMost", value: 2e-5, priority: "want" }), 1).verdict).toBe("fails");
    expect(checkSpec(arm, req({ field: "axes", comparator: "equals", value: 6, priority: "must" }), 2).verdict).toBe("meets");
    expect(checkSpec(arm, req({ field: "ratedPayload", comparator: "atLeast", value: 8, priority: "must" }), 3).verdict).toBe("meets");
  });
  it("missing data is unknown, never a pass", () => {
    for (const r of [
      { field: "armMass", comparator: "atMost", value: 50, priority: "must" },
      { field: "collaborative", comparator: "equals", value: true, priority: "want" },
      { field: "leadTimeWeeks", comparator: "atMost", value: 12, priority: "want" },
    ]) expect(checkSpec(arm, req(r), 0).verdict).toBe("unknown");
    const bare = { ...arm, specs: {} };
    expect(checkSpec(bare, req({ field: "ipCode", comparator: "atLeast", value: "IP54", priority: "must" }), 0).verdict).toBe("unknown");
    expect(checkSpec(bare, req({ field: "mounting", comparator: "includes", value: "wall", priority: "must" }), 0).verdict).toBe("unknown");
  });
  it("mounting by inclusion and IP codes by the IEC rule", () => {
    expect(checkSpec(arm, req({ field: "mounting", comparator: "includes", value: "ceiling", priority: "must" }), 0).verdict).toBe("meets");
    expect(checkSpec(arm, req({ field: "mounting", comparator: "includes", value: "wall", priority: "must" }), 0).verdict).toBe("fails");
    const ip = checkSpec(arm, req({ field: "ipCode", comparator: "atLeast", value: "IP65", priority: "must" }), 0);
    expect(ip.verdict).toBe("fails");
    expect(ip.reason).toMatch(/jets/);
    expect(checkSpec(arm, req({ field: "ipCode", comparator: "equals", value: "IP67", priority: "must" }), 0).verdict).toBe("meets");
  });
});
