// New passwords: length and a check against common, repetitive, sequential and context-specific
// values, without composition rules (NIST SP 800-63B §5.1.1.2).
import { describe, expect, it } from "vitest";
import { passwordProblem } from "@/lib/auth/password-policy";

const ctx = { email: "olga.owner@example.test", name: "Olga Owner" };

describe("password policy", () => {
  it.each([
    ["aaaaaaaaaa", /repeated/],
    [" ".repeat(10), /only spaces/],
    ["\u0000".repeat(10), /control characters/],
    ["passw\u0000rd12345", /control characters/],
    ["1234567890", /consecutive|common/],
    ["0987654321", /consecutive|common/],
    ["abcdefghijk", /consecutive/],
    ["qwertyuiop", /consecutive|common/],
    ["ababababab", /repeated/],
    ["123123123123", /repeated/],
    ["Password123!", /commonly used/],
    ["P@ssw0rd2024", /commonly used/],
    ["iloveyou1234", /commonly used/],
    ["passwordpassword", /commonly used/],
    ["football99", /commonly used/],
    ["olga.owner@example.test", /email address or name/],
    ["OLGA.OWNER@EXAMPLE.TEST", /email address or name/],
    ["olga.owner1234", /email address or name/],
    ["Olga Owner 2024", /email address or name/],
    ["armsift2024!", /product's name/],
    ["short", /at least 10 characters/],
  ])("refuses %j", (pw, reason) => {
    expect(passwordProblem(pw, ctx)).toMatch(reason);
  });

  it.each(["a long enough password", "correct horse battery staple", "Tr0ub4dor&3x", "grüne Wiesen am Fluss", "screenshots only 123", "7 kilo payload, 900 mm"])("accepts %j", (pw) => {
    expect(passwordProblem(pw, ctx)).toBeNull();
  });

  it("counts characters, not bytes, and caps the length", () => {
    expect(passwordProblem("ääääääääää".replace(/ä/g, (c, i) => (i % 2 ? "ö" : c)) + "ü", ctx)).toBeNull();
    expect(passwordProblem("ab".repeat(600), ctx)).toMatch(/at most 1024/);
  });
});
