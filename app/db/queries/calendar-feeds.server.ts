/**
 * Private calendar feeds (issue 10 §3): one address per person for their own dates, and one for
 * a manager's units' expiries. Each address carries a token that is not the session.
 *
 * Why the token is derived rather than stored: the token is HMAC-SHA-256 of the feed's id and a
 * per-feed random salt under the server's secret (SESSION_SECRET), so My plan can rebuild and
 * show the address at any time, yet the database holds only the salt and SHA-256 of the token —
 * a copy of the database (a backup, a support dump) reveals no working address, and a
 * presented token is found by its hash. Changing the server secret turns every address off;
 * My plan then issues a fresh one (see `ensureFeed`). Resetting revokes the row, so the old
 * address answers 404 at once.
 */
import { createHash, createHmac, randomBytes } from "node:crypto";
import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import { can, isRole } from "~/auth/roles";
import { env } from "~/config/env.server";
import { recordAudit } from "~/db/audit.server";
import { database, type Tx } from "~/db/client.server";
import { assignments, calendarFeeds, exams, examVersions, organisations, people, personRoles, type CalendarFeedKind } from "~/db/schema";
import { examWindowEvents, expiryEvents, planEvents, type CalendarEvent, type ExamWindow, type UnitExpiry } from "~/domain/calendar/events";
import { addDays, type IsoDate } from "~/domain/status";
import { getPlan } from "./plan.server";
import { statusOptionsFor } from "./people.server";
import { loadMatrix } from "./team-matrix.server";
import { listManagedUnits } from "./team.server";

/** Days ahead a manager's units feed looks (issue 10 §3). */
export const UNITS_FEED_DAYS = 180;

/** 32 bytes as base64url: 43 characters. */
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

function deriveToken(feedId: string, salt: string, secret: string = env().sessionSecret): string {
  return createHmac("sha256", secret).update(`tidemark-calendar-feed\u0000${feedId}\u0000${salt}`).digest("base64url");
}

export function hashFeedToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** The person may have a units feed: they manage units (Team, credentials). */
export function mayHaveUnitsFeed(roles: readonly string[]): boolean {
  const held = roles.filter(isRole);
  return can(held, "team:manage") || can(held, "credentials:verify");
}

export function feedAddress(token: string): string {
  return `${env().publicUrl}/calendar/${token}`;
}

async function insertFeed(tx: Tx, orgId: string, personId: string, kind: CalendarFeedKind, now: Date): Promise<{ id: string; token: string }> {
  const id = crypto.randomUUID();
  const salt = randomBytes(32).toString("base64url");
  const token = deriveToken(id, salt);
  await tx.insert(calendarFeeds).values({ id, orgId, personId, kind, salt, tokenHash: hashFeedToken(token), createdAt: now });
  return { id, token };
}

async function liveFeed(tx: Tx | Awaited<ReturnType<typeof database>>["db"], orgId: string, personId: string, kind: CalendarFeedKind) {
  const [row] = await tx
    .select()
    .from(calendarFeeds)
    .where(and(eq(calendarFeeds.orgId, orgId), eq(calendarFeeds.personId, personId), eq(calendarFeeds.kind, kind), isNull(calendarFeeds.revokedAt)));
  return row ?? null;
}

/**
 * The working address token for a person's feed of this kind, made on first use. A live row
 * whose token no longer matches (the server secret changed) is revoked and replaced.
 */
export async function ensureFeed(orgId: string, personId: string, kind: CalendarFeedKind, now: Date = new Date()): Promise<{ token: string; createdAt: Date }> {
  const { db, write } = await database();
  const existing = await liveFeed(db, orgId, personId, kind);
  if (existing) {
    const token = deriveToken(existing.id, existing.salt);
    if (hashFeedToken(token) === existing.tokenHash) return { token, createdAt: existing.createdAt };
  }
  return write(async (tx) => {
    // Checked again inside the writer queue: two first visits at once make one feed.
    const live = await liveFeed(tx, orgId, personId, kind);
    if (live) {
      const token = deriveToken(live.id, live.salt);
      if (hashFeedToken(token) === live.tokenHash) return { token, createdAt: live.createdAt };
      await tx.update(calendarFeeds).set({ revokedAt: now }).where(eq(calendarFeeds.id, live.id));
    }
    const made = await insertFeed(tx, orgId, personId, kind, now);
    await recordAudit(tx, { orgId, actorId: personId, action: live ? "calendar-feed.reissued" : "calendar-feed.created", entityType: "calendar-feed", entityId: made.id, detail: { kind } }, now);
    return { token: made.token, createdAt: now };
  });
}

/** Turns the current address off and makes a new one; audited. */
export async function resetFeed(orgId: string, personId: string, kind: CalendarFeedKind, now: Date = new Date()): Promise<{ token: string }> {
  const { write } = await database();
  return write(async (tx) => {
    const live = await liveFeed(tx, orgId, personId, kind);
    if (live) await tx.update(calendarFeeds).set({ revokedAt: now }).where(eq(calendarFeeds.id, live.id));
    const made = await insertFeed(tx, orgId, personId, kind, now);
    await recordAudit(
      tx,
      { orgId, actorId: personId, action: "calendar-feed.reset", entityType: "calendar-feed", entityId: made.id, detail: { kind, revokedFeedId: live?.id ?? null } },
      now,
    );
    return { token: made.token };
  });
}

export type FeedOwner = {
  feedId: string;
  kind: CalendarFeedKind;
  orgId: string;
  timeZone: string;
  personId: string;
  personName: string;
  roles: string[];
};

/**
 * The feed a presented token opens, or null: an unknown, malformed or reset token, an inactive
 * person, or a units feed whose owner no longer manages anyone. The caller answers a bare 404.
 */
export async function findFeedByToken(token: string): Promise<FeedOwner | null> {
  if (!TOKEN_PATTERN.test(token)) return null;
  const { db } = await database();
  const [row] = await db
    .select({ feed: calendarFeeds, personName: people.name, active: people.active, timeZone: organisations.timeZone })
    .from(calendarFeeds)
    .innerJoin(people, and(eq(people.id, calendarFeeds.personId), eq(people.orgId, calendarFeeds.orgId)))
    .innerJoin(organisations, eq(organisations.id, calendarFeeds.orgId))
    .where(and(eq(calendarFeeds.tokenHash, hashFeedToken(token)), isNull(calendarFeeds.revokedAt)));
  if (!row || !row.active) return null;
  // The hash matched; the token must also be the one the current secret derives (a rotated secret ends old addresses).
  if (deriveToken(row.feed.id, row.feed.salt) !== token) return null;
  const roles = (
    await db
      .select({ role: personRoles.role })
      .from(personRoles)
      .where(and(eq(personRoles.orgId, row.feed.orgId), eq(personRoles.personId, row.feed.personId)))
  ).map((r) => r.role);
  if (row.feed.kind === "units" && !mayHaveUnitsFeed(roles)) return null;
  return { feedId: row.feed.id, kind: row.feed.kind, orgId: row.feed.orgId, timeZone: row.timeZone, personId: row.feed.personId, personName: row.personName, roles };
}

/** Live windows of the exams assigned to the person (open assignments), from each exam's latest published version. */
async function assignedExamWindows(orgId: string, personId: string): Promise<ExamWindow[]> {
  const { db } = await database();
  const open = await db
    .selectDistinct({ examId: assignments.examId })
    .from(assignments)
    .where(and(eq(assignments.orgId, orgId), eq(assignments.personId, personId), eq(assignments.kind, "exam"), eq(assignments.status, "open")));
  const examIds = open.map((a) => a.examId).filter((id): id is string => id !== null);
  if (examIds.length === 0) return [];
  const rows = await db
    .select({ examId: exams.id, title: exams.title, availableFrom: examVersions.availableFrom, availableUntil: examVersions.availableUntil })
    .from(exams)
    .innerJoin(examVersions, and(eq(examVersions.examId, exams.id), eq(examVersions.orgId, orgId)))
    .where(
      and(
        eq(exams.orgId, orgId),
        eq(exams.status, "published"),
        inArray(exams.id, examIds),
        sql`${examVersions.version} = (select max(v2.version) from ${examVersions} v2 where v2.exam_id = ${exams.id} and v2.published_at is not null)`,
      ),
    )
    .orderBy(asc(exams.title));
  return rows;
}

/** The person's own feed: their plan's dates and their assigned exams' windows. */
export async function personFeedEvents(owner: Pick<FeedOwner, "orgId" | "personId" | "timeZone">, now: Date): Promise<CalendarEvent[]> {
  const options = await statusOptionsFor(owner.orgId, owner.timeZone, now);
  const rows = (await getPlan(owner.orgId, owner.personId, owner.timeZone, options)) ?? [];
  const base = env().publicUrl;
  return [...planEvents(rows, owner.personId, `${base}/plan`), ...examWindowEvents(await assignedExamWindows(owner.orgId, owner.personId), owner.personId, `${base}/exams`)];
}

/**
 * A manager's units: what lapses in the next UNITS_FEED_DAYS days (today included) for the
 * people of the units they manage, from the Team matrix (the same status engine as My plan).
 */
export async function unitsExpiries(orgId: string, managerId: string, timeZone: string, now: Date): Promise<UnitExpiry[]> {
  const units = await listManagedUnits(orgId, managerId);
  if (units.length === 0) return [];
  const options = await statusOptionsFor(orgId, timeZone, now);
  const matrix = await loadMatrix(orgId, { unitIds: units.map((u) => u.id).sort() }, timeZone, options);
  const horizon: IsoDate = addDays(options.today, UNITS_FEED_DAYS);
  const names = new Map(matrix.columns.map((c) => [c.id, c.name]));
  const out: UnitExpiry[] = [];
  for (const p of matrix.people) {
    for (const [requirementId, cell] of Object.entries(p.cells)) {
      if (cell.dateMeaning !== "valid-through" || cell.date === null || cell.status === "waived") continue;
      if (cell.date < options.today || cell.date > horizon) continue;
      out.push({ personId: p.id, name: p.name, requirementId, requirement: names.get(requirementId) ?? "Requirement", validThrough: cell.date });
    }
  }
  return out.sort((a, b) => (a.validThrough < b.validThrough ? -1 : a.validThrough > b.validThrough ? 1 : a.name.localeCompare(b.name)));
}

export async function unitsFeedEvents(owner: Pick<FeedOwner, "orgId" | "personId" | "timeZone">, now: Date): Promise<CalendarEvent[]> {
  const base = env().publicUrl;
  return expiryEvents(await unitsExpiries(owner.orgId, owner.personId, owner.timeZone, now), owner.personId, (e) => `${base}/team/people/${e.personId}/requirements/${e.requirementId}`);
}
