// The stored form of a result (lib/analysis/compact.ts, docs/design.md#stored-results): a path's
// profiles keep at most PROFILE_POINTS samples, among them both ends and the worst sample of every
// profile, each kept value the full analysis's value at that sample; numbers keep 7 significant
// digits; the stored ranking is the ranking of the stored sub-scores; the split, compressed bytes
// read back to the same result.
import { describe, expect, it } from "vitest";
import { analyzeShortlist, compactArm, compactPath, compactResult, EVENTS_KEPT, keptSamples, PROFILE_POINTS, rerank, roundNumbers, type PathAnalysis } from "@/lib/analysis";
import { decodeArm, encodeResult } from "@/lib/analysis/stored";
import { largeShortlist } from "../../bench/large-shortlist";

// An invented shortlist whose paths are sampled finely (1000 samples each: the sample cap).
const { arms, requirementSet } = largeShortlist({ arms: 2, targets: 6, paths: 3, waypoints: 12, step: 1e-4 });
const inputs = arms.map((arm, i) => ({ id: `arm-${i + 1}`, revision: 1, arm }));
const full = analyzeShortlist(inputs, requirementSet);

/** Index of the smallest non-null entry, computed here for the check. */
const worst = (xs: (number | null)[]) => xs.reduce<number>((b, x, i) => (x !== null && (b < 0 || x < (xs[b] as number)) ? i : b), -1);

describe("stored form of a result", () => {
  it("keeps at most PROFILE_POINTS samples per path, both ends and the worst of every profile, with the full values there", () => {
    const paths = full.arms.flatMap((a) => a.paths);
    expect(paths.some((p) => p.samples > PROFILE_POINTS)).toBe(true);
    for (const p of paths) {
      const c = compactPath(p);
      const idx = c.profile.index!;
      expect(idx.length).toBeLessThanOrEqual(PROFILE_POINTS);
      expect(idx.length).toBe(Math.min(PROFILE_POINTS, p.samples));
      expect(idx.every((k, i) => i === 0 || k > idx[i - 1])).toBe(true);
      expect(idx[0]).toBe(0);
      expect(idx[idx.length - 1]).toBe(p.samples - 1);
      for (const key of ["sigmaMinTranslation", "dexterityMargin", "speedRatio", "trajectorySpeedRatio", "clearance"] as const) {
        const w = worst(p.profile[key]);
        if (w >= 0) expect(idx, `${p.name} ${key}`).toContain(w);
        expect(c.profile[key]).toEqual(idx.map((k) => p.profile[key][k]));
      }
      if (p.firstUnreached) expect(idx).toContain(p.firstUnreached.index);
      expect(c.profile.s).toEqual(idx.map((k) => p.profile.s[k]));
      expect(c.q).toEqual(idx.map((k) => p.q[k]));
      // what was computed over every sample stays
      expect({ ...c, profile: undefined, q: undefined, flips: undefined, restarts: undefined, limitHits: undefined, eventCounts: undefined })
        .toEqual({ ...p, profile: undefined, q: undefined, flips: undefined, restarts: undefined, limitHits: undefined });
    }
  });

  it("cuts event lists to their first entries and counts them", () => {
    const p = full.arms[0].paths[0];
    const event = (k: number) => ({ index: k, s: k * 0.001, joint: 1, detail: `joint 1 at its limit` });
    const many: PathAnalysis = { ...p, limitHits: Array.from({ length: 3 * EVENTS_KEPT }, (_, k) => event(k)) };
    const c = compactPath(many);
    expect(c.limitHits).toEqual(many.limitHits.slice(0, EVENTS_KEPT));
    expect(c.eventCounts).toEqual({ flips: p.flips.length, restarts: p.restarts.length, limitHits: 3 * EVENTS_KEPT });
  });

  it("a short path keeps every sample", () => {
    const p = full.arms[0].paths[0];
    const n = 40;
    const short: PathAnalysis = { ...p, samples: n, profile: Object.fromEntries(Object.entries(p.profile).map(([k, v]) => [k, (v as unknown[]).slice(0, n)])) as PathAnalysis["profile"], q: p.q.slice(0, n) };
    expect(keptSamples(short)).toEqual(Array.from({ length: n }, (_, i) => i));
  });

  it("rounds non-integers to 7 significant digits and leaves integers, strings and nulls", () => {
    expect(roundNumbers({ a: 0.123456789, b: [1.2870491057765842e-7, 12345678, null, "x"], c: -3.14159265358979 })).toEqual({ a: 0.1234568, b: [1.287049e-7, 12345678, null, "x"], c: -3.141593 });
  });

  it("ranks the stored sub-scores, and the bytes read back to the stored form", async () => {
    const c = compactResult(full);
    expect(c.ranking).toEqual(rerank(c, c.weights));
    expect(c.ranking.map((r) => r.armId)).toEqual(full.ranking.map((r) => r.armId));
    const stored = encodeResult(full);
    expect(stored.arms.map((a) => a.armId)).toEqual(inputs.map((a) => a.id));
    expect(JSON.parse(stored.head)).toEqual(JSON.parse(JSON.stringify({ ...c, arms: undefined })));
    for (let i = 0; i < stored.arms.length; i++) expect(await decodeArm(stored.arms[i].data)).toEqual(JSON.parse(JSON.stringify(c.arms[i])));
    expect(stored.bytes).toBeLessThan(stored.jsonBytes);
  });
});

describe("stored form, arm by arm", () => {
  it("compacting each arm as it is done gives the same stored form as compacting the whole result", () => {
    const early = analyzeShortlist(inputs, requirementSet, { mapArm: compactArm });
    expect(JSON.stringify(compactResult(early))).toBe(JSON.stringify(compactResult(full)));
  });
});
