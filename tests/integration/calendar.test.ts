/**
 * Calendar feeds (issue 10 §3): the feed is read back with an independent iCalendar parser
 * (ical.js, Mozilla's calendar library), its all-day dates are checked against the plan, and a
 * reset address stops working.
 */
// A zone west of UTC, so a date that passed through `new Date('YYYY-MM-DD')` (UTC midnight) would
// show a day early here (shared/STACK.md "Dates"); the organisation itself is in America/Chicago.
process.env.TZ = "Pacific/Pago_Pago";

import { and, eq, sql } from "drizzle-orm";
import ICAL from "ical.js";
import { beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { getPlan } from "~/db/queries/plan.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { assignments, auditEvents, calendarFeeds, credentials, credentialTypes, exams, requirements } from "~/db/schema";
import { addDays } from "~/domain/status";
import { loader as feedLoader } from "~/routes/calendar-feed";
import { action as calendarAction, loader as calendarLoader } from "~/routes/plan/calendar";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";

type FeedArgs = Parameters<typeof feedLoader>[0];
type PageArgs = Parameters<typeof calendarLoader>[0];
type ActionArgs = Parameters<typeof calendarAction>[0];

const THERAPIST = "therapist@kestrelvalley.test";
let db: Database;

beforeAll(async () => {
  db = await useSeededDatabase();
});

function tokenOf(address: string): string {
  const match = /\/calendar\/([^/]+)$/.exec(address);
  if (!match) throw new Error(`Not a calendar address: ${address}`);
  return match[1];
}

async function fetchFeed(token: string): Promise<Response> {
  return feedLoader(args<FeedArgs>(getRequest(`/calendar/${token}`), null, { token }));
}

type ParsedEvent = { uid: string; summary: string; start: string; end: string; startIsDate: boolean; url: string };

/** Parses with ical.js, not with our generator. */
function parseFeed(text: string): ParsedEvent[] {
  const calendar = new ICAL.Component(ICAL.parse(text));
  expect(calendar.name).toBe("vcalendar");
  expect(calendar.getFirstPropertyValue("version")).toBe("2.0");
  return calendar.getAllSubcomponents("vevent").map((v) => {
    const event = new ICAL.Event(v);
    return {
      uid: event.uid,
      summary: event.summary,
      start: event.startDate.toString(),
      end: event.endDate.toString(),
      startIsDate: event.startDate.isDate,
      url: String(v.getFirstPropertyValue("url") ?? ""),
    };
  });
}

async function myAddress(email: string) {
  return calendarLoader(args<PageArgs>(getRequest("/plan/calendar"), await viewerFor(email)));
}

describe("a person's calendar feed", () => {
  it("parses as iCalendar and puts every dated plan row on its own calendar date, all day", async () => {
    const page = await myAddress(THERAPIST);
    expect(page.person.address).toMatch(/^http:\/\/localhost:\d+\/calendar\/[A-Za-z0-9_-]{43}$/);
    expect(page.units).toBeNull();

    const response = await fetchFeed(tokenOf(page.person.address));
    expect(response.status).toBe(200);
    expect(response.headers.get("Content-Type")).toBe("text/calendar; charset=utf-8");
    expect(response.headers.get("Cache-Control")).toMatch(/^private/);
    const events = parseFeed(await response.text());

    const viewer = await viewerFor(THERAPIST);
    const options = await statusOptionsFor(viewer.org.id, viewer.org.timeZone);
    const rows = (await getPlan(viewer.org.id, viewer.person.id, viewer.org.timeZone, options))!;
    const dated = rows.filter((r) => r.result.date !== null);
    expect(dated.length).toBeGreaterThan(3);
    for (const row of dated) {
      const event = events.find((e) => e.uid.includes(row.key.replace(":", "-")));
      expect(event, `an event for ${row.title}`).toBeDefined();
      expect(event!.startIsDate).toBe(true);
      expect(event!.start).toBe(row.result.date);
      // RFC 5545 §3.6.1: an all-day event's DTEND is the next day (non-inclusive).
      expect(event!.end).toBe(addDays(row.result.date!, 1));
      expect(event!.summary).toContain(row.title);
      expect(event!.url).toMatch(/\/plan$/);
    }
    // Life-support cards run "through the end of the month" (American Heart Association, "Course
    // Card Information"): at least one month-end date, and it stays on that last day.
    const monthEnd = dated.find((r) => addDays(r.result.date!, 1).endsWith("-01"));
    expect(monthEnd, "a month-end date in the demo therapist's plan").toBeDefined();
    expect(events.find((e) => e.uid.includes(monthEnd!.key.replace(":", "-")))!.start).toBe(monthEnd!.result.date);
    // Every UID is unique within the feed, so calendar apps neither merge nor duplicate.
    expect(new Set(events.map((e) => e.uid)).size).toBe(events.length);
  });

  it("keeps a card valid through 14 March 2027 — the US change to daylight time — on 14 March", async () => {
    // 14 March 2027 is the second Sunday of March, when daylight saving time begins in the US
    // (Energy Policy Act of 2005, §110; 15 U.S.C. §260a). An all-day DATE has no time of day, so
    // it must not move (RFC 5545 §3.3.4).
    // The trap is armed: here, reading the date through a JavaScript Date would give the 13th.
    expect(new Date("2027-03-14").getDate()).toBe(13);
    const viewer = await viewerFor(THERAPIST);
    const typeId = crypto.randomUUID();
    await db.write(async (tx) => {
      await tx.insert(credentialTypes).values({ id: typeId, orgId: viewer.org.id, code: "DST-TEST", name: "Neonatal resuscitation provider", category: "life-support", rule: { kind: "months", months: 24 } });
      await tx.insert(credentials).values({ orgId: viewer.org.id, personId: viewer.person.id, credentialTypeId: typeId, issuedOn: "2025-03-14", validThrough: "2027-03-14" });
    });
    const page = await myAddress(THERAPIST);
    const events = parseFeed(await (await fetchFeed(tokenOf(page.person.address))).text());
    const card = events.filter((e) => e.summary.includes("Neonatal resuscitation provider"));
    expect(card).toHaveLength(1);
    expect(card[0].startIsDate).toBe(true);
    expect(card[0].start).toBe("2027-03-14");
    expect(card[0].end).toBe("2027-03-15");
    expect(card[0].summary).toBe("Expires: Neonatal resuscitation provider (last day valid)");
  });

  it("shows an assigned exam's availability window as an all-day span", async () => {
    const viewer = await viewerFor(THERAPIST);
    const [assigned] = await db.db
      .select({ examId: exams.id, title: exams.title })
      .from(assignments)
      .innerJoin(exams, eq(exams.id, assignments.examId))
      .where(and(eq(assignments.personId, viewer.person.id), eq(assignments.kind, "exam"), eq(assignments.status, "open"), eq(exams.status, "published")))
      .limit(1);
    expect(assigned, "the demo therapist has an open exam assignment").toBeDefined();
    // The live version is the latest published one.
    await db.write(async (tx) => {
      await tx.run(sql`update exam_versions set available_from = '2027-01-04', available_until = '2027-01-31'
        where exam_id = ${assigned.examId} and version = (select max(version) from exam_versions where exam_id = ${assigned.examId} and published_at is not null)`);
    });
    const events = parseFeed(await (await fetchFeed(tokenOf((await myAddress(THERAPIST)).person.address))).text());
    const window = events.find((e) => e.summary === `Exam open: ${assigned.title}`);
    expect(window).toBeDefined();
    expect(window!.startIsDate).toBe(true);
    expect(window!.start).toBe("2027-01-04");
    // Last day 31 January: DTEND is 1 February (non-inclusive, RFC 5545 §3.6.1).
    expect(window!.end).toBe("2027-02-01");
    expect(window!.url).toMatch(/\/exams$/);
  });

  it("gives the same address on every visit, and stores no token in plain text", async () => {
    const first = await myAddress(THERAPIST);
    const second = await myAddress(THERAPIST);
    expect(second.person.address).toBe(first.person.address);
    const token = tokenOf(first.person.address);
    const rows = await db.db.select().from(calendarFeeds);
    expect(rows.length).toBeGreaterThan(0);
    const dump = JSON.stringify(rows);
    expect(dump).not.toContain(token);
    const everything = await db.client.execute("select * from calendar_feeds");
    expect(JSON.stringify(everything.rows)).not.toContain(token);
  });
});

describe("resetting and unknown addresses", () => {
  it("a reset gives a new address, the old one answers 404, and the reset is audited", async () => {
    const viewer = await viewerFor(THERAPIST);
    const before = await myAddress(THERAPIST);
    const oldToken = tokenOf(before.person.address);
    expect((await fetchFeed(oldToken)).status).toBe(200);

    // Asked twice: without the confirmation nothing changes.
    const unconfirmed = await calendarAction(args<ActionArgs>(postForm("/plan/calendar", { intent: "reset-person-feed" }), viewer));
    expect((unconfirmed as { init: ResponseInit | null }).init?.status).toBe(400);
    expect((await fetchFeed(oldToken)).status).toBe(200);

    const thrown = await calendarAction(args<ActionArgs>(postForm("/plan/calendar", { intent: "reset-person-feed", confirm: "yes" }), viewer)).catch((e: unknown) => e);
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(302);
    expect((thrown as Response).headers.get("Location")).toBe("/plan/calendar");

    const after = await myAddress(THERAPIST);
    expect(after.person.address).not.toBe(before.person.address);
    const gone = await fetchFeed(oldToken);
    expect(gone.status).toBe(404);
    expect(await gone.text()).toBe("Not found");
    expect((await fetchFeed(tokenOf(after.person.address))).status).toBe(200);

    const audited = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "calendar-feed.reset"), eq(auditEvents.actorId, viewer.person.id)));
    expect(audited).toHaveLength(1);
  });

  it("an unknown or malformed token answers a bare 404", async () => {
    for (const token of ["A".repeat(43), "not-a-token", "x".repeat(200), `${"B".repeat(43)}.ics`]) {
      const response = await fetchFeed(token);
      expect(response.status).toBe(404);
      expect(await response.text()).toBe("Not found");
    }
  });

  it("a therapist cannot reset a units feed they do not have", async () => {
    const viewer = await viewerFor(THERAPIST);
    const thrown = await calendarAction(args<ActionArgs>(postForm("/plan/calendar", { intent: "reset-units-feed", confirm: "yes" }), viewer)).catch((e: unknown) => e);
    expect((thrown as { init?: ResponseInit }).init?.status ?? (thrown as Response).status).toBe(403);
  });
});

describe("a manager's units feed", () => {
  it("lists an expiry of a person in their unit and none of another unit", async () => {
    // The demo manager, narrowed to one unit for this test (in the seed they manage all four).
    const [manager] = await db.db.all<{ person_id: string; email: string; unit_id: string }>(sql`
      select pu.person_id, p.email, pu.unit_id from person_units pu join people p on p.id = pu.person_id
      where p.email = 'manager@kestrelvalley.test' and pu.relation = 'manages' order by pu.unit_id limit 1`);
    expect(manager).toBeDefined();
    await db.write(async (tx) => {
      await tx.run(sql`delete from person_units where person_id = ${manager.person_id} and relation = 'manages' and unit_id <> ${manager.unit_id}`);
    });
    const viewer = await viewerFor(manager.email);
    const orgId = viewer.org.id;

    const inUnit = async (unitId: string, notIn: string) =>
      (
        await db.db.all<{ id: string; name: string }>(sql`
          select p.id, p.name from people p where p.org_id = ${orgId} and p.active = 1 and p.id <> ${manager.person_id}
            and (p.home_unit_id = ${unitId} or exists (select 1 from person_units m where m.person_id = p.id and m.unit_id = ${unitId} and m.relation = 'member'))
            and not (p.home_unit_id = ${notIn} or exists (select 1 from person_units m where m.person_id = p.id and m.unit_id = ${notIn} and m.relation = 'member'))
          order by p.name limit 1`)
      )[0];
    const [otherUnit] = await db.db.all<{ id: string }>(sql`select id from units where org_id = ${orgId} and active = 1 and id <> ${manager.unit_id} order by name limit 1`);
    const ours = await inUnit(manager.unit_id, otherUnit.id);
    const theirs = await inUnit(otherUnit.id, manager.unit_id);
    expect(ours && theirs).toBeTruthy();

    // A card every one must hold, expiring 30 days from today for one person of each unit.
    const typeId = crypto.randomUUID();
    const requirementId = crypto.randomUUID();
    const today = (await statusOptionsFor(orgId, viewer.org.timeZone)).today;
    const lapsesOn = addDays(today, 30);
    await db.write(async (tx) => {
      await tx.insert(credentialTypes).values({ id: typeId, orgId, code: "UNITS-FEED-TEST", name: "Transport ventilation card", category: "other", rule: { kind: "months", months: 12 } });
      await tx.insert(requirements).values({ id: requirementId, orgId, name: "Transport ventilation card", kind: "credential", credentialTypeId: typeId });
      await tx.insert(credentials).values([
        { orgId, personId: ours.id, credentialTypeId: typeId, issuedOn: addDays(lapsesOn, -365), validThrough: lapsesOn },
        { orgId, personId: theirs.id, credentialTypeId: typeId, issuedOn: addDays(lapsesOn, -365), validThrough: lapsesOn },
      ]);
    });

    const page = await myAddress(manager.email);
    expect(page.units).not.toBeNull();
    expect(page.units!.address).not.toBe(page.person.address);
    const response = await fetchFeed(tokenOf(page.units!.address));
    expect(response.status).toBe(200);
    const events = parseFeed(await response.text());

    const mine = events.filter((e) => e.summary.includes("Transport ventilation card"));
    expect(mine.map((e) => e.summary)).toEqual([`Expires: ${ours.name} — Transport ventilation card (last day valid)`]);
    expect(mine[0].start).toBe(lapsesOn);
    expect(mine[0].startIsDate).toBe(true);
    expect(mine[0].url).toContain(`/team/people/${ours.id}/requirements/${requirementId}`);
    expect(events.some((e) => e.summary.includes(theirs.name))).toBe(false);

    // Every event is about a person of the manager's unit, within the next 180 days.
    const members = new Set(
      (
        await db.db.all<{ id: string }>(sql`
          select p.id from people p where p.org_id = ${orgId}
            and (p.home_unit_id = ${manager.unit_id} or exists (select 1 from person_units m where m.person_id = p.id and m.unit_id = ${manager.unit_id} and m.relation = 'member'))`)
      ).map((r) => r.id),
    );
    for (const e of events) {
      expect([...members].some((id) => e.uid.includes(id))).toBe(true);
      expect(e.start >= today && e.start <= addDays(today, 180)).toBe(true);
    }

    // Its own reset leaves the person's feed alone.
    const personToken = tokenOf(page.person.address);
    await calendarAction(args<ActionArgs>(postForm("/plan/calendar", { intent: "reset-units-feed", confirm: "yes" }), viewer)).catch((e: unknown) => e);
    expect((await fetchFeed(tokenOf(page.units!.address))).status).toBe(404);
    expect((await fetchFeed(personToken)).status).toBe(200);
  });
});
