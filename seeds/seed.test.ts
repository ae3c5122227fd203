import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { addDays, format, parseISO } from "date-fns";
import { afterAll, describe, expect, it } from "vitest";
import { verifyAuditChain } from "../app/db/audit.server";
import { openDatabase, type Database } from "../app/db/client.server";
import { seed } from "./seed";

const TODAY = "2026-05-14";
const dir = mkdtempSync(path.join(tmpdir(), "tidemark-seed-"));
const opened: Database[] = [];

afterAll(() => {
  for (const d of opened) d.close();
  rmSync(dir, { recursive: true, force: true });
});

async function freshDatabase(name: string): Promise<Database> {
  const d = await openDatabase(`file:${path.join(dir, `${name}.db`)}`);
  opened.push(d);
  return d;
}

type Row = Record<string, unknown>;
async function rows(d: Database, sql: string, args: (string | number)[] = []): Promise<Row[]> {
  const result = await d.client.execute({ sql, args });
  return result.rows.map((r) => ({ ...r }));
}

/** Every table, every row, every column, in a fixed order. */
async function dump(d: Database): Promise<Record<string, Row[]>> {
  const tables = await rows(d, "SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name");
  const out: Record<string, Row[]> = {};
  for (const { name } of tables) {
    const columns = await rows(d, `PRAGMA table_info("${String(name)}")`);
    const order = columns.map((_, i) => i + 1).join(", ");
    out[String(name)] = await rows(d, `SELECT * FROM "${String(name)}" ORDER BY ${order}`);
  }
  return out;
}

const orgId = async (d: Database, slug: string) => String((await rows(d, "SELECT id FROM organisations WHERE slug = ?", [slug]))[0]?.id);

describe("demo scenario seed", () => {
  it("leaves the same database when run twice, and the same flags build the same database elsewhere", async () => {
    const a = await freshDatabase("twice");
    const first = await seed(a, { today: TODAY });
    const afterFirst = await dump(a);
    const second = await seed(a, { today: TODAY });
    const afterSecond = await dump(a);
    expect(afterSecond).toEqual(afterFirst);
    expect(first.organisations.every((o) => o.audited)).toBe(true);
    expect(second.organisations.some((o) => o.audited)).toBe(false);
    expect(afterFirst.people.length).toBeGreaterThan(40);

    const b = await freshDatabase("elsewhere");
    await seed(b, { today: TODAY });
    expect(await dump(b)).toEqual(afterFirst);
  });

  it("records one seed.applied event per organisation only when the content changes, keeping the chain whole", async () => {
    const d = await freshDatabase("audit");
    await seed(d, { today: TODAY });
    await seed(d, { today: TODAY });
    expect(await rows(d, "SELECT action FROM audit_events")).toHaveLength(2);
    await seed(d, { today: "2026-09-01" });
    const events = await rows(d, "SELECT action, org_id FROM audit_events ORDER BY seq");
    expect(events).toHaveLength(4);
    expect(new Set(events.map((e) => e.action))).toEqual(new Set(["seed.applied"]));
    expect(await verifyAuditChain(d.db)).toMatchObject({ whole: true, count: 4 });
  });

  it("re-seeds a database the demo has been used in (sessions, codes, tokens) back to the scenario", async () => {
    const d = await freshDatabase("used");
    await seed(d, { today: TODAY });
    const clean = await dump(d);
    const [therapist] = await rows(d, "SELECT id, org_id FROM people WHERE email = 'therapist@kestrelvalley.test'");
    const now = Date.parse(`${TODAY}T15:00:00Z`);
    await d.client.execute({
      sql: "INSERT INTO sessions (id, person_id, org_id, expires_at, created_at) VALUES ('s1', ?, ?, ?, ?)",
      args: [String(therapist.id), String(therapist.org_id), now + 3_600_000, now],
    });
    await d.client.execute({
      sql: "INSERT INTO sign_in_codes (id, email, code_hash, person_id, expires_at, attempts, created_at) VALUES ('c1', 'therapist@kestrelvalley.test', 'x', ?, ?, 0, ?)",
      args: [String(therapist.id), now + 600_000, now],
    });
    await d.client.execute({
      sql: "INSERT INTO api_tokens (id, org_id, name, token_hash, prefix, scopes, created_by, created_at) VALUES ('t1', ?, 'roster sync', 'h', 'tm_', '[\"read\"]', ?, ?)",
      args: [String(therapist.org_id), String(therapist.id), now],
    });
    await seed(d, { today: TODAY });
    expect(await dump(d)).toEqual(clean);
  });

  it("creates the five demo accounts with their roles, and the manager manages all four units", async () => {
    const d = await freshDatabase("accounts");
    await seed(d, { today: TODAY });
    const roleRows = await rows(
      d,
      `SELECT p.email, group_concat(r.role) AS roles, p.name, p.title, p.employee_id, p.hire_date, p.home_unit_id
         FROM people p JOIN person_roles r ON r.person_id = p.id
        WHERE p.email IN ('therapist@kestrelvalley.test','preceptor@kestrelvalley.test','educator@kestrelvalley.test','manager@kestrelvalley.test','admin@kestrelvalley.test')
        GROUP BY p.id`,
    );
    const roles = Object.fromEntries(roleRows.map((r) => [r.email, String(r.roles).split(",").sort()]));
    expect(roles).toEqual({
      "therapist@kestrelvalley.test": ["therapist"],
      "preceptor@kestrelvalley.test": ["preceptor", "therapist"],
      "educator@kestrelvalley.test": ["educator", "therapist"],
      "manager@kestrelvalley.test": ["manager"],
      "admin@kestrelvalley.test": ["admin"],
    });
    for (const r of roleRows) {
      expect(r.name && r.title && r.employee_id && r.hire_date && r.home_unit_id, String(r.email)).toBeTruthy();
    }
    const managed = await rows(
      d,
      `SELECT u.name FROM person_units pu JOIN people p ON p.id = pu.person_id JOIN units u ON u.id = pu.unit_id
        WHERE p.email = 'manager@kestrelvalley.test' AND pu.relation = 'manages' ORDER BY u.name`,
    );
    expect(managed.map((u) => u.name)).toEqual(["Adult Floors", "Adult ICU", "Emergency", "Neonatal ICU"]);
  });

  it("keeps Alder Bay's people apart: no Kestrel Valley row carries Alder Bay's organisation id", async () => {
    const d = await freshDatabase("isolation");
    await seed(d, { today: TODAY });
    const kv = await orgId(d, "kestrel-valley");
    const ab = await orgId(d, "alder-bay");
    expect(kv).not.toBe(ab);
    const abPeople = await rows(d, "SELECT email FROM people WHERE org_id = ?", [ab]);
    expect(abPeople.length).toBeGreaterThanOrEqual(4);
    expect(abPeople.every((p) => String(p.email).endsWith("@alderbay.test"))).toBe(true);
    expect(await rows(d, "SELECT role FROM person_roles r JOIN people p ON p.id = r.person_id WHERE p.email = 'admin@alderbay.test'")).toEqual([{ role: "admin" }]);
    expect(await rows(d, "SELECT email FROM people WHERE org_id = ? AND email NOT LIKE '%@kestrelvalley.test'", [kv])).toEqual([]);

    // Every foreign key from an organisation-owned row must point at a row of the same organisation.
    const tables = (await rows(d, "SELECT name FROM sqlite_master WHERE type = 'table'")).map((t) => String(t.name));
    const hasOrg = async (t: string) => (await rows(d, `PRAGMA table_info("${t}")`)).some((c) => c.name === "org_id");
    let checked = 0;
    for (const child of tables) {
      if (!(await hasOrg(child))) continue;
      for (const fk of await rows(d, `PRAGMA foreign_key_list("${child}")`)) {
        const parent = String(fk.table);
        if (parent === "organisations" || !(await hasOrg(parent))) continue;
        const crossing = await rows(
          d,
          `SELECT c."${String(fk.from)}" AS ref FROM "${child}" c JOIN "${parent}" p ON p."${String(fk.to)}" = c."${String(fk.from)}" WHERE c.org_id <> p.org_id`,
        );
        expect(crossing, `${child}.${String(fk.from)} → ${parent}`).toEqual([]);
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThan(20);
  });

  it("gives Kestrel Valley a mix of current, due-soon and lapsed credentials, waivers and spread due dates", async () => {
    const d = await freshDatabase("statuses");
    await seed(d, { today: TODAY });
    const kv = await orgId(d, "kestrel-valley");
    // The 90-day window computed with date-fns, independently of the seed's own calendar code.
    const windowEnd = format(addDays(parseISO(TODAY), 90), "yyyy-MM-dd");
    const [mix] = await rows(
      d,
      `SELECT sum(valid_through < ?1) AS lapsed,
              sum(valid_through >= ?1 AND valid_through <= ?2) AS due_soon,
              sum(valid_through IS NULL OR valid_through > ?2) AS current
         FROM credentials WHERE org_id = ?3`,
      [TODAY, windowEnd, kv],
    );
    expect(Number(mix.lapsed)).toBeGreaterThanOrEqual(1);
    expect(Number(mix.due_soon)).toBeGreaterThanOrEqual(1);
    expect(Number(mix.current)).toBeGreaterThan(Number(mix.lapsed) + Number(mix.due_soon));

    // End-of-month rules: every such valid-through date is the last day of its month (checked with SQLite's date()).
    const notMonthEnd = await rows(
      d,
      `SELECT c.valid_through FROM credentials c JOIN credential_types t ON t.id = c.credential_type_id
        WHERE c.org_id = ? AND json_extract(t.rule, '$.kind') = 'months-end-of-month' AND c.valid_through IS NOT NULL
          AND strftime('%d', date(c.valid_through, '+1 day')) <> '01'`,
      [kv],
    );
    expect(notMonthEnd).toEqual([]);

    // Everyone holds a credential for every credential requirement that applies to them — by role,
    // and by unit for their home unit and every unit they are a member of (requirements: both must match).
    const missing = await rows(
      d,
      `SELECT p.email, q.name FROM requirements q JOIN people p ON p.org_id = q.org_id
        WHERE q.org_id = ? AND q.kind = 'credential'
          AND (q.role IS NULL OR EXISTS (SELECT 1 FROM person_roles r WHERE r.person_id = p.id AND r.role = q.role))
          AND (q.unit_id IS NULL OR q.unit_id = p.home_unit_id
               OR EXISTS (SELECT 1 FROM person_units u WHERE u.person_id = p.id AND u.unit_id = q.unit_id AND u.relation = 'member'))
          AND NOT EXISTS (SELECT 1 FROM credentials c WHERE c.person_id = p.id AND c.credential_type_id = q.credential_type_id)`,
      [kv],
    );
    const [applied] = await rows(d, "SELECT count(*) AS n FROM requirements WHERE org_id = ? AND kind = 'credential'", [kv]);
    expect(Number(applied.n)).toBe(6);
    expect(missing).toEqual([]);

    const waivers = await rows(d, "SELECT w.reason, w.ends_on, p.email FROM waivers w JOIN people p ON p.id = w.granted_by WHERE w.org_id = ?", [kv]);
    expect(waivers.length).toBeGreaterThanOrEqual(2);
    for (const w of waivers) {
      expect(String(w.reason).length).toBeGreaterThan(10);
      expect(String(w.ends_on) > TODAY).toBe(true);
      expect(w.email).toBe("manager@kestrelvalley.test");
    }

    const [due] = await rows(
      d,
      "SELECT sum(due_on < ?1) AS overdue, sum(due_on >= ?1 AND due_on <= ?2) AS soon, sum(due_on > ?2) AS later FROM assignments WHERE org_id = ?3",
      [TODAY, windowEnd, kv],
    );
    expect([Number(due.overdue), Number(due.soon), Number(due.later)].every((n) => n >= 1)).toBe(true);
  });

  it("puts three new hires in orientation, the demo preceptor following some of them", async () => {
    const d = await freshDatabase("orientation");
    await seed(d, { today: TODAY });
    const plans = await rows(
      d,
      `SELECT o.id, o.starts_on, o.ends_on, pr.email AS preceptor, (SELECT count(*) FROM orientation_plan_items i WHERE i.plan_id = o.id) AS items
         FROM orientation_plans o JOIN people pr ON pr.id = o.preceptor_id`,
    );
    expect(plans).toHaveLength(3);
    for (const p of plans) {
      expect(String(p.starts_on) <= TODAY && String(p.ends_on) > TODAY).toBe(true);
      expect(Number(p.items)).toBeGreaterThanOrEqual(6);
    }
    expect(plans.some((p) => p.preceptor === "preceptor@kestrelvalley.test")).toBe(true);
  });

  it("builds a large Kestrel Valley with --people 2000", async () => {
    const d = await freshDatabase("large");
    const summary = await seed(d, { today: TODAY, people: 2000 });
    const kv = await orgId(d, "kestrel-valley");
    const [count] = await rows(d, "SELECT count(*) AS n FROM people WHERE org_id = ?", [kv]);
    expect(Number(count.n)).toBeGreaterThanOrEqual(2000);
    const kvSummary = summary.organisations.find((o) => o.slug === "kestrel-valley");
    // Same mix as the default hospital: 40 of 42 are therapists, 6 of 40 therapists precept.
    expect(kvSummary?.roles.therapist).toBeGreaterThan(1850);
    expect(kvSummary?.roles.preceptor).toBeGreaterThan(250);
    const perUnit = await rows(d, "SELECT home_unit_id, count(*) AS n FROM people WHERE org_id = ? GROUP BY home_unit_id", [kv]);
    expect(perUnit).toHaveLength(4);
    expect(perUnit.every((u) => Number(u.n) > 200)).toBe(true);
    // The demo accounts are unchanged by the head count.
    expect(await rows(d, "SELECT name FROM people WHERE email = 'therapist@kestrelvalley.test'")).toEqual([{ name: "Marisol Ellingsen" }]);
    // Going back to the default hospital replaces the large one.
    await seed(d, { today: TODAY });
    const [after] = await rows(d, "SELECT count(*) AS n FROM people WHERE org_id = ?", [kv]);
    expect(Number(after.n)).toBe(42);
  });
  it("gives Alder Bay every role and records of each kind, with its scans written where the app reads them", async () => {
    const d = await freshDatabase("alder-bay-records");
    const filesDir = path.join(dir, "files");
    await seed(d, { today: TODAY, filesDir });
    const ab = await orgId(d, "alder-bay");
    const roles = await rows(d, "SELECT role, count(*) AS n FROM person_roles WHERE org_id = ? GROUP BY role ORDER BY role", [ab]);
    // Two educators: bank items are written by one and approved by the other.
    expect(roles).toEqual([
      { role: "admin", n: 1 },
      { role: "educator", n: 2 },
      { role: "manager", n: 1 },
      { role: "preceptor", n: 1 },
      { role: "therapist", n: 7 },
    ]);
    const one = async (sql: string) => Number((await rows(d, sql, [ab]))[0]?.n);
    expect(await one("SELECT count(*) AS n FROM attempts WHERE org_id = ? AND submitted_at IS NOT NULL AND score_percent IS NOT NULL")).toBe(4);
    expect(await one("SELECT count(*) AS n FROM checkoffs WHERE org_id = ? AND status = 'acknowledged' AND signed_at IS NOT NULL")).toBe(3);
    expect(await one("SELECT count(*) AS n FROM certificates WHERE org_id = ?")).toBe(3);
    // Each check-off's signer is Alder Bay's preceptor, never the person observed.
    expect(await one(`SELECT count(*) AS n FROM checkoffs c JOIN person_roles r ON r.person_id = c.preceptor_id AND r.role = 'preceptor'
      WHERE c.org_id = ? AND c.preceptor_id <> c.person_id`)).toBe(3);

    const scans = await rows(d, "SELECT f.storage_path, f.sha256, f.size_bytes FROM credentials c JOIN files f ON f.id = c.scan_file_id WHERE c.org_id = ? ORDER BY f.id", [ab]);
    expect(scans).toHaveLength(7);
    for (const scan of scans) {
      const file = path.join(filesDir, String(scan.storage_path));
      const bytes = readFileSync(file);
      expect(bytes.length).toBe(Number(scan.size_bytes));
      expect(createHash("sha256").update(bytes).digest("hex")).toBe(scan.sha256);
      // Read back by an independent PDF reader (poppler's pdftotext): a real one-page PDF.
      expect(execFileSync("pdftotext", [file, "-"]).toString()).toMatch(/^Demo scan: state-licence-AB-\d{4}\.pdf/);
    }
  });
});
