/**
 * Exam-time accommodations (WCAG 2.2 SC 2.2.1 Timing Adjustable, W3C 2023): extra time as a
 * multiplier of an exam's time limit, or an untimed sitting, granted to one person with a reason.
 * Who may see and grant them follows the Team matrix's scope (`matrixScopeFor`): an educator the
 * whole organisation, a manager the people of the units they manage. Every write goes through
 * the queue with its audit event; a revoked row stays, marked, so the record shows it was in force.
 */
import { and, desc, eq, isNull, or, gte, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database, type DbOrTx } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { accommodations, people, units, type Accommodation } from "~/db/schema";
import type { IsoDate } from "~/domain/status";
import { onUnits } from "./credential-summary.server";
import type { matrixScopeFor } from "./team-matrix.server";

/** Who the viewer may accommodate: the Team matrix's scope (unit ids, or null for the whole organisation). */
export type AccommodationScope = Awaited<ReturnType<typeof matrixScopeFor>>;

/**
 * The accommodation an attempt starting `today` (the organisation's calendar date) honours: of
 * the person's rows that are not revoked and have not ended (no end date, or one on or after
 * today), the most generous — an untimed sitting beats any multiplier, else the largest
 * multiplier; ties go to the newest grant.
 */
export async function activeAccommodationFor(db: DbOrTx, orgId: string, personId: string, today: IsoDate): Promise<Accommodation | null> {
  const [row] = await db
    .select()
    .from(accommodations)
    .where(
      and(
        eq(accommodations.orgId, orgId),
        eq(accommodations.personId, personId),
        isNull(accommodations.revokedAt),
        or(isNull(accommodations.endsOn), gte(accommodations.endsOn, today)),
      ),
    )
    .orderBy(sql`case when ${accommodations.kind} = 'untimed' then 0 else 1 end`, desc(accommodations.multiplier), desc(accommodations.createdAt), desc(accommodations.id))
    .limit(1);
  return row ?? null;
}

export type ScopedPerson = { id: string; name: string; active: boolean; homeUnit: string | null };

/** A person of the viewer's organisation inside their scope, or null (the caller answers 404). */
export async function personInAccommodationScope(orgId: string, scope: AccommodationScope, personId: string): Promise<ScopedPerson | null> {
  const { db } = await database();
  const [row] = await db.all<{ id: string; name: string; active: number; home_unit: string | null }>(sql`
    select p.id, p.name, p.active, hu.name as home_unit
    from people p
    left join units hu on hu.id = p.home_unit_id and hu.org_id = ${orgId}
    where p.org_id = ${orgId} and p.id = ${personId} and ${onUnits(orgId, scope.unitIds)}`);
  return row ? { id: row.id, name: row.name, active: Boolean(row.active), homeUnit: row.home_unit } : null;
}

export type PersonOption = { value: string; label: string };

/**
 * Active people in scope for the person select, labelled "Name — unit" so typing a name finds
 * them; the viewer is left out (nobody grants themselves extra time).
 */
export async function accommodationCandidates(orgId: string, scope: AccommodationScope, viewerId: string): Promise<PersonOption[]> {
  const { db } = await database();
  const rows = await db.all<{ id: string; name: string; home_unit: string | null }>(sql`
    select p.id, p.name, hu.name as home_unit
    from people p
    left join units hu on hu.id = p.home_unit_id and hu.org_id = ${orgId}
    where p.org_id = ${orgId} and p.active = 1 and p.id <> ${viewerId} and ${onUnits(orgId, scope.unitIds)}
    order by p.name collate nocase, p.id`);
  return rows.map((r) => ({ value: r.id, label: `${r.name} — ${r.home_unit ?? "no home unit"}` }));
}

export type AccommodationState = "in-force" | "ended" | "revoked";

export type AccommodationRow = {
  id: string;
  personId: string;
  person: string;
  homeUnit: string | null;
  kind: Accommodation["kind"];
  multiplier: number | null;
  reason: string;
  endsOn: IsoDate | null;
  grantedBy: string | null;
  createdAt: Date;
  revokedAt: Date | null;
  revokedBy: string | null;
  state: AccommodationState;
};

export function accommodationState(row: { revokedAt: Date | null; endsOn: IsoDate | null }, today: IsoDate): AccommodationState {
  if (row.revokedAt) return "revoked";
  if (row.endsOn !== null && row.endsOn < today) return "ended";
  return "in-force";
}

const granter = alias(people, "granter");
const revoker = alias(people, "revoker");
const subject = alias(people, "p");
const homeUnit = alias(units, "hu");

/** Accommodations of the people in scope: those in force first, then ended and revoked ones, newest first. */
export async function listAccommodations(orgId: string, scope: AccommodationScope, today: IsoDate): Promise<AccommodationRow[]> {
  const { db } = await database();
  const rows = await db
    .select({
      id: accommodations.id,
      personId: accommodations.personId,
      person: subject.name,
      homeUnit: homeUnit.name,
      kind: accommodations.kind,
      multiplier: accommodations.multiplier,
      reason: accommodations.reason,
      endsOn: accommodations.endsOn,
      grantedBy: granter.name,
      createdAt: accommodations.createdAt,
      revokedAt: accommodations.revokedAt,
      revokedBy: revoker.name,
    })
    .from(accommodations)
    .innerJoin(subject, and(eq(subject.id, accommodations.personId), eq(subject.orgId, orgId)))
    .leftJoin(homeUnit, and(eq(homeUnit.id, subject.homeUnitId), eq(homeUnit.orgId, orgId)))
    .leftJoin(granter, eq(granter.id, accommodations.grantedBy))
    .leftJoin(revoker, eq(revoker.id, accommodations.revokedBy))
    // `onUnits` speaks of people aliased `p`, as the subject is here.
    .where(and(eq(accommodations.orgId, orgId), onUnits(orgId, scope.unitIds)))
    .orderBy(desc(accommodations.createdAt), desc(accommodations.id));
  const order: Record<AccommodationState, number> = { "in-force": 0, ended: 1, revoked: 1 };
  return rows
    .map((r) => ({ ...r, state: accommodationState(r, today) }))
    .sort((a, b) => order[a.state] - order[b.state]);
}

export type GrantInput = { personId: string; kind: Accommodation["kind"]; multiplier: number | null; reason: string; endsOn: IsoDate | null };

/** Records a grant and its audit event in one transaction; the caller has checked the person's scope. */
export async function grantAccommodation(orgId: string, actorId: string, input: GrantInput, now: Date = new Date()): Promise<string> {
  const { write } = await database();
  const multiplier = input.kind === "multiplier" ? input.multiplier : null;
  return write(async (tx) => {
    const [row] = await tx
      .insert(accommodations)
      .values({ orgId, personId: input.personId, kind: input.kind, multiplier, reason: input.reason, endsOn: input.endsOn, grantedBy: actorId, createdAt: now })
      .returning({ id: accommodations.id });
    await recordAudit(
      tx,
      { orgId, actorId, action: "accommodation.granted", entityType: "accommodation", entityId: row.id, detail: { personId: input.personId, kind: input.kind, multiplier, reason: input.reason, endsOn: input.endsOn } },
      now,
    );
    return row.id;
  });
}

/** One accommodation of the organisation, with its person, for the revoke action's checks. */
export async function getAccommodation(orgId: string, accommodationId: string): Promise<Accommodation | null> {
  const { db } = await database();
  const [row] = await db.select().from(accommodations).where(and(eq(accommodations.orgId, orgId), eq(accommodations.id, accommodationId)));
  return row ?? null;
}

/**
 * Ends an accommodation now. False when it was already revoked (a second click, or someone else
 * got there first): the row is left as the first revocation wrote it.
 */
export async function revokeAccommodation(orgId: string, actorId: string, accommodationId: string, now: Date = new Date()): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx
      .update(accommodations)
      .set({ revokedAt: now, revokedBy: actorId })
      .where(and(eq(accommodations.orgId, orgId), eq(accommodations.id, accommodationId), isNull(accommodations.revokedAt)))
      .returning();
    if (!row) return false;
    await recordAudit(
      tx,
      { orgId, actorId, action: "accommodation.revoked", entityType: "accommodation", entityId: row.id, detail: { personId: row.personId, kind: row.kind, multiplier: row.multiplier, endsOn: row.endsOn } },
      now,
    );
    return true;
  });
}
