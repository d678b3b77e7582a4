// The README's Security section names every setting that decides who can reach the server and
// who gets an account.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { SIGN_UP_MODES } from "@/shared/schemas/roles";

const readme = readFileSync(path.resolve(__dirname, "..", "..", "README.md"), "utf8");
const section = readme.slice(readme.indexOf("## Security"), readme.indexOf("\n## ", readme.indexOf("## Security") + 3));

describe("README security section", () => {
  it("lists HOST, PORT, ARMSIFT_TRUSTED_PROXIES, ARMSIFT_DB and the sign-up modes with the defaults", () => {
    expect(section.length).toBeGreaterThan(500);
    for (const name of ["`HOST`", "`PORT`", "`ARMSIFT_TRUSTED_PROXIES`", "`ARMSIFT_DB`", "Sign-up mode"]) expect(section, name).toContain(name);
    expect(section).toMatch(/`HOST`[^|]*\| `127\.0\.0\.1`/);
    expect(section).toMatch(/Sign-up mode[^|]*\| approval required/);
    const words = { open: "**Open**", approval: "**Approval required**", invitation: "**Invitation only**" };
    for (const m of SIGN_UP_MODES) expect(section).toContain(words[m]);
  });
});
