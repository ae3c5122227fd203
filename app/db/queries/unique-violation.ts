/**
 * Which unique index a failed write ran into, e.g. "people.email", or null for any other error.
 * The forms check uniqueness first for a friendly message; this is the backstop for two admins
 * saving the same address at once. Drizzle wraps the driver's error, so the chain is walked.
 */
export function uniqueViolation(error: unknown): string | null {
  for (let e: unknown = error, depth = 0; e && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const message = e instanceof Error ? e.message : "";
    const match = /UNIQUE constraint failed: ([\w.]+(?:, [\w.]+)*)/.exec(message);
    if (match) return match[1];
  }
  return null;
}
