// After signing in, `next` is followed only when it resolves (with the URL parser, as the
// browser resolves it) to the app's own origin.
import { describe, expect, it } from "vitest";
import { safeNextUrl } from "@/components/nextPath";

const ORIGIN = "http://armsift.test:3000";

describe("the address followed after sign-in", () => {
  it.each([
    "/\\evil.test/pwned",
    "/%09/evil.test/pwned",
    "/\t/evil.test/pwned",
    "\t//evil.test",
    "//evil.test/x",
    "/\\/evil.test",
    "\\\\evil.test",
    "/.//evil.test",
    "https://evil.test/",
    "http://armsift.test:3001/",
    "http:evil.test",
    "javascript:alert(1)",
    "data:text/html,<script>alert(1)</script>",
    " //evil.test",
  ])("%j never leaves the app's origin", (next) => {
    const url = new URL(safeNextUrl(next, ORIGIN));
    expect(url.origin).toBe(ORIGIN);
    // What the browser would do with it: assign() of an absolute same-origin URL stays here.
    expect(new URL(safeNextUrl(next, ORIGIN), ORIGIN).host).toBe("armsift.test:3000");
  });

  it("keeps a page of the app with its query and fragment", () => {
    expect(safeNextUrl("/shortlists/abc?tab=ranking#c1", ORIGIN)).toBe(`${ORIGIN}/shortlists/abc?tab=ranking#c1`);
    expect(safeNextUrl(`${ORIGIN}/arms/x`, ORIGIN)).toBe(`${ORIGIN}/arms/x`);
  });

  it("falls back to the arm catalog without a usable next", () => {
    for (const next of [undefined, null, "", "//evil.test", "http://[::1"]) expect(safeNextUrl(next, ORIGIN)).toBe(`${ORIGIN}/arms`);
  });
});
