/**
 * What protects a signed check-off: the signing PIN's limit on wrong tries (21 CFR Part 11
 * §11.300(d); OWASP ASVS 4.0.3 V2.2.1), database triggers that refuse to change signed rows,
 * and the hash-chained audit log that `npm run audit:verify` walks. Acceptance of issue 7.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";
import { and, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { MAX_PIN_FAILURES } from "~/auth/signing-pin.server";
import type { Database } from "~/db/client.server";
import { acknowledgeCheckoff, signCheckoff } from "~/db/queries/checkoffs-signing.server";
import { IMMUTABILITY_TRIGGERS, immutabilityMigrationSql } from "~/db/immutability";
import { auditEvents, checkoffs, people, signatures } from "~/db/schema";
import { readFileSync } from "node:fs";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { viewerFor } from "../setup/request";
import { givePin, observedCompetent, PINS, requested, signedCheckoff } from "./checkoffs-harness";

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  await givePin(therapist, PINS.therapist);
  await givePin(preceptor, PINS.preceptor);
});

describe("wrong signing PINs", () => {
  it(`${MAX_PIN_FAILURES} wrong PINs lock signing for a while — even the right PIN — and each try is audited`, async () => {
    const { id, steps } = await requested(therapist);
    await observedCompetent(preceptor, id, steps);
    const t0 = new Date();
    const at = (minutes: number) => new Date(t0.getTime() + minutes * 60_000);
    for (let i = 1; i <= MAX_PIN_FAILURES; i++) {
      const wrong = await signCheckoff(preceptor, id, { email: null, pin: "000001" }, at(0));
      expect(wrong.ok).toBe(false);
      if (!wrong.ok) expect(wrong.message).toMatch(i < MAX_PIN_FAILURES ? /tr(y|ies) left/ : /locked/);
    }
    const [me] = await db.db.select({ failures: people.signingPinFailures }).from(people).where(eq(people.id, preceptor.person.id));
    expect(me.failures).toBe(MAX_PIN_FAILURES);
    const locked = await signCheckoff(preceptor, id, { email: null, pin: PINS.preceptor }, at(1));
    expect(locked).toMatchObject({ ok: false, status: 409, message: expect.stringMatching(/locked/) });
    const wrongs = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "signing-pin.wrong"), eq(auditEvents.entityId, preceptor.person.id)));
    expect(wrongs).toHaveLength(MAX_PIN_FAILURES);
    expect((await db.db.select().from(checkoffs).where(eq(checkoffs.id, id)))[0].status).toBe("in-progress");
    // After the lock (15 minutes) the right PIN signs and the count starts again.
    const later = await signCheckoff(preceptor, id, { email: null, pin: PINS.preceptor }, at(16));
    expect(later.ok).toBe(true);
    const [after] = await db.db.select({ failures: people.signingPinFailures }).from(people).where(eq(people.id, preceptor.person.id));
    expect(after.failures).toBe(0);
  });

  it("on a shared tablet the lock belongs to the person whose e-mail was typed", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    for (let i = 0; i < MAX_PIN_FAILURES; i++) await acknowledgeCheckoff(preceptor, id, { email: "therapist@kestrelvalley.test", pin: "000002" });
    const [t] = await db.db.select({ failures: people.signingPinFailures }).from(people).where(eq(people.id, therapist.person.id));
    expect(t.failures).toBe(MAX_PIN_FAILURES);
    expect(await acknowledgeCheckoff(therapist, id, { email: null, pin: PINS.therapist })).toMatchObject({ ok: false, status: 409 });
  });
});

describe("signed rows are refused change by the database itself", () => {
  const refused = /signed record cannot be changed|signature cannot be (changed|removed)/;

  it("UPDATE and DELETE of a signature, a signed check-off and its step results are aborted", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const [sig] = await db.db.select().from(signatures).where(eq(signatures.recordId, id));
    const attempts = [
      { sql: "UPDATE signatures SET meaning = 'Observed; needs practice' WHERE id = ?", args: [sig.id] },
      { sql: "DELETE FROM signatures WHERE id = ?", args: [sig.id] },
      { sql: "UPDATE checkoffs SET outcome = 'needs-practice' WHERE id = ?", args: [id] },
      { sql: "UPDATE checkoffs SET status = 'in-progress' WHERE id = ?", args: [id] },
      { sql: "DELETE FROM checkoffs WHERE id = ?", args: [id] },
      { sql: "UPDATE checkoff_step_results SET result = 'not-met' WHERE checkoff_id = ?", args: [id] },
      { sql: "DELETE FROM checkoff_step_results WHERE checkoff_id = ?", args: [id] },
      { sql: "INSERT INTO checkoff_step_results (id, org_id, checkoff_id, step_index, result, updated_at) VALUES ('x', ?, ?, 99, 'met', 0)", args: [therapist.org.id, id] },
    ];
    for (const attempt of attempts) {
      await expect(db.client.execute(attempt), attempt.sql).rejects.toThrow(refused);
    }
    const [row] = await db.db.select().from(checkoffs).where(eq(checkoffs.id, id));
    expect(row).toMatchObject({ status: "signed", outcome: "competent" });
  });

  it("the one change a signed check-off takes is its acknowledgement, and after it nothing", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    // Acknowledging while also changing the outcome is refused...
    await expect(db.client.execute({ sql: "UPDATE checkoffs SET status = 'acknowledged', acknowledged_at = 1, outcome = 'needs-practice' WHERE id = ?", args: [id] })).rejects.toThrow(refused);
    // ...the acknowledgement alone goes through the app (after the therapist's lock above has run out).
    const afterLock = new Date(Date.now() + 16 * 60_000);
    expect(await acknowledgeCheckoff(therapist, id, { email: null, pin: PINS.therapist }, afterLock)).toEqual({ ok: true, value: undefined });
    await expect(db.client.execute({ sql: "UPDATE checkoffs SET acknowledged_at = 2 WHERE id = ?", args: [id] })).rejects.toThrow(refused);
  });

  it("the migration holds exactly the triggers app/db/immutability.ts describes", async () => {
    const file = readFileSync(path.resolve("drizzle/0002_signed-rows-immutable.sql"), "utf8");
    expect(file).toContain(immutabilityMigrationSql());
    const rows = await db.client.execute("SELECT name, sql FROM sqlite_master WHERE type = 'trigger' ORDER BY name");
    const installed = new Map(rows.rows.map((r) => [String(r.name), String(r.sql)]));
    for (const t of IMMUTABILITY_TRIGGERS) expect(installed.get(t.name)).toBe(t.sql);
  });
});

describe("the audit chain", () => {
  it("`npm run audit:verify` names the sign-off event changed behind the app's back", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const file = String((await db.client.execute("PRAGMA database_list")).rows[0].file);
    const run = () => spawnSync(path.resolve("node_modules/.bin/tsx"), ["scripts/audit-verify.ts"], { env: { ...process.env, DATABASE_URL: `file:${file}` }, encoding: "utf8" });
    const whole = run();
    expect(whole.status, whole.stderr).toBe(0);
    const [event] = await db.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.action, "checkoff.signed"), eq(auditEvents.entityId, id)))
      .orderBy(desc(auditEvents.seq))
      .limit(1);
    // Someone rewrites the signed outcome in the log itself.
    await db.client.execute({ sql: "UPDATE audit_events SET detail = replace(detail, 'competent', 'needs-practice') WHERE seq = ?", args: [event.seq] });
    const broken = run();
    expect(broken.status).toBe(1);
    expect(broken.stderr).toContain(`broken at event #${event.seq} (checkoff.signed on checkoff ${id}`);
  });
});

describe("re-seeding the demo", () => {
  // Runs last in this file: it wipes and rebuilds both demo organisations.
  it("still works once check-offs are signed, and leaves the protection in place", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const { seed } = await import("../../seeds/seed");
    await seed(db, { today: TEST_TODAY });
    expect(await db.db.select().from(checkoffs).where(eq(checkoffs.id, id))).toEqual([]);
    const rows = await db.client.execute("SELECT count(*) AS n FROM sqlite_master WHERE type = 'trigger'");
    expect(Number(rows.rows[0].n)).toBeGreaterThanOrEqual(IMMUTABILITY_TRIGGERS.length);
    // The seed's own signed orientation check-offs are back, and protected like any other.
    const seededSignatures = Number((await db.client.execute("SELECT count(*) AS n FROM signatures")).rows[0].n);
    expect(seededSignatures).toBeGreaterThan(0);
    await expect(db.client.execute("DELETE FROM signatures")).rejects.toThrow(/signature cannot be removed/);
    const again = await viewerFor("therapist@kestrelvalley.test");
    const p = await viewerFor("preceptor@kestrelvalley.test");
    await givePin(again, PINS.therapist);
    await givePin(p, PINS.preceptor);
    const fresh = await signedCheckoff(again, p);
    await expect(db.client.execute({ sql: "DELETE FROM signatures WHERE record_id = ?", args: [fresh] })).rejects.toThrow(/signature cannot be removed/);
  });
});
