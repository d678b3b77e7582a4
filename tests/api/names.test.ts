// Names typed into the API are cleaned of NUL and bidirectional overrides before they are
// stored: account names at sign-up, shortlist names, share-link labels, arm and path names.
import { describe, expect, it } from "vitest";
import { sampleArm, sampleRequirementSet } from "../db/helpers";
import * as signup from "@/app/api/auth/signup/route";
import * as users from "@/app/api/users/route";
import * as arms from "@/app/api/arms/route";
import * as reqs from "@/app/api/requirements/route";
import * as shortlists from "@/app/api/shortlists/route";
import * as links from "@/app/api/shortlists/[id]/links/route";
import { call, expectFieldError, type Body } from "./client";
import { withAccounts } from "./setup";

const { acc, t } = withAccounts();

const RLO = "\u202E";

describe("names are cleaned at the edge", () => {
  it("sign-up names lose NUL and bidirectional overrides; a name of nothing else is refused", async () => {
    await call(signup.POST, "/api/auth/signup", { body: { email: "mallory@example.test", name: `Mal${RLO}lory\u0000`, password: "a long enough password" } });
    const list = await call(users.GET, "/api/users", { cookie: acc.admin });
    expect(list.body.users.map((u: Body) => u.name)).toContain("Mallory");
    const all = list.body.users.map((u: Body) => u.name).join("");
    expect(all.includes("\u0000") || all.includes(RLO)).toBe(false);
    expectFieldError(await call(signup.POST, "/api/auth/signup", { body: { email: "nul@example.test", name: "\u0000".repeat(10), password: "a long enough password" } }), "name", /must not be empty/);
  });

  it("arm, path, shortlist and link names", async () => {
    const arm = await call(arms.POST, "/api/arms", { cookie: acc.editor, body: sampleArm({ name: `Arm${RLO}mra` }) });
    expect(arm.body.arm.name).toBe("Armmra");
    const wp = [{ position: [0.4, 0, 0.2], rpy: [0, 0, 0] }, { position: [0.4, 0.1, 0.2], rpy: [0, 0, 0] }];
    const set = await call(reqs.POST, "/api/requirements", { cookie: acc.editor, body: sampleRequirementSet({ paths: [{ name: `seam\u0000`, waypoints: wp, mode: "point", step: 0.01, speed: 0.1 }] }) });
    expect(set.body.requirementSet.paths[0].name).toBe("seam");
    const dup = await call(reqs.POST, "/api/requirements", {
      cookie: acc.editor,
      body: sampleRequirementSet({ paths: ["seam", "seam"].map((name) => ({ name, waypoints: wp, mode: "point", step: 0.01, speed: 0.1 })) }),
    });
    expectFieldError(dup, "paths.1.name", /used twice/);
    const sl = await call(shortlists.POST, "/api/shortlists", { cookie: acc.editor, body: { name: `Cell${RLO} 9\u0000`, requirementSetId: set.body.id, armIds: [arm.body.id] } });
    expect(sl.status).toBe(201);
    const link = await call(links.POST, "/x", { cookie: acc.editor, params: { id: sl.body.id }, body: { access: "view", label: `for${RLO} review` } });
    expect(link.body.link.label).toBe("for review");
    const stored = await t.client.shortlist.findUniqueOrThrow({ where: { id: sl.body.id } });
    expect(stored.name).toBe("Cell 9");
  });
});
