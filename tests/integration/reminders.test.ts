/**
 * The reminder job (issue 9 §1) on a copy of the seeded database, with a controlled `now` and
 * the real local e-mail fake (tools/mail-fake) receiving what the real Resend SDK sends.
 * Cadence (90/60/30/14/7 days, on the day, weekly while lapsed): common practice, no source.
 * Weekdays and ISO weeks of the dates below: checked with Python's datetime.date.isocalendar().
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { database } from "~/db/client.server";
import { runReminders } from "~/db/queries/reminder-job.server";
import { runMissedReminders } from "~/db/queries/reminder-schedule.server";
import { getReminderPolicy, saveReminderDelivery } from "~/db/queries/reminders.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import { auditEvents, credentials, credentialTypes, organisations, reminders, requirements } from "~/db/schema";
import type { SendEmailOptions } from "~/email/send-email.server";
import * as adminReminders from "~/routes/admin/reminders";
import * as planReminders from "~/routes/plan/reminders";
import { DEMO_ACCOUNTS } from "../../seeds/kestrel-valley";
import { startMailFake, type MailFake } from "../../tools/mail-fake/mail-fake";
import { fieldErrors, outcome, type ArgsOf } from "./admin-harness";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { args, postForm, viewerFor } from "../setup/request";

// Each run assesses the whole seeded organisation and renders every e-mail it sends (~50 on the
// demo day): slower than most integration tests on a loaded two-core machine.
vi.setConfig({ testTimeout: 90_000 });

const PUBLIC = "https://tidemark.example.test";
/** 15:00 UTC is 09:00 in Chicago (the seeded organisation's zone): the same calendar day. */
const at = (day: string) => new Date(`${day}T15:00:00Z`);

let fake: MailFake;
let mail: SendEmailOptions;
let kvOrgId: string;

beforeEach(async () => {
  await useSeededDatabase();
  fake = await startMailFake({ port: 0, dataDir: mkdtempSync(path.join(tmpdir(), "tidemark-reminders-mail-")) });
  mail = { settings: { mailTransport: "resend", resendApiKey: "re_test_key", resendBaseUrl: fake.url, smtpUrl: "smtp://127.0.0.1:1", mailFrom: "Tidemark <no-reply@tidemark.test>" } };
  kvOrgId = (await viewerFor(DEMO_ACCOUNTS.admin)).org.id;
});
afterEach(async () => {
  await fake.close();
});

const run = (day: string) => runReminders({ now: at(day), trigger: "test", mail, publicUrl: PUBLIC, orgIds: [kvOrgId] });
const to = (email: string) => fake.messages().filter((m) => m.to.includes(email));

/** The Basic life support requirement, with no grace period so it lapses the day after its date. */
async function basicLifeSupport() {
  const { db, write } = await database();
  const [row] = await db
    .select({ requirementId: requirements.id, typeId: credentialTypes.id })
    .from(requirements)
    .innerJoin(credentialTypes, eq(credentialTypes.id, requirements.credentialTypeId))
    .where(and(eq(requirements.orgId, kvOrgId), eq(credentialTypes.code, "basic-life-support"), eq(requirements.active, true)));
  await write((tx) => tx.update(requirements).set({ graceDays: 0 }).where(eq(requirements.id, row.requirementId)));
  return row;
}

/** Makes every card of this type the person holds valid through `validThrough` (one is added when they hold none). */
async function setCard(personId: string, typeId: string, validThrough: string) {
  const { db, write } = await database();
  const held = await db.select({ id: credentials.id }).from(credentials).where(and(eq(credentials.personId, personId), eq(credentials.credentialTypeId, typeId)));
  await write(async (tx) => {
    if (held.length === 0) await tx.insert(credentials).values({ orgId: kvOrgId, personId, credentialTypeId: typeId, issuedOn: "2024-12-01", validThrough });
    else await tx.update(credentials).set({ validThrough }).where(and(eq(credentials.personId, personId), eq(credentials.credentialTypeId, typeId)));
  });
}

async function remindersOf(personId: string, requirementId: string) {
  const { db } = await database();
  return db
    .select({ dueOn: reminders.dueOn, threshold: reminders.threshold, sentAt: reminders.sentAt, messageId: reminders.messageId, channel: reminders.channel })
    .from(reminders)
    .where(and(eq(reminders.personId, personId), eq(reminders.requirementId, requirementId)))
    .orderBy(reminders.createdAt);
}

function noDuplicates(messages: { to: string[]; subject: string }[]) {
  const keys = messages.map((m) => `${m.to.join()}|${m.subject}`);
  expect(new Set(keys).size).toBe(keys.length);
}

describe("the reminder job sends each reminder once", () => {
  it("running twice on the same day sends nothing the second time", async () => {
    const first = await run(TEST_TODAY);
    expect(first[0].remindersSent).toBeGreaterThan(0);
    expect(first[0].failed).toEqual([]);
    const count = fake.messages().length;
    expect(count).toBe(first[0].emails.length);

    const { db } = await database();
    const rows = await db.select().from(reminders).where(eq(reminders.orgId, kvOrgId));
    expect(rows).toHaveLength(first[0].remindersSent);
    const ids = new Set(fake.messages().map((m) => m.id));
    for (const r of rows) {
      expect(r.sentAt?.getTime()).toBe(at(TEST_TODAY).getTime());
      expect(ids.has(r.messageId!)).toBe(true);
    }

    const second = await run(TEST_TODAY);
    expect(second[0].remindersSent).toBe(0);
    expect(second[0].emails).toEqual([]);
    expect(fake.messages()).toHaveLength(count);
    // The next day of the same ISO week: nobody lapsed is reminded again (weekly), though others
    // may reach their next threshold.
    const lapsedBefore = new Set(fake.messages().filter((m) => m.subject.startsWith("Lapsed:")).map((m) => `${m.to.join()}|${m.subject}`));
    expect(lapsedBefore.size).toBeGreaterThan(0);
    const third = await run("2026-12-03");
    for (const e of third[0].emails) expect(lapsedBefore.has(`${e.to}|${e.subject}`)).toBe(false);
  });

  it("two runs at once (Promise.all) send each reminder and the manager's digest once between them", async () => {
    const [a, b] = await Promise.all([run(TEST_TODAY), run(TEST_TODAY)]);
    const { db } = await database();
    const rows = await db.select().from(reminders).where(eq(reminders.orgId, kvOrgId));
    expect(rows.length).toBeGreaterThan(0);
    expect(a[0].remindersSent + b[0].remindersSent).toBe(rows.length);
    expect(fake.messages()).toHaveLength(a[0].emails.length + b[0].emails.length);
    noDuplicates(fake.messages());
    expect(to(DEMO_ACCOUNTS.manager).filter((m) => m.subject.startsWith("Weekly digest"))).toHaveLength(1);
  });

  it("the in-app check runs each organisation once a day, whatever the number of hourly ticks", async () => {
    expect(await runMissedReminders(at(TEST_TODAY), { mail, publicUrl: PUBLIC })).toBe(2);
    const count = fake.messages().length;
    expect(await runMissedReminders(new Date(at(TEST_TODAY).getTime() + 60 * 60 * 1000), { mail, publicUrl: PUBLIC })).toBe(0);
    expect(fake.messages()).toHaveLength(count);
    expect(await runMissedReminders(at("2026-12-03"), { mail, publicUrl: PUBLIC })).toBe(2);
  });

  it("the in-app check tries again an hour later when the e-mail service was unreachable", async () => {
    const unreachable = { settings: { ...mail.settings!, resendBaseUrl: "http://127.0.0.1:9" } };
    expect(await runMissedReminders(at(TEST_TODAY), { mail: unreachable, publicUrl: PUBLIC })).toBe(2);
    expect(fake.messages()).toHaveLength(0);
    expect(await runMissedReminders(new Date(at(TEST_TODAY).getTime() + 60 * 60 * 1000), { mail, publicUrl: PUBLIC })).toBe(2);
    expect(fake.messages().length).toBeGreaterThan(0);
    expect(await runMissedReminders(new Date(at(TEST_TODAY).getTime() + 2 * 60 * 60 * 1000), { mail, publicUrl: PUBLIC })).toBe(0);
  });
});

describe("when the e-mail cannot go out", () => {
  it("an unreachable service releases the claims, so the next run sends them; a refusal is kept with its reason and not retried", async () => {
    const unreachable = { settings: { ...mail.settings!, resendBaseUrl: "http://127.0.0.1:9" } };
    const down = await runReminders({ now: at(TEST_TODAY), trigger: "test", mail: unreachable, publicUrl: PUBLIC, orgIds: [kvOrgId] });
    expect(down[0].emails).toEqual([]);
    expect(down[0].failed.length).toBeGreaterThan(0);
    expect(down[0].failed.every((f) => f.retry)).toBe(true);
    const { db } = await database();
    expect(await db.select().from(reminders).where(eq(reminders.orgId, kvOrgId))).toHaveLength(0);

    const up = await run(TEST_TODAY);
    expect(up[0].failed).toEqual([]);
    expect(up[0].emails.length).toBe(down[0].failed.length);

    // A service that refuses the key (403): the day's new reminders are kept as not sent, with the reason.
    const strict = await startMailFake({ port: 0, dataDir: mkdtempSync(path.join(tmpdir(), "tidemark-reminders-strict-")), apiKey: "re_other_key" });
    try {
      const refusing = { settings: { ...mail.settings!, resendBaseUrl: strict.url } };
      const refused = await runReminders({ now: at("2026-12-07"), trigger: "test", mail: refusing, publicUrl: PUBLIC, orgIds: [kvOrgId] });
      expect(refused[0].failed.length).toBeGreaterThan(0);
      expect(refused[0].failed.every((f) => !f.retry)).toBe(true);
      const kept = await db.select().from(reminders).where(and(eq(reminders.orgId, kvOrgId), eq(reminders.threshold, "lapsed-2026-W50")));
      expect(kept.length).toBeGreaterThan(0);
      for (const r of kept) expect([r.sentAt, typeof r.failure]).toEqual([null, "string"]);
      const again = await runReminders({ now: at("2026-12-07"), trigger: "test", mail: refusing, publicUrl: PUBLIC, orgIds: [kvOrgId] });
      expect(again[0].failed).toEqual([]);
    } finally {
      await strict.close();
    }
  });
});

describe("one person's series: catch-up, the e-mail itself, weekly while lapsed, renewal", () => {
  it("follows a card valid through Sunday 20 December 2026 from 30 days before to its renewal", async () => {
    const therapist = await viewerFor(DEMO_ACCOUNTS.therapist);
    const bls = await basicLifeSupport();
    await setCard(therapist.person.id, bls.typeId, "2026-12-20");
    const plan = await getPlan(kvOrgId, therapist.person.id, therapist.org.timeZone, await statusOptionsFor(kvOrgId, therapist.org.timeZone, at(TEST_TODAY)));
    expect(plan?.some((r) => r.requirementId === bls.requirementId)).toBe(true);

    // 2 December: 30 days before (20 November) has passed, 14 days before (6 December) not yet.
    await run(TEST_TODAY);
    const [mail30] = to(DEMO_ACCOUNTS.therapist).filter((m) => m.subject.includes("Basic life support"));
    expect(mail30.subject).toBe("Reminder: Basic life support — valid through 20 Dec 2026");
    expect(mail30.text).toContain("Hello Marisol Ellingsen,");
    expect(mail30.text).toContain("valid through Sunday 20 December 2026 (in 18 days)");
    expect(mail30.text).toContain("Why now: your organisation reminds you 30 days before.");
    expect(mail30.html).toContain(`href="${PUBLIC}/credentials"`);
    expect(mail30.text).toContain(`${PUBLIC}/plan/reminders`);
    expect(mail30.text).not.toMatch(/<[a-z][^>]*>/i);
    expect(await remindersOf(therapist.person.id, bls.requirementId)).toEqual([
      { dueOn: "2026-12-20", threshold: "30d", sentAt: at(TEST_TODAY), messageId: mail30.id, channel: "email" },
    ]);

    // The job is down from 3 to 14 December: 14 days before (6 Dec) and 7 days before (13 Dec)
    // both pass; on the 15th only the latest, "7 days before", is sent.
    await run("2026-12-15");
    expect((await remindersOf(therapist.person.id, bls.requirementId)).map((r) => r.threshold)).toEqual(["30d", "7d"]);
    const bls15 = to(DEMO_ACCOUNTS.therapist).filter((m) => m.subject.includes("Basic life support"));
    expect(bls15).toHaveLength(2);
    expect(bls15[0].text).toContain("7 days before");

    await run("2026-12-20");
    await run("2026-12-21"); // lapsed from the 21st (Monday, ISO week 52)
    await run("2026-12-23"); // the same week: nothing more
    await run("2026-12-28"); // Monday of week 53 of 2026
    await run("2027-01-04"); // Monday of week 1 of 2027
    expect((await remindersOf(therapist.person.id, bls.requirementId)).map((r) => r.threshold)).toEqual([
      "30d",
      "7d",
      "on-day",
      "lapsed-2026-W52",
      "lapsed-2026-W53",
      "lapsed-2027-W01",
    ]);
    const lapsedMail = to(DEMO_ACCOUNTS.therapist).find((m) => m.subject === "Lapsed: Basic life support — valid through 20 Dec 2026");
    expect(lapsedMail?.text).toContain("weekly while lapsed");
    expect(lapsedMail?.text).toContain("Upload your renewed card");

    // Renewed through 31 December 2028: nothing for the new date until 90 days before it (2 October 2028).
    const { write } = await database();
    await write((tx) => tx.insert(credentials).values({ orgId: kvOrgId, personId: therapist.person.id, credentialTypeId: bls.typeId, issuedOn: "2027-01-05", validThrough: "2028-12-31" }));
    await run("2027-01-05");
    await run("2027-01-11");
    expect(await remindersOf(therapist.person.id, bls.requirementId)).toHaveLength(6);
    await run("2028-10-02");
    const fresh = (await remindersOf(therapist.person.id, bls.requirementId)).slice(6);
    expect(fresh.map((r) => [r.dueOn, r.threshold])).toEqual([["2028-12-31", "90d"]]);
  });

  it("someone who chose the daily digest gets one e-mail listing all of that day's reminders", async () => {
    const therapist = await viewerFor(DEMO_ACCOUNTS.therapist);
    const bls = await basicLifeSupport();
    await setCard(therapist.person.id, bls.typeId, "2026-12-20");
    await saveReminderDelivery(kvOrgId, therapist.person.id, "digest", at(TEST_TODAY));
    await run(TEST_TODAY);

    const mine = to(DEMO_ACCOUNTS.therapist);
    expect(mine).toHaveLength(1);
    expect(mine[0].subject).toMatch(/^Your Tidemark reminders for Wednesday 2 December 2026: \d+ reminders?/);
    expect(mine[0].text).toContain("Basic life support");
    expect(mine[0].text).toContain("valid through Sunday 20 December 2026 (in 18 days)");
    const { db } = await database();
    const rows = await db.select().from(reminders).where(eq(reminders.personId, therapist.person.id));
    expect(rows.length).toBeGreaterThanOrEqual(1);
    for (const r of rows) expect([r.channel, r.messageId]).toEqual(["digest", mine[0].id]);
  });
});

describe("the managers' weekly digest", () => {
  it("lists a person with a lapsed card on the manager's units, once per ISO week", async () => {
    const therapist = await viewerFor(DEMO_ACCOUNTS.therapist);
    const bls = await basicLifeSupport();
    await setCard(therapist.person.id, bls.typeId, "2026-11-15");
    await run(TEST_TODAY);
    const digests = to(DEMO_ACCOUNTS.manager).filter((m) => m.subject.startsWith("Weekly digest 2026-W49"));
    expect(digests).toHaveLength(1);
    expect(digests[0].text).toContain("Marisol Ellingsen");
    expect(digests[0].text).toContain("Lapsed: Basic life support — valid through 15 Nov 2026");
    expect(digests[0].html).toContain(`href="${PUBLIC}/team/matrix"`);

    await run("2026-12-04"); // Friday of the same week
    expect(to(DEMO_ACCOUNTS.manager).filter((m) => m.subject.startsWith("Weekly digest"))).toHaveLength(1);
    await run("2026-12-07"); // Monday of week 50
    expect(to(DEMO_ACCOUNTS.manager).filter((m) => m.subject.startsWith("Weekly digest 2026-W50"))).toHaveLength(1);
  });
});

type AdminAction = ArgsOf<typeof adminReminders.action>;
type PlanAction = ArgsOf<typeof planReminders.action>;
const good = { daysBefore: "60, 21", onTheDay: "on", boardMonthsBefore: "", managerDigest: "on" };

describe("Admin → Reminders: the policy form", () => {
  it.each([
    [{ daysBefore: "90, sixty" }, "daysBefore", "“sixty” is not a whole number of days. Separate numbers with commas."],
    [{ daysBefore: "30, 0" }, "daysBefore", "Use “On the day” for the day itself; days before start at 1."],
    [{ daysBefore: "400" }, "daysBefore", "400 is outside 1–365 days."],
    [{ daysBefore: "30, 30" }, "daysBefore", "30 is listed twice."],
    [{ daysBefore: "" }, "daysBefore", "Enter at least one number of days before, for example 30."],
    [{ boardMonthsBefore: "36" }, "boardMonthsBefore", "36 is outside 1–24 months."],
  ])("refuses %j with a message on %s", async (change, field, message) => {
    const admin = await viewerFor(DEMO_ACCOUNTS.admin);
    const before = await getReminderPolicy(admin.org.id);
    const answer = await outcome(adminReminders.action(args<AdminAction>(postForm("/admin/reminders", { ...good, ...change }), admin)));
    expect(answer.status).toBe(400);
    expect(fieldErrors(answer.body, field)).toEqual([message]);
    expect(await getReminderPolicy(admin.org.id)).toEqual(before);
  });

  it("saves a good policy, audited, and the status engine's Due-soon window follows it", async () => {
    const admin = await viewerFor(DEMO_ACCOUNTS.admin);
    const answer = await outcome(adminReminders.action(args<AdminAction>(postForm("/admin/reminders", good), admin)));
    expect(answer.status).toBe(302);
    expect(answer.location).toBe("/admin/reminders");
    expect(await getReminderPolicy(admin.org.id)).toEqual({ daysBefore: [60, 21], onTheDay: true, weeklyWhileLapsed: false, boardMonthsBefore: [], managerDigest: true });
    const { db } = await database();
    const [org] = await db.select({ settings: organisations.settings }).from(organisations).where(eq(organisations.id, admin.org.id));
    expect(org.settings.reminderDays).toEqual([60, 21, 0]);
    expect(org.settings.contactEmail).toBeTruthy(); // the rest of the settings kept
    expect((await statusOptionsFor(admin.org.id, admin.org.timeZone, at(TEST_TODAY))).reminderDays).toBe(60);
    const events = await db.select().from(auditEvents).where(and(eq(auditEvents.orgId, admin.org.id), eq(auditEvents.action, "reminder-policy.updated")));
    expect(events).toHaveLength(1);
    expect(events[0].actorId).toBe(admin.person.id);

    const page = (await adminReminders.loader(args<ArgsOf<typeof adminReminders.loader>>(new Request("http://localhost:3000/admin/reminders"), admin))) as Awaited<ReturnType<typeof adminReminders.loader>>;
    expect(page.policy.daysBefore).toEqual([60, 21]);
  });

  it("checks the role on the server: a manager or therapist posting the form gets 403 and nothing changes", async () => {
    for (const email of [DEMO_ACCOUNTS.manager, DEMO_ACCOUNTS.therapist]) {
      const viewer = await viewerFor(email);
      const before = await getReminderPolicy(viewer.org.id);
      const answer = await outcome(adminReminders.action(args<AdminAction>(postForm("/admin/reminders", good), viewer)));
      expect(answer.status).toBe(403);
      expect(await getReminderPolicy(viewer.org.id)).toEqual(before);
    }
  });

  it("another organisation's admin changes only their own policy", async () => {
    const kestrel = await getReminderPolicy(kvOrgId);
    const alder = await viewerFor("admin@alderbay.test");
    const answer = await outcome(adminReminders.action(args<AdminAction>(postForm("/admin/reminders", { ...good, daysBefore: "45" }), alder)));
    expect(answer.status).toBe(302);
    expect((await getReminderPolicy(alder.org.id))?.daysBefore).toEqual([45]);
    expect(await getReminderPolicy(kvOrgId)).toEqual(kestrel);
  });

  it("shows the job's last runs and recent reminders", async () => {
    await run(TEST_TODAY);
    const admin = await viewerFor(DEMO_ACCOUNTS.admin);
    const page = (await adminReminders.loader(args<ArgsOf<typeof adminReminders.loader>>(new Request("http://localhost:3000/admin/reminders"), admin))) as Awaited<ReturnType<typeof adminReminders.loader>>;
    expect(page.runs).toHaveLength(1);
    expect(page.runs[0]).toMatchObject({ ranOn: TEST_TODAY, trigger: "test", failed: 0 });
    expect(page.runs[0].sent).toBeGreaterThan(0);
    expect(page.recent.length).toBeGreaterThan(0);
    expect(page.digests.map((d) => d.week)).toEqual(["2026-W49"]);
  });
});

describe("My plan → Reminders: the person's choice", () => {
  it("saves the choice for the signed-in person only, and refuses anything else with a message", async () => {
    const therapist = await viewerFor(DEMO_ACCOUNTS.therapist);
    const bad = await outcome(planReminders.action(args<PlanAction>(postForm("/plan/reminders", { delivery: "weekly" }), therapist)));
    expect(bad.status).toBe(400);
    expect(fieldErrors(bad.body, "delivery")).toEqual(["Choose separate e-mails or one daily digest."]);
    const ok = await outcome(planReminders.action(args<PlanAction>(postForm("/plan/reminders", { delivery: "digest" }), therapist)));
    expect(ok.status).toBe(302);
    const page = (await planReminders.loader(args<ArgsOf<typeof planReminders.loader>>(new Request("http://localhost:3000/plan/reminders"), therapist))) as Awaited<ReturnType<typeof planReminders.loader>>;
    expect(page.delivery).toBe("digest");
    const preceptor = await viewerFor(DEMO_ACCOUNTS.preceptor);
    const other = (await planReminders.loader(args<ArgsOf<typeof planReminders.loader>>(new Request("http://localhost:3000/plan/reminders"), preceptor))) as Awaited<ReturnType<typeof planReminders.loader>>;
    expect(other.delivery).toBe("each");
  });

  it("is refused to a role without a plan (admin)", async () => {
    const admin = await viewerFor(DEMO_ACCOUNTS.admin);
    const answer = await outcome(planReminders.action(args<PlanAction>(postForm("/plan/reminders", { delivery: "digest" }), admin)));
    expect(answer.status).toBe(403);
  });
});
