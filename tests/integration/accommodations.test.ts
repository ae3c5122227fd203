/**
 * /team/accommodations: giving a person extra time (a multiplier) or an untimed sitting, with a
 * reason, audited; refusing out-of-range multipliers, missing reasons and past end dates with a
 * message beside the field; who may do it (educators for the organisation, managers for their
 * units, nobody across organisations); revoking; and which accommodation an attempt honours.
 *
 * Bounds: WCAG 2.2 SC 2.2.1 Timing Adjustable (W3C Recommendation, 2023) asks that a time limit
 * can be turned off, or adjusted to at least ten times its default — hence "untimed" and a
 * multiplier up to 10. The lower bound 1.1 is our own rule (app/domain/exams/timing.ts: less is no
 * real extra time; common practice, no source).
 */
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { activeAccommodationFor, personInAccommodationScope } from "~/db/queries/accommodations.server";
import { matrixScopeFor } from "~/db/queries/team-matrix.server";
import { accommodations, auditEvents, organisations, people, personRoles, personUnits } from "~/db/schema";
import * as route from "~/routes/team/accommodations";
import { TEST_TODAY } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { dayOffset, useTodayPlanTeamWorld } from "./today-plan-team-harness";

type LoaderArgs = Parameters<typeof route.loader>[0];
type ActionArgs = Parameters<typeof route.action>[0];
type LoaderData = Awaited<ReturnType<typeof route.loader>>;

const world = useTodayPlanTeamWorld();
const PATH = "/team/accommodations";

/** Runs the action; a thrown redirect or error response comes back as its status and body. */
async function act(viewer: Viewer, fields: Record<string, string>): Promise<{ status: number; body: unknown; location: string | null }> {
  try {
    const out = (await route.action(args<ActionArgs>(postForm(PATH, fields), viewer))) as unknown as { data?: unknown; init?: { status?: number } };
    return { status: out.init?.status ?? 200, body: out.data, location: null };
  } catch (thrown) {
    if (thrown instanceof Response) return { status: thrown.status, body: null, location: thrown.headers.get("Location") };
    const t = thrown as { data?: unknown; init?: { status?: number } };
    if (t && typeof t === "object" && "init" in t) return { status: t.init?.status ?? 500, body: t.data, location: null };
    throw thrown;
  }
}

async function load(viewer: Viewer): Promise<LoaderData> {
  return (await route.loader(args<LoaderArgs>(getRequest(PATH), viewer))) as LoaderData;
}

async function loaderStatus(viewer: Viewer): Promise<number> {
  try {
    await load(viewer);
    return 200;
  } catch (thrown) {
    const t = thrown as { init?: { status?: number }; status?: number };
    return t.init?.status ?? t.status ?? 500;
  }
}

function errorsOf(body: unknown): Record<string, string[] | null> {
  return ((body as { error?: Record<string, string[] | null> } | null)?.error ?? {}) as Record<string, string[] | null>;
}

const grant = (personId: string, over: Record<string, string> = {}) => ({
  intent: "grant-accommodation",
  personId,
  kind: "multiplier",
  multiplier: "1.5",
  reason: "Reading disorder documented by occupational health",
  endsOn: "",
  ...over,
});

async function rowsFor(personId: string) {
  return world.db.db.select().from(accommodations).where(eq(accommodations.personId, personId));
}

/**
 * A Kestrel Valley manager of one unit only (the demo manager manages all four), and an active
 * person outside that unit. The preceptor is made manager of the therapist's home unit, once.
 */
let unitManager: Promise<{ manager: Viewer; outsider: string }> | undefined;
function unitManagerAndOutsider(): Promise<{ manager: Viewer; outsider: string }> {
  unitManager ??= (async () => {
    const orgId = world.viewers.manager.org.id;
    const who = world.viewers.preceptor.person;
    const unitId = world.viewers.therapist.person.homeUnitId!;
    await world.db.write(async (tx) => {
      await tx.insert(personRoles).values({ orgId, personId: who.id, role: "manager" });
      await tx.insert(personUnits).values({ orgId, personId: who.id, unitId, relation: "manages" });
    });
    const manager = await viewerFor(who.email);
    const scope = await matrixScopeFor(orgId, who.id, manager.roles);
    expect(scope.unitIds).toEqual([unitId]);
    const everyone = await world.db.db.select({ id: people.id }).from(people).where(and(eq(people.orgId, orgId), eq(people.active, true))).orderBy(people.id);
    for (const p of everyone) {
      if (!(await personInAccommodationScope(orgId, scope, p.id))) return { manager, outsider: p.id };
    }
    throw new Error("Everyone in the seed is on one unit");
  })();
  return unitManager;
}

describe("granting extra time", () => {
  it("a manager gives 1.5× with a reason: saved, audited, listed, and honoured by the next attempt", async () => {
    const manager = world.viewers.manager;
    const person = world.viewers.therapist.person.id;
    const res = await act(manager, grant(person, { endsOn: dayOffset(90) }));
    expect(res).toMatchObject({ status: 302, location: PATH });
    const [saved] = await rowsFor(person);
    expect(saved).toMatchObject({ orgId: manager.org.id, kind: "multiplier", multiplier: 1.5, reason: "Reading disorder documented by occupational health", endsOn: dayOffset(90), grantedBy: manager.person.id, revokedAt: null });
    const audit = await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, saved.id), eq(auditEvents.action, "accommodation.granted")));
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ actorId: manager.person.id, entityType: "accommodation", orgId: manager.org.id });
    expect(JSON.parse(audit[0].detail)).toMatchObject({ personId: person, kind: "multiplier", multiplier: 1.5, reason: saved.reason });

    const page = await load(manager);
    expect(page.rows.find((r) => r.id === saved.id)).toMatchObject({ person: world.viewers.therapist.person.name, state: "in-force", grantedBy: manager.person.name });
    // The label lets a manager find the person by typing the name: "Name — unit".
    expect(page.people.find((p) => p.value === person)?.label).toMatch(new RegExp(`^${world.viewers.therapist.person.name} — `));
    expect(await activeAccommodationFor(world.db.db, manager.org.id, person, TEST_TODAY)).toMatchObject({ id: saved.id, multiplier: 1.5 });
  });

  it("an educator gives an untimed sitting; a multiplier left in the form is ignored", async () => {
    const educator = world.viewers.educator;
    const person = world.viewers.preceptor.person.id;
    const res = await act(educator, grant(person, { kind: "untimed", multiplier: "12", reason: "Uses a screen reader" }));
    expect(res.status).toBe(302);
    const [saved] = (await rowsFor(person)).filter((r) => r.reason === "Uses a screen reader");
    expect(saved).toMatchObject({ kind: "untimed", multiplier: null, endsOn: null, grantedBy: educator.person.id });
  });

  it("refuses a multiplier below 1.1 or above 10 (WCAG 2.2.1: up to ten times) with a message beside the field", async () => {
    const manager = world.viewers.manager;
    const person = world.viewers.therapist.person.id;
    const before = (await rowsFor(person)).length;
    const low = await act(manager, grant(person, { multiplier: "0.5" }));
    expect(low.status).toBe(400);
    expect(errorsOf(low.body).multiplier).toEqual(["At least 1.1: less than that is no real extra time."]);
    const high = await act(manager, grant(person, { multiplier: "12" }));
    expect(high.status).toBe(400);
    expect(errorsOf(high.body).multiplier).toEqual(["At most 10 times the time limit; for more, choose “No time limit”."]);
    const word = await act(manager, grant(person, { multiplier: "one and a half" }));
    expect(errorsOf(word.body).multiplier).toEqual(["Enter the extra time as a number, such as 1.5."]);
    // The bounds themselves are allowed: exactly 10 is the WCAG figure.
    expect((await act(manager, grant(person, { multiplier: "10", reason: "Ten times, the WCAG ceiling" }))).status).toBe(302);
    expect((await rowsFor(person)).length).toBe(before + 1);
  });

  it("refuses a missing or too short reason, and an end date in the past", async () => {
    const manager = world.viewers.manager;
    const person = world.viewers.therapist.person.id;
    const before = (await rowsFor(person)).length;
    const none = await act(manager, grant(person, { reason: "" }));
    expect(none.status).toBe(400);
    expect(errorsOf(none.body).reason).toEqual(["Give the reason; it is kept with the record."]);
    const short = await act(manager, grant(person, { reason: "abc" }));
    expect(errorsOf(short.body).reason).toEqual(["Give the reason in at least 5 characters; it is kept with the record."]);
    const long = await act(manager, grant(person, { reason: "x".repeat(501) }));
    expect(errorsOf(long.body).reason).toEqual(["At most 500 characters."]);
    const past = await act(manager, grant(person, { endsOn: dayOffset(-1) }));
    expect(past.status).toBe(400);
    expect(errorsOf(past.body).endsOn).toEqual([`The end date cannot be in the past: today is ${TEST_TODAY}.`]);
    const noSuchDay = await act(manager, grant(person, { endsOn: "2027-02-30" }));
    expect(errorsOf(noSuchDay.body).endsOn).toEqual(["There is no such day: check the end date."]);
    expect((await rowsFor(person)).length).toBe(before);
    // Today itself is allowed (the last day it applies), in the organisation's time zone.
    expect((await act(manager, grant(person, { endsOn: TEST_TODAY, reason: "Just for today's sitting" }))).status).toBe(302);
  });

  it("refuses an inactive person with a message on the person field", async () => {
    const manager = world.viewers.manager;
    const page = await load(manager);
    const target = page.people.find((p) => ![world.viewers.therapist.person.id, world.viewers.preceptor.person.id, manager.person.id].includes(p.value))!;
    await world.db.write((tx) => tx.update(people).set({ active: false }).where(eq(people.id, target.value)));
    try {
      const res = await act(manager, grant(target.value));
      expect(res.status).toBe(400);
      expect(errorsOf(res.body).personId?.[0]).toMatch(/is not active/);
      expect(await rowsFor(target.value)).toHaveLength(0);
      expect((await load(manager)).people.some((p) => p.value === target.value)).toBe(false);
    } finally {
      await world.db.write((tx) => tx.update(people).set({ active: true }).where(eq(people.id, target.value)));
    }
  });
});

describe("who may grant and see", () => {
  it("nobody gives themselves extra time: refused on the person field, and left out of the list", async () => {
    const manager = world.viewers.manager;
    const res = await act(manager, grant(manager.person.id));
    expect(res.status).toBe(400);
    expect(errorsOf(res.body).personId).toEqual(["You cannot give yourself extra time; ask another educator or manager."]);
    expect(await rowsFor(manager.person.id)).toHaveLength(0);
    expect((await load(manager)).people.some((p) => p.value === manager.person.id)).toBe(false);
  });

  it("a therapist may neither open the page nor post to it (403)", async () => {
    const therapist = world.viewers.therapist;
    expect(await loaderStatus(therapist)).toBe(403);
    const res = await act(therapist, grant(therapist.person.id));
    expect(res.status).toBe(403);
    expect((await rowsFor(therapist.person.id)).some((r) => r.grantedBy === therapist.person.id)).toBe(false);
  });

  it("a manager cannot grant to someone outside the units they manage (404), nor see them", async () => {
    const { manager, outsider } = await unitManagerAndOutsider();
    const res = await act(manager, grant(outsider));
    expect(res.status).toBe(404);
    expect(await rowsFor(outsider)).toHaveLength(0);
    const page = await load(manager);
    expect(page.wholeOrganisation).toBe(false);
    expect(page.people.some((p) => p.value === outsider)).toBe(false);
    // The educator reads the whole organisation and may grant to the same person.
    const educatorPage = await load(world.viewers.educator);
    expect(educatorPage.wholeOrganisation).toBe(true);
    expect(educatorPage.people.some((p) => p.value === outsider)).toBe(true);
  });

  it("another organisation's person is 404, and another organisation sees none of our accommodations", async () => {
    const ours = world.viewers.therapist.person.id;
    const res = await act(world.viewers.abManager, grant(ours));
    expect(res.status).toBe(404);
    const [theirPerson] = await world.db.db.select({ id: people.id }).from(people).where(eq(people.orgId, world.viewers.abManager.org.id)).limit(1);
    expect((await act(world.viewers.manager, grant(theirPerson.id))).status).toBe(404);
    expect(await rowsFor(theirPerson.id)).toHaveLength(0);
    const theirs = await load(world.viewers.abManager);
    expect(theirs.rows.some((r) => r.personId === ours)).toBe(false);
    expect(theirs.people.some((p) => p.value === ours)).toBe(false);
  });

  it("an unknown intent is a 400", async () => {
    expect((await act(world.viewers.manager, { intent: "delete-everything" })).status).toBe(400);
  });
});

describe("revoking", () => {
  it("asks for confirmation, then sets revoked at and by (audited); a second revoke is refused; outsiders get 404", async () => {
    const manager = world.viewers.manager;
    const person = world.viewers.therapist.person.id;
    expect((await act(manager, grant(person, { kind: "untimed", reason: "Temporary: wrist in a cast" }))).status).toBe(302);
    const [row] = (await rowsFor(person)).filter((r) => r.reason === "Temporary: wrist in a cast");
    const revoke = { intent: "revoke-accommodation", accommodationId: row.id, confirm: "yes" };

    // Without the second "yes" nothing happens.
    const unconfirmed = await act(manager, { ...revoke, confirm: "" });
    expect(unconfirmed.status).toBe(400);
    expect(errorsOf(unconfirmed.body).confirm).toEqual(["Confirm to go ahead: press the confirming button."]);
    expect(await activeAccommodationFor(world.db.db, manager.org.id, person, TEST_TODAY)).toMatchObject({ id: row.id });

    expect((await act(world.viewers.therapist, revoke)).status).toBe(403);
    expect((await act(world.viewers.abManager, revoke)).status).toBe(404);

    const res = await act(manager, revoke);
    expect(res).toMatchObject({ status: 302, location: PATH });
    const [after] = await world.db.db.select().from(accommodations).where(eq(accommodations.id, row.id));
    expect(after.revokedAt).toBeInstanceOf(Date);
    expect(after.revokedBy).toBe(manager.person.id);
    expect(await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, row.id), eq(auditEvents.action, "accommodation.revoked")))).toHaveLength(1);
    const listed = (await load(manager)).rows.find((r) => r.id === row.id);
    expect(listed).toMatchObject({ state: "revoked", revokedBy: manager.person.name });
    // The untimed grant no longer counts; what remains is the most generous multiplier.
    expect((await activeAccommodationFor(world.db.db, manager.org.id, person, TEST_TODAY))?.id).not.toBe(row.id);

    const again = await act(manager, revoke);
    expect(again.status).toBe(409);
    expect(errorsOf(again.body)[""]).toEqual(["This accommodation was already revoked. Reload the page to see who revoked it."]);
    expect(await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, row.id), eq(auditEvents.action, "accommodation.revoked")))).toHaveLength(1);
  });

  it("a unit manager cannot revoke an accommodation of someone outside their units (404)", async () => {
    const { manager, outsider } = await unitManagerAndOutsider();
    expect((await act(world.viewers.educator, grant(outsider, { reason: "Extra time after a head injury" }))).status).toBe(302);
    const [row] = await rowsFor(outsider);
    expect((await act(manager, { intent: "revoke-accommodation", accommodationId: row.id, confirm: "yes" })).status).toBe(404);
    const [still] = await rowsFor(outsider);
    expect(still.revokedAt).toBeNull();
  });
});

describe("activeAccommodationFor: which accommodation an attempt honours", () => {
  it("untimed beats 2×; revoked and ended rows are ignored; an end date is inclusive; ties go to the newest", async () => {
    const orgId = world.viewers.educator.org.id;
    // A person with no accommodation from the other tests.
    const [person] = await world.db.db
      .select({ id: people.id })
      .from(people)
      .where(and(eq(people.orgId, orgId), eq(people.email, "educator@kestrelvalley.test")));
    const at = (minutes: number) => new Date(Date.UTC(2026, 10, 1, 12, minutes));
    const insert = (values: Partial<typeof accommodations.$inferInsert> & { kind: "multiplier" | "untimed" }) =>
      world.db.write(async (tx) => {
        const [row] = await tx
          .insert(accommodations)
          .values({ orgId, personId: person.id, reason: "Unit-level check", multiplier: null, endsOn: null, ...values })
          .returning({ id: accommodations.id });
        return row.id;
      });

    expect(await activeAccommodationFor(world.db.db, orgId, person.id, TEST_TODAY)).toBeNull();

    const twice = await insert({ kind: "multiplier", multiplier: 2, createdAt: at(1) });
    await insert({ kind: "multiplier", multiplier: 1.5, createdAt: at(2) });
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, TEST_TODAY))?.id).toBe(twice);

    // Revoked untimed and ended untimed / 3× rows do not count.
    await insert({ kind: "untimed", createdAt: at(3), revokedAt: at(4) });
    await insert({ kind: "untimed", createdAt: at(5), endsOn: dayOffset(-1) });
    await insert({ kind: "multiplier", multiplier: 3, createdAt: at(6), endsOn: dayOffset(-1) });
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, TEST_TODAY))?.id).toBe(twice);

    // An untimed sitting ending today beats 2× today, and no longer tomorrow.
    const untimed = await insert({ kind: "untimed", createdAt: at(7), endsOn: TEST_TODAY });
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, TEST_TODAY))?.id).toBe(untimed);
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, dayOffset(1)))?.id).toBe(twice);
    // Two days ago the rows that ended yesterday still counted, and an untimed sitting wins.
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, dayOffset(-2)))?.kind).toBe("untimed");

    // Equal multipliers: the newest grant.
    const newerTwice = await insert({ kind: "multiplier", multiplier: 2, createdAt: at(8) });
    expect((await activeAccommodationFor(world.db.db, orgId, person.id, dayOffset(1)))?.id).toBe(newerTwice);

    // Another organisation's id finds nothing for this person.
    const [other] = await world.db.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "alder-bay"));
    expect(await activeAccommodationFor(world.db.db, other.id, person.id, TEST_TODAY)).toBeNull();
  });
});
