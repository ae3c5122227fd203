/**
 * The signing PIN: the second component of every signature (identity is the first: the
 * signed-in session or an e-mail typed on a shared tablet). Design reference US 21 CFR Part 11
 * §11.200(a)(1) (two distinct identification components) and §11.300(d) (safeguards against
 * unauthorised use: attempts limited). Stored only as a salted scrypt hash (node:crypto;
 * RFC 7914), compared in constant time (OWASP ASVS 4.0.3 V2.4.1, V2.2.1 anti-automation).
 */
import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from "node:crypto";

export const MIN_PIN_DIGITS = 6;
export const MAX_PIN_DIGITS = 12;
/** Five wrong PINs in a row lock signing for a while (common practice, no source). */
export const MAX_PIN_FAILURES = 5;
export const PIN_LOCK_MINUTES = 15;

// RFC 7914 §2 parameters; N = 2^14, r = 8, p = 1 is the interactive-login setting of the
// scrypt paper (Percival 2009) and node's default.
const PARAMS = { N: 16384, r: 8, p: 1, keylen: 32 } as const;

function derive(pin: string, salt: Buffer, options: ScryptOptions & { keylen: number }): Promise<Buffer> {
  return new Promise((resolve, reject) =>
    scrypt(pin.normalize("NFKC"), salt, options.keylen, { N: options.N, r: options.r, p: options.p }, (error, key) => (error ? reject(error) : resolve(key))),
  );
}

/** "scrypt$N$r$p$salt$hash" (base64): the parameters travel with the hash so they can be raised later. */
export async function hashPin(pin: string): Promise<string> {
  const salt = randomBytes(16);
  const key = await derive(pin, salt, PARAMS);
  return ["scrypt", PARAMS.N, PARAMS.r, PARAMS.p, salt.toString("base64"), key.toString("base64")].join("$");
}

export async function verifyPin(pin: string, stored: string): Promise<boolean> {
  const [scheme, n, r, p, salt, hash] = stored.split("$");
  if (scheme !== "scrypt" || !salt || !hash) return false;
  const expected = Buffer.from(hash, "base64");
  const key = await derive(pin, Buffer.from(salt, "base64"), { N: Number(n), r: Number(r), p: Number(p), keylen: expected.length });
  return key.length === expected.length && timingSafeEqual(key, expected);
}

/**
 * Why a new PIN is refused, or null. Repeated and sequential digits are refused because they are
 * the first guesses (NIST SP 800-63B §5.1.1.2: refuse commonly used or expected values).
 */
export function pinProblem(pin: string): string | null {
  if (!/^\d+$/.test(pin)) return "Use digits only.";
  if (pin.length < MIN_PIN_DIGITS) return `Use at least ${MIN_PIN_DIGITS} digits.`;
  if (pin.length > MAX_PIN_DIGITS) return `Use at most ${MAX_PIN_DIGITS} digits.`;
  if (/^(\d)\1+$/.test(pin)) return "Do not repeat one digit.";
  const digits = [...pin].map(Number);
  const steps = digits.slice(1).map((d, i) => (d - digits[i] + 10) % 10);
  if (steps.every((s) => s === 1) || steps.every((s) => s === 9)) return "Do not use a run of digits such as 123456.";
  return null;
}

/** Until when signing is locked after the last wrong PIN, or null when it is not locked. */
export function lockedUntil(failures: number, lastFailureAt: Date | null, now: Date): Date | null {
  if (failures < MAX_PIN_FAILURES || !lastFailureAt) return null;
  const until = new Date(lastFailureAt.getTime() + PIN_LOCK_MINUTES * 60_000);
  return until > now ? until : null;
}
