import { and, asc, eq, ne } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { cachedRead, MAX_AGE_MS } from "~/db/read-cache.server";
import { exams, people, personRoles } from "~/db/schema";
import { finishAttempt, saveAnswer, saveView, startAttempt } from "~/db/queries/exam-attempts.server";
import { countForUnits, getProfile, statusOptionsFor } from "~/db/queries/people.server";
import { loadMatrix, matrixScopeFor } from "~/db/queries/team-matrix.server";
import { useSeededDatabase } from "../setup/db";
import { viewerFor } from "../setup/request";

let db: Database;
beforeAll(async () => {
  db = await useSeededDatabase();
});

describe("read cache for organisation-wide counts", () => {
  it("serves a repeat read from memory, and recomputes after any write through the queue", async () => {
    let computed = 0;
    const read = () => cachedRead(db, "k", async () => ++computed, 1_000);
    expect(await read()).toBe(1);
    expect(await read()).toBe(1);
    await db.write(async () => undefined);
    expect(await read()).toBe(2);
  });

  it("keeps a cached read through a quiet write (an exam answer saved), and recomputes after a loud one", async () => {
    let computed = 0;
    const read = () => cachedRead(db, "quiet", async () => ++computed, 1_000);
    expect(await read()).toBe(1);
    const [loudBefore, quietBefore] = [db.generation(), db.quietWrites()];
    await db.write(async () => undefined, { quiet: true });
    await db.write(async () => undefined, { quiet: true });
    expect([db.generation(), db.quietWrites()]).toEqual([loudBefore, quietBefore + 2]);
    expect(await read()).toBe(1);
    await db.write(async () => undefined);
    expect([db.generation(), db.quietWrites()]).toEqual([loudBefore + 1, quietBefore + 2]);
    expect(await read()).toBe(2);
    // A quiet write that fails is still only quiet: the cache stays.
    await expect(db.write(async () => Promise.reject(new Error("refused")), { quiet: true })).rejects.toThrow("refused");
    expect(await read()).toBe(2);
  });

  it("the Team matrix stays assessed while an examinee answers, flags and moves, and is assessed again when the attempt closes", async () => {
    const manager = await viewerFor("manager@kestrelvalley.test");
    const educator = await viewerFor("educator@kestrelvalley.test");
    const [examinee] = await db.db
      .select({ email: people.email })
      .from(people)
      .innerJoin(personRoles, eq(personRoles.personId, people.id))
      .where(and(eq(personRoles.role, "therapist"), eq(people.orgId, manager.org.id), eq(people.active, true), ne(people.email, "therapist@kestrelvalley.test")))
      .orderBy(asc(people.email))
      .limit(1);
    const therapist = await viewerFor(examinee.email);
    const who = { orgId: therapist.org.id, personId: therapist.person.id, timeZone: therapist.org.timeZone };
    const [exam] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, educator.org.id), eq(exams.title, "Annual ventilation modes exam")));
    const now = new Date();
    const started = await startAttempt(who, exam.id, "one", now, 12345);
    if (!started.ok) throw new Error(`could not start an attempt: ${JSON.stringify(started)}`);
    const attemptId = started.attemptId;

    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const scope = await matrixScopeFor(manager.org.id, manager.person.id, manager.roles);
    const load = () => loadMatrix(manager.org.id, scope, manager.org.timeZone, options);
    const first = await load();
    const loud = db.generation();
    expect(await saveAnswer(who, attemptId, 0, { flagged: true }, new Date(now.getTime() + 1000))).toMatchObject({ ok: true });
    expect(await saveAnswer(who, attemptId, 0, { answer: null }, new Date(now.getTime() + 2000))).toMatchObject({ ok: true });
    expect(await saveView(who, attemptId, { position: 1, layout: "all" })).toBe(true);
    expect(db.generation()).toBe(loud);
    expect(await load()).toBe(first);

    // Closing grades the attempt (a pass would complete a requirement): loud, so the matrix is assessed again.
    expect(await finishAttempt(who.orgId, attemptId, "submitted", new Date(now.getTime() + 3000))).not.toBeNull();
    expect(db.generation()).toBeGreaterThan(loud);
    const again = await load();
    expect(again).not.toBe(first);
    expect(again.people.map((p) => p.id)).toEqual(first.people.map((p) => p.id));
  });

  it("recomputes after its maximum age, for writes made by another process", async () => {
    let computed = 0;
    const at = (t: number) => cachedRead(db, "age", async () => ++computed, t);
    expect(await at(0)).toBe(1);
    expect(await at(MAX_AGE_MS - 1)).toBe(1);
    expect(await at(MAX_AGE_MS)).toBe(2);
  });

  it("a manager's counts move as soon as a person on their units is deactivated", async () => {
    const manager = await viewerFor("manager@kestrelvalley.test");
    const therapist = await viewerFor("therapist@kestrelvalley.test");
    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const profile = (await getProfile(manager.org.id, manager.person.id))!;
    const before = await countForUnits(manager.org.id, profile.managedUnits, options);
    await db.write((tx) => tx.update(people).set({ active: false }).where(eq(people.id, therapist.person.id)));
    const after = await countForUnits(manager.org.id, profile.managedUnits, options);
    expect(after.people).toBe(before.people - 1);
    await db.write((tx) => tx.update(people).set({ active: true }).where(eq(people.id, therapist.person.id)));
    expect((await countForUnits(manager.org.id, profile.managedUnits, options)).people).toBe(before.people);
  });
});
