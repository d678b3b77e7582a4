/**
 * Which new passwords are refused, in the spirit of NIST SP 800-63B §5.1.1.2 (memorized
 * secrets): a minimum length and no composition rules (any printable character, spaces and
 * Unicode included), but a check against values that are commonly used, expected or compromised:
 * a bundled list of common passwords, repetitive or sequential characters, and context-specific
 * words (the account's email and name, the product's name). Pure: no database, no I/O.
 */
import { MAX_PASSWORD_LENGTH } from "@/shared/schemas/accounts";
import { COMMON_PASSWORDS } from "./common-passwords";

const MIN_PASSWORD_LENGTH = 10;
export { MAX_PASSWORD_LENGTH };

/** What the check knows about the account. */
interface PasswordContext {
  email?: string;
  name?: string;
}

const SEQUENCES = [
  "abcdefghijklmnopqrstuvwxyz",
  "01234567890123456789",
  "qwertyuiopasdfghjklzxcvbnm",
  "qwertzuiopasdfghjklyxcvbnm",
  "azertyuiopqsdfghjklmwxcvbn",
  "1qaz2wsx3edc4rfv5tgb6yhn7ujm8ik9ol0p",
  "qazwsxedcrfvtgbyhnujmikolp",
  "zaq1xsw2cde3vfr4bgt5nhy6mju7",
  "!@#$%^&*()_+",
];

const LEET: Record<string, string> = { "0": "o", "1": "i", "3": "e", "4": "a", "5": "s", "7": "t", "8": "b", "@": "a", "$": "s", "!": "i", "|": "l" };

/** Lower case, NFKC, blanks removed. */
const squash = (s: string): string => s.normalize("NFKC").toLowerCase().replace(/\s+/g, "");

/** The word a password is built on: leading and trailing digits and symbols dropped, leet undone. */
function baseWord(squashed: string): string {
  const core = squashed.replace(/^[^\p{L}]+|[^\p{L}]+$/gu, "");
  return [...core].map((c) => LEET[c] ?? c).join("");
}

/** True when `s` is a run of at most 4 characters repeated (aaaaaaaaaa, abababab, 123123123). */
function isShortRepeat(s: string): boolean {
  const cps = [...s];
  for (let unit = 1; unit <= 4 && unit < cps.length; unit++) {
    if (cps.every((c, i) => c === cps[i % unit])) return true;
  }
  return false;
}

/** True when `s` is a stretch of a sequence (alphabet, digits, keyboard rows), forwards or backwards. */
function isSequence(s: string): boolean {
  if (s.length < 4) return false;
  const rev = [...s].reverse().join("");
  return SEQUENCES.some((seq) => seq.includes(s) || seq.includes(rev));
}

/** Base words of the common passwords (password1, p@ssw0rd and password all give "password"). */
const COMMON_BASES = new Set([...COMMON_PASSWORDS].map((w) => baseWord(squash(w))).filter((b) => b.length >= 4));

/** True when `base` is a common base word, once or repeated (passwordpassword). */
function isCommonBase(base: string): boolean {
  for (let k = 4; k <= base.length; k++) {
    if (base.length % k === 0 && COMMON_BASES.has(base.slice(0, k)) && isRepeatOf(base, base.slice(0, k))) return true;
  }
  return false;
}

/** True when `s` is `word` repeated (passwordpassword) or `word` itself. */
const isRepeatOf = (s: string, word: string): boolean => word.length > 0 && s.length % word.length === 0 && word.repeat(s.length / word.length) === s;

/**
 * Why a new password is refused, or null when it is acceptable. The message completes
 * "password …", e.g. "must be at least 10 characters".
 */
export function passwordProblem(password: string, ctx: PasswordContext = {}): string | null {
  const length = [...password.normalize("NFC")].length;
  if (length < MIN_PASSWORD_LENGTH) return `must be at least ${MIN_PASSWORD_LENGTH} characters`;
  if (length > MAX_PASSWORD_LENGTH) return `must be at most ${MAX_PASSWORD_LENGTH} characters`;
  if (/\p{Cc}/u.test(password)) return "must not contain control characters (such as NUL, tab or line breaks)";
  if (password.trim() === "") return "must not be only spaces";
  const squashed = squash(password);
  if (isShortRepeat(squashed) || new Set(squashed).size < 3) return "is one character or a short pattern repeated; choose a longer passphrase";
  if (isSequence(squashed)) return "is a run of consecutive keys or characters; choose a passphrase";
  const email = ctx.email ? squash(ctx.email) : "";
  const local = email.split("@")[0] ?? "";
  const name = ctx.name ? squash(ctx.name) : "";
  const base = baseWord(squashed);
  for (const word of [email, local, name].filter((w) => w.length >= 3)) {
    if (squashed === word || squashed.includes(email) || isRepeatOf(base, baseWord(word)) || isRepeatOf(squashed, word)) {
      return "must not be your email address or name";
    }
  }
  if (base.includes("armsift")) return "must not be based on this product's name";
  if (COMMON_PASSWORDS.has(squashed) || isCommonBase(base)) {
    return "is on the list of commonly used passwords; choose a passphrase of a few unrelated words";
  }
  return null;
}
