/**
 * Check-off signatures against a seeded copy of the demo database. Design reference: US 21 CFR
 * Part 11 — §11.50 (printed name, date and time, meaning), §11.70 (a signature is linked to its
 * record so it cannot be copied or moved), §11.200(a) (two distinct identification components),
 * §11.300(d) (attempts at unauthorised use limited). Acceptance of issue 7.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import type { Database } from "~/db/client.server";
import { acknowledgeCheckoff, addAddendum, checkoffContentHash, signaturesHold, signCheckoff } from "~/db/queries/checkoffs-signing.server";
import { getCheckoffRecord } from "~/db/queries/checkoffs.server";
import { markStep, setOutcome } from "~/db/queries/checkoffs-write.server";
import { auditEvents, checkoffs, people, signatures } from "~/db/schema";
import * as checkoffPage from "~/routes/checkoffs/checkoff";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";
import { givePin, observedCompetent, PINS, requested, signedCheckoff } from "./checkoffs-harness";

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;
let educator: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  educator = await viewerFor("educator@kestrelvalley.test");
  await givePin(therapist, PINS.therapist);
  await givePin(preceptor, PINS.preceptor);
  await givePin(educator, PINS.educator);
});

describe("who may sign", () => {
  it("a therapist cannot sign their own check-off, even holding a PIN, through the page's action", async () => {
    const { id, steps } = await requested(therapist);
    await observedCompetent(preceptor, id, steps);
    const answer = await outcome(checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(postForm(`/checkoffs/${id}`, { intent: "sign", pin: PINS.therapist }), therapist, { checkoffId: id })));
    expect(answer.status).toBe(403);
    expect(JSON.stringify(answer.body)).toContain("A person cannot sign their own check-off.");
    // Typing someone else's e-mail on one's own check-off does not help: the signer is the typed person.
    const own = await signCheckoff(preceptor, id, { email: "therapist@kestrelvalley.test", pin: PINS.therapist });
    expect(own).toMatchObject({ ok: false, status: 403 });
    const [row] = await db.db.select().from(checkoffs).where(eq(checkoffs.id, id));
    expect(row.status).toBe("in-progress");
    expect(await db.db.select().from(signatures).where(eq(signatures.recordId, id))).toEqual([]);
  });

  it("a preceptor of another organisation cannot open it (404, as if it did not exist)", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const alderBay = await viewerFor("admin@alderbay.test");
    // An Alder Bay person holding the preceptor role: same permissions, other organisation.
    const foreignPreceptor: Viewer = { ...alderBay, roles: ["therapist", "preceptor"] };
    for (const run of [
      () => checkoffPage.loader(args<ArgsOf<typeof checkoffPage.loader>>(getRequest(`/checkoffs/${id}`), foreignPreceptor, { checkoffId: id })),
      () => checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(postForm(`/checkoffs/${id}`, { intent: "mark-step", stepIndex: "0", result: "not-met" }), foreignPreceptor, { checkoffId: id })),
    ]) {
      expect((await outcome(run())).status).toBe(404);
    }
  });
});

describe("signing, acknowledgement and addenda", () => {
  it("a signature shows name, credentials, time zone and meaning, and is bound to the record's content hash", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const record = (await getCheckoffRecord(preceptor.org.id, id))!;
    expect(record.checkoff.status).toBe("signed");
    const [sig] = record.signatures;
    const [me] = await db.db.select().from(people).where(eq(people.id, preceptor.person.id));
    expect(sig).toMatchObject({ signerId: preceptor.person.id, printedName: me.name, credentialLetters: me.credentialLetters, meaning: "Observed and judged competent", timeZone: preceptor.org.timeZone, method: "own-session" });
    expect(sig.contentHash).toBe(checkoffContentHash(record));
    expect(record.checkoff.contentHash).toBe(sig.contentHash);
    // Signing is audited in the same transaction, and the chain stays whole.
    const events = await db.db.select().from(auditEvents).where(and(eq(auditEvents.entityType, "checkoff"), eq(auditEvents.entityId, id), eq(auditEvents.action, "checkoff.signed")));
    expect(events).toHaveLength(1);
    expect(JSON.parse(events[0].detail)).toMatchObject({ signatureId: sig.id, contentHash: sig.contentHash });
    expect((await verifyAuditChain(db.db)).whole).toBe(true);
  });

  it("the therapist acknowledges on the preceptor's tablet with their e-mail and PIN; then it cannot be edited", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    expect(await acknowledgeCheckoff(preceptor, id, { email: "preceptor@kestrelvalley.test", pin: PINS.preceptor })).toMatchObject({ ok: false, status: 403 });
    expect(await acknowledgeCheckoff(preceptor, id, { email: "THERAPIST@kestrelvalley.test", pin: PINS.therapist })).toEqual({ ok: true, value: undefined });
    const record = (await getCheckoffRecord(therapist.org.id, id))!;
    expect(record.checkoff.status).toBe("acknowledged");
    expect(record.signatures.map((s) => [s.signerId, s.meaning, s.method])).toEqual([
      [preceptor.person.id, "Observed and judged competent", "own-session"],
      [therapist.person.id, "Acknowledged by the therapist observed", "shared-device"],
    ]);
    expect(signaturesHold(record).every((h) => h.holds)).toBe(true);
    // Editing afterwards: refused by the app...
    expect(await markStep(preceptor, id, { stepIndex: 0, result: "not-met", comment: "changed" })).toMatchObject({ ok: false, status: 409 });
    expect(await setOutcome(preceptor, id, { outcome: "needs-practice", practicePlan: "x", practiceBy: "2027-01-01" })).toMatchObject({ ok: false });
    // ...and a correction is a signed addendum beside it.
    expect(await addAddendum(therapist, id, "I did it", { email: null, pin: PINS.therapist })).toMatchObject({ ok: false, status: 403 });
    expect(await addAddendum(preceptor, id, "Step 2 was observed on the second ventilator, not the first.", { email: null, pin: PINS.preceptor })).toMatchObject({ ok: true });
    const after = (await getCheckoffRecord(therapist.org.id, id))!;
    expect(after.addenda).toHaveLength(1);
    expect(after.addenda[0].signature).toMatchObject({ meaning: "Author of this addendum", recordType: "addendum" });
    expect(signaturesHold(after).every((h) => h.holds)).toBe(true);
    expect(after.marks).toEqual(record.marks);
  });

  it("needs practice requires a plan and schedules a repeat check-off; a critical step not met cannot be competent", async () => {
    const { id, steps } = await requested(therapist);
    const record = (await getCheckoffRecord(therapist.org.id, id))!;
    const critical = record.checklist.steps.findIndex((s) => s.critical);
    for (let i = 0; i < steps; i++) await markStep(preceptor, id, { stepIndex: i, result: i === critical ? "not-met" : "met", comment: i === critical ? "Missed it" : null });
    expect(await setOutcome(preceptor, id, { outcome: "competent", practicePlan: null, practiceBy: null })).toMatchObject({ ok: false, status: 400 });
    const form = await outcome(checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(postForm(`/checkoffs/${id}`, { intent: "set-outcome", outcome: "needs-practice" }), preceptor, { checkoffId: id })));
    expect(form.status).toBe(400);
    expect(JSON.stringify(form.body)).toContain("Needs practice requires a plan");
    expect(await setOutcome(preceptor, id, { outcome: "needs-practice", practicePlan: "Practise the pre-use check twice with a test lung.", practiceBy: "2026-12-20" })).toMatchObject({ ok: true });
    const signed = await signCheckoff(preceptor, id, { email: null, pin: PINS.preceptor });
    expect(signed.ok).toBe(true);
    const repeatId = signed.ok ? signed.value.repeatId : null;
    const [repeat] = await db.db.select().from(checkoffs).where(eq(checkoffs.id, repeatId!));
    expect(repeat).toMatchObject({ personId: therapist.person.id, status: "requested", checklistVersionId: record.checklist.versionId, practiceBy: "2026-12-20" });
    const [sig] = (await getCheckoffRecord(therapist.org.id, id))!.signatures;
    expect(sig.meaning).toBe("Observed; needs practice");
  });

  it("a signature's content hash no longer matches when its record is altered behind the app (§11.70)", async () => {
    const id = await signedCheckoff(therapist, preceptor);
    const record = (await getCheckoffRecord(therapist.org.id, id))!;
    expect(signaturesHold(record).every((h) => h.holds)).toBe(true);
    // Someone with the database file drops the protection and changes a comment.
    await db.client.execute("DROP TRIGGER checkoff_steps_signed_no_update");
    await db.client.execute({ sql: "UPDATE checkoff_step_results SET comment = 'One identifier only' WHERE checkoff_id = ? AND step_index = 0", args: [id] });
    const altered = (await getCheckoffRecord(therapist.org.id, id))!;
    expect(signaturesHold(altered)).toEqual([{ signatureId: record.signatures[0].id, holds: false }]);
    // The same signature copied onto another record does not match that record either.
    const other = await signedCheckoff(therapist, preceptor);
    const otherRecord = (await getCheckoffRecord(therapist.org.id, other))!;
    expect(record.signatures[0].contentHash).not.toBe(checkoffContentHash(otherRecord));
    const { immutabilityMigrationSql, IMMUTABILITY_TRIGGERS } = await import("~/db/immutability");
    await db.client.execute(IMMUTABILITY_TRIGGERS.find((t) => t.name === "checkoff_steps_signed_no_update")!.sql);
    expect(immutabilityMigrationSql()).toContain("checkoff_steps_signed_no_update");
  });
});
