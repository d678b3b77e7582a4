// Golden output of the analysis. Finished runs are reused by their content key, which holds
// ANALYSIS_VERSION (lib/analysis/key.ts): when the output changes and the version does not, stored
// results go stale without anyone noticing. This test fixes one input, hashes the whole analysis
// output (sha-256 of its canonical JSON) and compares the hash with the one recorded for the
// current version.
//
// When this fails because you changed the analysis on purpose: bump ANALYSIS_VERSION in
// lib/analysis/shortlist.ts and add a line for the new version below with the new hash (keep the
// old lines).
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { analyzeShortlist, ANALYSIS_VERSION, canonicalJson, DEFAULT_BUDGET, type ShortlistArm } from "@/lib/analysis";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

/** sha-256 of the canonical analysis output of the fixed input, per analysis version. */
const GOLDEN: Record<string, string> = {
  "analysis-1.2.0": "828391cba09cbdd3adcb8b332a2dccbece2d4e02573fda67d55e64f96fac9e99",
  // 1.3.0: workspace reach measured at the arm's own tool point (these arms have none: only the version differs).
  "analysis-1.3.0": "e749a50e8aef53352ade3f415d84e659f6cf1f698949c5a7b56d292a2c2ce7d8",
  // 1.4.0: axis targets' orientation factor over the constrained rotations, copies 2π apart, exact path
  // speed with the trajectory's own ratio, structured IK causes, labels of the payload and ellipsoid figures.
  "analysis-1.4.0": "152c81a3065862794c1b0bbd374156ec6262f7b8ff8d8f032d744467d7980269",
  // 1.5.0: the cell: collisions and clearance at targets and along paths, a clearance sub-score (the input gained a cell).
  "analysis-1.5.0": "f0a3cf5199f44f173ea3ab9a5bfb3e0fe8c17c89150c8b35ff5ccb1a925ae5b4",
  // 1.5.1: numbers in reasons and notes written through shared/format.ts (Intl.NumberFormat); a value
  // whose shortest decimal ends on a tie may round the other way than toFixed did (here only the version differs).
  "analysis-1.5.1": "f21feed56d0566568b49f858eaedd2c7ac8d9fb1063268c5cc628b863bf71582",
  // 1.6.0: the cycle time of each sequence per arm, and the sequences' names (the input gained two sequences).
  "analysis-1.6.0": "7567ede4972382acce0cd408a4bb9da0b47a2c5882fa73c6507bae1644a983c9",
  // 1.6.1: 1.6.0 with the numbers of its reasons and notes through shared/format.ts, as 1.5.1 did for 1.5.0.
  "analysis-1.6.1": "fdbac84b6cd8e6bacee1ce556c9a75917ad753c4b10165098cc68c89a9ec5872",
  // 1.7.0: link pairs whose shapes both hold a point the joints between them cannot move (a spherical
  // wrist's centre) are set aside as always touching, for explicit geometry too (here only the version differs).
  "analysis-1.7.0": "d2a484ee7728f24c89484e82da821f8ebffa11b3c3c99c6fd5adeb0082ee32ac",
  // 1.8.0: a cycle-time sub-score in the ranking (1 − t/2R on the worst sequence with a required time), and
  // the caution says cycle times are estimates for comparing arms.
  "analysis-1.8.0": "2728bcaeff8ac0480b564b0ab57508da6493e57a57efe04e28a2569efae8cb00",
  // 1.9.0: the cycle in the cell: colliding branches and paths left out, each move checked along its
  // joint-space line and a blocked one left out of the branch choice; steps carry their clearance.
  "analysis-1.9.0": "4ecb560f9dc35d11503765b7f0a3076800c8ceedf7f8140b7fa1f40c6d32d414",
  // 1.9.1: a move's clearance is called below the required one only beyond the motion check's 0.1 mm
  // tolerance (a reason text; here only the version differs).
  "analysis-1.9.1": "36be57b6afdb3b0a74da95d87d4d6f72002919c703754565e9d060132f54f53f",
  // 1.10.0: a move's configurations checked ends first, then in bisection order (a blocked move may name
  // another colliding pair); a blocked choice made again at its first blocked move; a sequence with no
  // free combination names the step every combination is blocked by at the latest, without checking
  // every remaining move.
  "analysis-1.10.0": "ba2a67087d6e126d6e4fea2708ea7c7c23c4e90cb3d1d5d0018f5dfe47971aed",
  // 1.11.0: with a mounting region, every arm's placement, its analysis there and the ranking at the
  // placements (this input has no region: only the version differs).
  "analysis-1.11.0": "81eaff320af461342efa04bace0a45bf7e7b6e8eb2ae77e689d3feafbf3594e3",
  // 1.11.1: a set with a mounting region but nothing to reach or follow evaluates one placement, not the
  // whole search (this input has no region: only the version differs).
  "analysis-1.11.1": "4698781a79fd718ea7bd7be9074c6eb2601cee52e995f7ed6a1785d9bd45cbfc",
};

const DEG = Math.PI / 180;
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
// Invented arms and cell (no real product): a 6-axis arm with a spherical wrist and torque limits,
// a 7-axis redundant arm with a prismatic-free chain, and a 4-axis SCARA-like arm with a quill.
const arms: ShortlistArm[] = [
  {
    id: "golden-six", revision: 2, arm: armSchema.parse({
      name: "Golden Six", convention: "dh",
      joints: [
        { type: "revolute", a: 0.12, alpha: -90 * DEG, d: 0.38, theta: 0, min: -170 * DEG, max: 170 * DEG, maxSpeed: 3.0, maxTorque: 320, mass: 9, com: [0, 0.05, 0] },
        { type: "revolute", a: 0.42, alpha: 0, d: 0, theta: -90 * DEG, min: -120 * DEG, max: 140 * DEG, maxSpeed: 3.0, maxTorque: 320, mass: 7, com: [-0.2, 0, 0.05] },
        { type: "revolute", a: 0.06, alpha: -90 * DEG, d: 0, theta: 0, min: -150 * DEG, max: 160 * DEG, maxSpeed: 3.4, maxTorque: 150, mass: 4, com: [0, 0, 0.04] },
        { type: "revolute", a: 0, alpha: 90 * DEG, d: 0.44, theta: 0, min: -180 * DEG, max: 180 * DEG, maxSpeed: 5.0, maxTorque: 40, mass: 2, com: [0, -0.08, 0] },
        { type: "revolute", a: 0, alpha: -90 * DEG, d: 0, theta: 0, min: -125 * DEG, max: 125 * DEG, maxSpeed: 5.0, maxTorque: 40, mass: 1, com: [0, 0, 0] },
        { type: "revolute", a: 0, alpha: 0, d: 0.09, theta: 0, min: -350 * DEG, max: 350 * DEG, maxSpeed: 7.0, maxTorque: 20, mass: 0.3, com: [0, 0, -0.02] },
      ],
      specs: { ratedPayload: 6, reach: 0.95, price: 24000, currency: "EUR", wristAllowables: [{ joint: 5, moment: 12, inertia: 0.3 }, { joint: 6, moment: 7 }] },
    }),
  },
  {
    id: "golden-seven", revision: 1, arm: armSchema.parse({
      name: "Golden Seven", convention: "dh",
      joints: [
        { type: "revolute", a: 0, alpha: -90 * DEG, d: 0.34, theta: 0, min: -170 * DEG, max: 170 * DEG, maxSpeed: 2.0 },
        { type: "revolute", a: 0, alpha: 90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG, maxSpeed: 2.0 },
        { type: "revolute", a: 0, alpha: 90 * DEG, d: 0.4, theta: 0, min: -170 * DEG, max: 170 * DEG, maxSpeed: 2.3 },
        { type: "revolute", a: 0, alpha: -90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG, maxSpeed: 2.3 },
        { type: "revolute", a: 0, alpha: -90 * DEG, d: 0.4, theta: 0, min: -170 * DEG, max: 170 * DEG, maxSpeed: 2.6 },
        { type: "revolute", a: 0, alpha: 90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG, maxSpeed: 3.1 },
        { type: "revolute", a: 0, alpha: 0, d: 0.126, theta: 0, min: -350 * DEG, max: 350 * DEG, maxSpeed: 3.1 },
      ],
      specs: { ratedPayload: 7, price: 39000, currency: "EUR" },
    }),
  },
  {
    id: "golden-quill", revision: 1, arm: armSchema.parse({
      name: "Golden Quill", convention: "dh",
      joints: [
        { type: "revolute", a: 0.3, alpha: 0, d: 0.4, theta: 0, min: -150 * DEG, max: 150 * DEG, maxSpeed: 6 },
        { type: "revolute", a: 0.25, alpha: 180 * DEG, d: 0, theta: 0, min: -145 * DEG, max: 145 * DEG, maxSpeed: 6 },
        { type: "prismatic", a: 0, alpha: 0, d: 0, theta: 0, min: 0, max: 0.2, maxSpeed: 1.1 },
        { type: "revolute", a: 0, alpha: 0, d: 0, theta: 0, min: -360 * DEG, max: 360 * DEG, maxSpeed: 20 },
      ],
      specs: { ratedPayload: 3, price: 11000, currency: "EUR" },
    }),
  },
];
const req = requirementSetSchema.parse({
  name: "golden cell", base: I4,
  tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.08, 0, 0, 0, 1], mass: 0.7, cog: [0.01, 0, 0.04], inertia: [0.001, 0.0012, 0.0006] },
  payload: { mass: 1.1, cog: [0, 0.01, 0.03], inertia: [0.0008, 0.0008, 0.0004] },
  targets: [
    { name: "pick down", position: [0.45, 0.1, 0.12], rpy: [Math.PI, 0, 0.3], mode: "pose" },
    { name: "screw axis", position: [0.35, -0.3, 0.2], rpy: [Math.PI, 0, 0], mode: "axis", force: [0, 0, -40] },
    { name: "tilted", position: [0.5, -0.1, 0.35], rpy: [2.5, -0.5, 0.9], mode: "pose", moment: [0, 0, 1.5] },
    { name: "high point", position: [0.2, 0.3, 0.75], rpy: [0, 0, 0], mode: "point" },
    { name: "far away", position: [2.5, 0, 0.4], rpy: [0, 0, 0], mode: "point" },
  ],
  paths: [
    { name: "seam", mode: "axis", step: 0.02, speed: 0.3, waypoints: [{ position: [0.4, -0.2, 0.15], rpy: [Math.PI, 0, 0] }, { position: [0.45, 0.15, 0.15], rpy: [Math.PI, 0, 0] }, { position: [0.45, 0.15, 0.15], rpy: [Math.PI, 0, 1.2] }] },
    { name: "lift", mode: "point", step: 0.03, speed: 0.5, waypoints: [{ position: [0.3, 0.2, 0.1], rpy: [0, 0, 0] }, { position: [0.3, 0.2, 0.5], rpy: [0, 0, 0] }] },
  ],
  specs: [
    { field: "ratedPayload", comparator: "atLeast", value: 4, priority: "must" },
    { field: "reach", comparator: "atLeast", value: 0.8, priority: "want" },
  ],
  // since 1.6.0: two task sequences for the cycle time
  sequences: [{ name: "loop", required: 6, steps: [{ kind: "move", target: "pick down", dwell: 0.4 }, { kind: "path", path: "lift" }, { kind: "move", target: "screw axis" }, { kind: "wait", seconds: 0.5 }, { kind: "move", target: "far away" }] }, { name: "short", steps: [{ kind: "move", target: "pick down" }, { kind: "move", target: "high point", dwell: 0.2 }] }],
  // since 1.5.0: a cell (a table, a post, a ball) and tool and payload shapes
  cell: {
    clearance: 0.01,
    obstacles: [
      { name: "table", shape: "box", pose: [1, 0, 0, 0.5, 0, 1, 0, 0, 0, 0, 1, -0.03, 0, 0, 0, 1], size: [0.8, 1.0, 0.06] },
      { name: "post", shape: "cylinder", pose: [1, 0, 0, 0.55, 0, 1, 0, -0.35, 0, 0, 1, 0.3, 0, 0, 0, 1], radius: 0.03, length: 0.6 },
      { name: "ball", shape: "sphere", center: [0.1, 0.45, 0.5], radius: 0.06 },
    ],
  },
});
req.tool.collision = [{ shape: "capsule", from: [0, 0, 0.02], to: [0, 0, 0.07], radius: 0.025 }];
req.payload.collision = [{ shape: "box", pose: I4, size: [0.04, 0.04, 0.04] }];
// since 1.5.0: the six-axis arm has capsules derived from its table and link radii
(arms[0].arm.joints as { radius?: number }[]).forEach((j, i) => { j.radius = [0.06, 0.05, 0.045, 0.04, 0.035, 0.03][i]; });
const budget = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 400 } };

describe("golden analysis output", () => {
  it("matches the hash recorded for the current ANALYSIS_VERSION", () => {
    const out = analyzeShortlist(arms, req, { budget });
    const hash = createHash("sha256").update(canonicalJson(out), "utf8").digest("hex");
    const recorded = GOLDEN[ANALYSIS_VERSION];
    expect(recorded, `no golden hash recorded for ${ANALYSIS_VERSION}: add "${ANALYSIS_VERSION}": "${hash}" to GOLDEN in tests/analysis/golden.test.ts`).toBeTruthy();
    expect(hash, `The analysis output changed but ANALYSIS_VERSION (${ANALYSIS_VERSION}) did not: stored results would be served stale. ` +
      `If the change is on purpose, bump ANALYSIS_VERSION in lib/analysis/shortlist.ts and record "<new version>": "${hash}" in GOLDEN here; ` +
      "if it is not, the change altered results by accident.").toBe(recorded);
  });
});
