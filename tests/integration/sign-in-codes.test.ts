import { beforeAll, describe, expect, it } from "vitest";
import { checkCode, MAX_CODE_TRIES, recordIssuedCode } from "~/auth/sign-in-codes.server";
import type { Database } from "~/db/client.server";
import { organisations, people, signInCodes } from "~/db/schema";
import { useEmptyDatabase } from "../setup/db";

let db: Database;
let personId: string;
beforeAll(async () => {
  db = await useEmptyDatabase();
  await db.write(async (tx) => {
    const [org] = await tx.insert(organisations).values({ name: "Test Org", slug: "test-org" }).returning();
    const [p] = await tx.insert(people).values({ orgId: org.id, email: "pat@test.test", name: "Pat Test" }).returning();
    personId = p.id;
  });
});

const t0 = new Date("2026-12-02T15:00:00Z");
const issue = (code = "123456", now = t0) => recordIssuedCode({ email: "Pat@Test.test ", code, personId, clientKey: "c", now });

describe("one-time sign-in codes, checked on the server (OWASP ASVS 4.0.3 V2.7)", () => {
  it("stores only a hash of the code", async () => {
    const rec = await issue("654321");
    expect(rec.codeHash).not.toContain("654321");
    expect(rec.email).toBe("pat@test.test");
  });

  it("accepts the right code once, then refuses it as used", async () => {
    const rec = await issue();
    expect((await checkCode(rec.id, "123456", t0)).ok).toBe(true);
    const again = await checkCode(rec.id, "123456", t0);
    expect(again).toMatchObject({ ok: false, reason: "used" });
  });

  it("refuses a code after its lifetime (10 minutes by default)", async () => {
    const rec = await issue();
    const later = new Date(t0.getTime() + 10 * 60_000 + 1);
    expect(await checkCode(rec.id, "123456", later)).toMatchObject({ ok: false, reason: "expired" });
  });

  it(`allows ${MAX_CODE_TRIES} wrong tries, then refuses even the right code`, async () => {
    const rec = await issue();
    expect(await checkCode(rec.id, "000000", t0)).toMatchObject({ ok: false, reason: "wrong", triesLeft: 2 });
    expect(await checkCode(rec.id, "000001", t0)).toMatchObject({ ok: false, reason: "wrong", triesLeft: 1 });
    expect(await checkCode(rec.id, "000002", t0)).toMatchObject({ ok: false, reason: "too-many-tries" });
    expect(await checkCode(rec.id, "123456", t0)).toMatchObject({ ok: false, reason: "too-many-tries" });
  });

  it("a newer code replaces the older one", async () => {
    const first = await issue("111111");
    await issue("222222");
    expect(await checkCode(first.id, "111111", t0)).toMatchObject({ ok: false, reason: "used" });
  });

  it("a code issued for an unknown address never signs anyone in", async () => {
    const rec = await recordIssuedCode({ email: "nobody@test.test", code: "333333", personId: null, clientKey: "c", now: t0 });
    expect(await checkCode(rec.id, "333333", t0)).toMatchObject({ ok: false, reason: "wrong" });
  });

  it("without a record (another browser) there is nothing to check against", async () => {
    expect(await checkCode(null, "123456", t0)).toMatchObject({ ok: false, reason: "missing" });
    const rows = await db.db.select().from(signInCodes);
    expect(rows.length).toBeGreaterThan(0);
  });
});
