import { createHmac, timingSafeEqual } from "node:crypto";
import { and, desc, eq, isNull } from "drizzle-orm";
import { env } from "~/config/env.server";
import { database } from "~/db/client.server";
import { people, signInCodes, type SignInCode } from "~/db/schema";

/** At most this many wrong tries per issued code (issue 2; OWASP ASVS 4.0.3 V2.2.1). */
export const MAX_CODE_TRIES = 3;

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

function hashCode(email: string, code: string): string {
  return createHmac("sha256", env().sessionSecret).update(`${normaliseEmail(email)}\n${code.trim()}`).digest("hex");
}

export async function findActivePersonByEmail(email: string) {
  const { db } = await database();
  const [person] = await db
    .select({ id: people.id, name: people.name, orgId: people.orgId })
    .from(people)
    .where(and(eq(people.email, normaliseEmail(email)), eq(people.active, true)))
    .limit(1);
  return person ?? null;
}

/**
 * Records an issued code (hashed) whether or not the address belongs to anyone, so the
 * screens that follow are the same for everybody; `personId` is null for unknown addresses.
 */
export async function recordIssuedCode(input: {
  email: string;
  code: string;
  personId: string | null;
  clientKey: string;
  now?: Date;
}): Promise<SignInCode> {
  const now = input.now ?? new Date();
  const { write } = await database();
  return write(async (tx) => {
    // A new code replaces any earlier one for the address.
    await tx
      .update(signInCodes)
      .set({ consumedAt: now })
      .where(and(eq(signInCodes.email, normaliseEmail(input.email)), isNull(signInCodes.consumedAt)));
    const [row] = await tx
      .insert(signInCodes)
      .values({
        email: normaliseEmail(input.email),
        codeHash: hashCode(input.email, input.code),
        personId: input.personId,
        clientKey: input.clientKey,
        expiresAt: new Date(now.getTime() + env().signInCodeTtlSeconds * 1000),
        createdAt: now,
      })
      .returning();
    return row;
  }, { quiet: true }); // sign-in codes are in no cached organisation-wide read (client.server.ts)
}

export type CodeCheck =
  | { ok: true; record: SignInCode & { personId: string } }
  | { ok: false; reason: "missing" | "used" | "expired" | "too-many-tries" | "wrong"; message: string; triesLeft?: number };

export const CODE_MESSAGES = {
  missing: "We could not find a code request from this browser. Ask for a new code.",
  used: "This code has already been used. Ask for a new code.",
  expired: "This code has expired. Ask for a new code.",
  "too-many-tries": "Too many wrong tries for this code. Ask for a new code.",
} as const;

/**
 * The server's own check of a code: it exists, belongs to this request's sign-in record,
 * is unexpired, unused and under the try limit. Wrong tries are counted here, so replaying
 * the strategy's cookie (which carries its own counter in clear) cannot reset them.
 */
export async function checkCode(recordId: string | null, code: string, now: Date = new Date()): Promise<CodeCheck> {
  if (!recordId) return { ok: false, reason: "missing", message: CODE_MESSAGES.missing };
  const { db, write } = await database();
  const [record] = await db.select().from(signInCodes).where(eq(signInCodes.id, recordId)).limit(1);
  if (!record) return { ok: false, reason: "missing", message: CODE_MESSAGES.missing };
  if (record.attempts >= MAX_CODE_TRIES) return { ok: false, reason: "too-many-tries", message: CODE_MESSAGES["too-many-tries"] };
  if (record.consumedAt) return { ok: false, reason: "used", message: CODE_MESSAGES.used };
  if (record.expiresAt.getTime() <= now.getTime()) return { ok: false, reason: "expired", message: CODE_MESSAGES.expired };

  const expected = Buffer.from(record.codeHash, "hex");
  const given = Buffer.from(hashCode(record.email, code), "hex");
  const matches = record.personId !== null && timingSafeEqual(expected, given);
  if (!matches) {
    const attempts = await write(async (tx) => {
      const [r] = await tx
        .update(signInCodes)
        .set({ attempts: record.attempts + 1 })
        .where(eq(signInCodes.id, record.id))
        .returning({ attempts: signInCodes.attempts });
      return r.attempts;
    }, { quiet: true });
    const triesLeft = MAX_CODE_TRIES - attempts;
    if (triesLeft <= 0) return { ok: false, reason: "too-many-tries", message: CODE_MESSAGES["too-many-tries"] };
    return {
      ok: false,
      reason: "wrong",
      triesLeft,
      message: `That code is not right. ${triesLeft} ${triesLeft === 1 ? "try" : "tries"} left.`,
    };
  }
  // Single use: consume it in the same statement that checks it is still unconsumed.
  const consumed = await write(async (tx) =>
    tx
      .update(signInCodes)
      .set({ consumedAt: now })
      .where(and(eq(signInCodes.id, record.id), isNull(signInCodes.consumedAt)))
      .returning({ id: signInCodes.id }),
    { quiet: true },
  );
  if (consumed.length === 0) return { ok: false, reason: "used", message: CODE_MESSAGES.used };
  return { ok: true, record: { ...record, personId: record.personId as string } };
}

export async function latestCodeFor(email: string) {
  const { db } = await database();
  const [row] = await db
    .select()
    .from(signInCodes)
    .where(eq(signInCodes.email, normaliseEmail(email)))
    .orderBy(desc(signInCodes.createdAt))
    .limit(1);
  return row ?? null;
}
