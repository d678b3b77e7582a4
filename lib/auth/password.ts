import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from "node:crypto";

/**
 * Password hashing with scrypt (RFC 7914). Stored as `scrypt$N$r$p$salt$hash`, salt and hash in
 * base64, so the cost can be raised later without invalidating old hashes.
 * N = 2^15, r = 8, p = 1 needs 128·N·r = 32 MiB; maxmem allows 64 MiB.
 */
export const SCRYPT_PARAMS = { N: 2 ** 15, r: 8, p: 1 } as const;
const KEY_LENGTH = 64;
const SALT_BYTES = 16;
const MAX_MEM = 64 * 1024 * 1024;

function derive(password: string, salt: Buffer, N: number, r: number, p: number, keylen: number): Promise<Buffer> {
  const options: ScryptOptions = { N, r, p, maxmem: Math.max(MAX_MEM, 256 * N * r) };
  return new Promise((resolve, reject) => {
    scrypt(password.normalize("NFC"), salt, keylen, options, (err, key) => (err ? reject(err) : resolve(key)));
  });
}

export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(SALT_BYTES);
  const { N, r, p } = SCRYPT_PARAMS;
  const key = await derive(password, salt, N, r, p, KEY_LENGTH);
  return `scrypt$${N}$${r}$${p}$${salt.toString("base64")}$${key.toString("base64")}`;
}

/** Checks a password against a stored hash in constant time; false for a malformed hash. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parts = stored.split("$");
  if (parts.length !== 6 || parts[0] !== "scrypt") return false;
  const [N, r, p] = parts.slice(1, 4).map(Number);
  if (![N, r, p].every((v) => Number.isInteger(v) && v > 0) || N > 2 ** 20 || r > 32 || p > 16) return false;
  const salt = Buffer.from(parts[4], "base64");
  const expected = Buffer.from(parts[5], "base64");
  if (salt.length < 8 || expected.length < 16) return false;
  const actual = await derive(password, salt, N, r, p, expected.length);
  return timingSafeEqual(actual, expected);
}

let dummy: Promise<string> | undefined;
/** A valid hash of a random password, so an unknown email costs as much time as a wrong password. */
export function dummyPasswordHash(): Promise<string> {
  dummy ??= hashPassword(randomBytes(18).toString("base64"));
  return dummy;
}
