import { spawnSync } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { recordAudit, verifyAuditChain } from "~/db/audit.server";
import { openDatabase } from "~/db/client.server";

async function chainOf(n: number) {
  const file = path.join(mkdtempSync(path.join(tmpdir(), "tidemark-audit-")), "a.db");
  const db = await openDatabase(`file:${file}`);
  for (let i = 0; i < n; i++) {
    await db.write((tx) => recordAudit(tx, { orgId: "org", actorId: "p1", action: "person.updated", entityType: "person", entityId: `p${i}`, detail: { i } }));
  }
  return { db, file };
}

describe("audit chain", () => {
  it("a chain written through the app verifies whole", async () => {
    const { db } = await chainOf(5);
    expect(await verifyAuditChain(db.db)).toEqual({ whole: true, count: 5 });
    db.close();
  });

  it("finds a changed event: the first one whose content no longer matches its hash", async () => {
    const { db } = await chainOf(5);
    await db.client.execute("UPDATE audit_events SET detail = '{\"i\":99}' WHERE seq = 3");
    const verdict = await verifyAuditChain(db.db);
    expect(verdict.whole).toBe(false);
    if (!verdict.whole) {
      expect(verdict.brokenAt.seq).toBe(3);
      expect(verdict.reason).toMatch(/changed/);
    }
    db.close();
  });

  it("finds a removed event by the broken link after it", async () => {
    const { db } = await chainOf(5);
    await db.client.execute("DELETE FROM audit_events WHERE seq = 2");
    const verdict = await verifyAuditChain(db.db);
    expect(verdict.whole).toBe(false);
    if (!verdict.whole) expect(verdict.brokenAt.seq).toBe(3);
    db.close();
  });

  it("`npm run audit:verify` exits 0 when whole and 1 naming the event when broken", async () => {
    const { db, file } = await chainOf(3);
    const run = () =>
      spawnSync(path.resolve("node_modules/.bin/tsx"), ["scripts/audit-verify.ts"], { env: { ...process.env, DATABASE_URL: `file:${file}` }, encoding: "utf8" });
    const ok = run();
    expect(ok.status).toBe(0);
    expect(ok.stdout).toMatch(/whole: 3 events/);
    await db.client.execute("UPDATE audit_events SET action = 'role.granted' WHERE seq = 2");
    const broken = run();
    expect(broken.status).toBe(1);
    expect(broken.stderr).toMatch(/broken at event #2/);
    db.close();
  });
});
