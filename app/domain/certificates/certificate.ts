/**
 * Certificate rules with no database: the public verification code and the state a verifier sees.
 *
 * The code is 12 characters of Crockford's base32 (Douglas Crockford, "Base32 Encoding", 2002:
 * digits and letters without I, L, O and U, so it reads aloud and copies by hand without
 * confusion), in three groups of four: 60 random bits, far too many to guess one.
 */

/** Crockford's base32 alphabet (no I, L, O, U). */
export const CODE_ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
export const CODE_LENGTH = 12;

/** 12 characters from 60 bits of the given bytes (at least 8 bytes), grouped XXXX-XXXX-XXXX. */
export function certificateCodeFrom(bytes: Uint8Array): string {
  if (bytes.length < 8) throw new Error("A certificate code needs at least 8 random bytes.");
  let bits = 0n;
  for (let i = 0; i < 8; i++) bits = (bits << 8n) | BigInt(bytes[i]);
  let out = "";
  for (let i = 0; i < CODE_LENGTH; i++) out += CODE_ALPHABET[Number((bits >> BigInt(5 * (CODE_LENGTH - 1 - i))) & 31n)];
  return `${out.slice(0, 4)}-${out.slice(4, 8)}-${out.slice(8, 12)}`;
}

/**
 * A code as someone typed or scanned it, in its stored form, or null when it cannot be one.
 * Case, spaces and hyphens do not matter; O reads as 0 and I or L as 1 (Crockford's decoding rule).
 */
export function normaliseCertificateCode(input: string): string | null {
  const compact = input
    .toUpperCase()
    .replace(/[\s-]/g, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1");
  if (compact.length !== CODE_LENGTH) return null;
  for (const ch of compact) if (!CODE_ALPHABET.includes(ch)) return null;
  return `${compact.slice(0, 4)}-${compact.slice(4, 8)}-${compact.slice(8, 12)}`;
}

export type CertificateState = "valid" | "expired" | "revoked";

export const CERTIFICATE_STATE_WORDS: Record<CertificateState, string> = { valid: "Valid", expired: "Expired", revoked: "Revoked" };

/**
 * Revoked wins; otherwise valid through its valid-through date inclusive (TESTING.md "Credential
 * dates": "valid through" is inclusive), and a certificate with no valid-through date stays valid.
 * `today` is the calendar date in the issuing organisation's time zone.
 */
export function certificateState(c: { revokedAt: Date | string | null; validThrough: string | null }, today: string): CertificateState {
  if (c.revokedAt) return "revoked";
  if (c.validThrough !== null && today > c.validThrough) return "expired";
  return "valid";
}

/** "Annual ventilation modes exam — passed 84 %": the score is floored, never shown above what was earned. */
export function examCertificateTitle(title: string, scorePercent: number): string {
  return `${title} — passed ${Math.floor(scorePercent)} %`;
}

export function checkoffCertificateTitle(title: string): string {
  return `${title} — competent`;
}
