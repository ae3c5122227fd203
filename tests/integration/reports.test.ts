/**
 * Reports (issue 9 §4, §5) on a seeded copy of the demo database, the clock fixed at noon in
 * Chicago on TEST_TODAY: compliance "as recorded by the end of a day" ignores what was recorded
 * later; its counts add up to people × the requirements that apply to them; the CSVs neutralise
 * formula cells (round-tripped through papaparse, an independent CSV parser); the PDFs read back
 * with poppler's pdftotext/pdffonts (independent readers); the packet is record-scoped; a
 * therapist is refused every report.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { credentials, credentialTypes, people, personRoles, personUnits, requirements, units, waivers } from "~/db/schema";
import { statusOptionsFor } from "~/db/queries/people.server";
import { loadMatrix, matrixScopeFor } from "~/db/queries/team-matrix.server";
import { STATUSES } from "~/domain/status";
import * as completionsCsv from "~/routes/reports/completions-csv";
import * as completionsPdf from "~/routes/reports/completions-pdf";
import * as completionsPage from "~/routes/reports/completions";
import * as complianceCsv from "~/routes/reports/compliance-csv";
import * as compliancePdf from "~/routes/reports/compliance-pdf";
import * as compliancePage from "~/routes/reports/compliance";
import * as expiriesCsv from "~/routes/reports/expiries-csv";
import * as expiriesPdf from "~/routes/reports/expiries-pdf";
import * as expiriesPage from "~/routes/reports/expiries";
import * as indexPage from "~/routes/reports/index";
import * as packetPdf from "~/routes/reports/packet-pdf";
import * as packetPage from "~/routes/reports/packet";
import { TEST_TODAY } from "../setup/db";
import { args, getRequest } from "../setup/request";
import { dayOffset, plan, team, useTodayPlanTeamWorld } from "./today-plan-team-harness";

const world = useTodayPlanTeamWorld();
const YESTERDAY = dayOffset(-1);

type Loader = (a: never) => Promise<unknown>;
const call = (loader: Loader, url: string, viewer: Viewer) => loader(args<never>(getRequest(url), viewer));

/** The HTTP status a loader answers with: a Response's, a thrown `data()`'s, or 200 for plain data. */
async function statusOf(run: () => Promise<unknown>): Promise<number> {
  try {
    const out = await run();
    return out instanceof Response ? out.status : 200;
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    return (thrown as { init?: { status?: number } }).init?.status ?? 500;
  }
}

type ComplianceData = Awaited<ReturnType<typeof compliancePage.loader>>;
const compliance = async (viewer: Viewer, on: string) => (await call(compliancePage.loader as Loader, `/reports/compliance?on=${on}`, viewer)) as ComplianceData;

async function pdfText(response: Response): Promise<{ text: string; fonts: string }> {
  expect(response.headers.get("Content-Type")).toBe("application/pdf");
  const dir = mkdtempSync(path.join(tmpdir(), "tidemark-report-pdf-"));
  const file = path.join(dir, "report.pdf");
  writeFileSync(file, Buffer.from(await response.arrayBuffer()));
  return {
    text: spawnSync("pdftotext", [file, "-"], { encoding: "utf8" }).stdout.replace(/\s+/g, " "),
    fonts: spawnSync("pdffonts", [file], { encoding: "utf8" }).stdout,
  };
}

const ROUTES: { name: string; loader: Loader; url: string; bare: number }[] = [
  { name: "/reports", loader: indexPage.loader as Loader, url: "/reports", bare: 200 },
  { name: "/reports/compliance", loader: compliancePage.loader as Loader, url: "/reports/compliance", bare: 200 },
  { name: "/reports/compliance.csv", loader: complianceCsv.loader as Loader, url: "/reports/compliance.csv", bare: 200 },
  { name: "/reports/compliance.pdf", loader: compliancePdf.loader as Loader, url: "/reports/compliance.pdf", bare: 200 },
  { name: "/reports/expiries", loader: expiriesPage.loader as Loader, url: "/reports/expiries", bare: 200 },
  { name: "/reports/expiries.csv", loader: expiriesCsv.loader as Loader, url: "/reports/expiries.csv", bare: 200 },
  { name: "/reports/expiries.pdf", loader: expiriesPdf.loader as Loader, url: "/reports/expiries.pdf", bare: 200 },
  { name: "/reports/completions", loader: completionsPage.loader as Loader, url: "/reports/completions", bare: 200 },
  { name: "/reports/completions.csv", loader: completionsCsv.loader as Loader, url: "/reports/completions.csv", bare: 200 },
  { name: "/reports/completions.pdf", loader: completionsPdf.loader as Loader, url: "/reports/completions.pdf", bare: 200 },
  { name: "/reports/packet", loader: packetPage.loader as Loader, url: "/reports/packet", bare: 200 },
  { name: "/reports/packet.pdf", loader: packetPdf.loader as Loader, url: "/reports/packet.pdf", bare: 404 },
];

describe("who may read reports", () => {
  it("answers a manager and an educator with defaults when called bare (the packet 404s without a target)", async () => {
    for (const r of ROUTES) {
      expect(await statusOf(() => call(r.loader, r.url, world.viewers.manager)), `manager ${r.name}`).toBe(r.bare);
      expect(await statusOf(() => call(r.loader, r.url, world.viewers.educator)), `educator ${r.name}`).toBe(r.bare);
    }
  }, 60_000); // six PDFs rendered

  it("refuses a therapist (403) on every report route", async () => {
    for (const r of ROUTES) expect(await statusOf(() => call(r.loader, r.url, world.viewers.therapist)), r.name).toBe(403);
  });
});

describe("compliance as recorded by the end of a day", () => {
  it("refuses a malformed or future date with a message for the field, and the downloads answer 400", async () => {
    const future = await compliance(world.viewers.manager, dayOffset(1));
    expect(future.report).toBeNull();
    expect(future.error).toMatch(/earlier day/);
    const malformed = await compliance(world.viewers.manager, "2026-02-30");
    expect(malformed.report).toBeNull();
    expect(malformed.error).toMatch(/YYYY-MM-DD/);
    expect(await statusOf(() => call(complianceCsv.loader as Loader, `/reports/compliance.csv?on=${dayOffset(1)}`, world.viewers.manager))).toBe(400);
    expect(await statusOf(() => call(compliancePdf.loader as Loader, "/reports/compliance.pdf?on=yesterday", world.viewers.manager))).toBe(400);
  });

  it("adds up, per unit, to the people on it × the requirements that apply to each, and % Current is Current over the records", async () => {
    const viewer = world.viewers.educator; // the whole organisation
    const data = await compliance(viewer, YESTERDAY);
    const report = data.report!;
    expect(report.units.length).toBeGreaterThan(0);
    // Counted independently here from the rows: people of a unit (home unit or member), hired by
    // then and active; requirements active, on their unit (or every unit) and role (or any role).
    const orgId = viewer.org.id;
    const { db } = world.db;
    const [ps, roles, members, reqs] = await Promise.all([
      db.select().from(people).where(eq(people.orgId, orgId)),
      db.select().from(personRoles).where(eq(personRoles.orgId, orgId)),
      db.select().from(personUnits).where(and(eq(personUnits.orgId, orgId), eq(personUnits.relation, "member"))),
      db.select().from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.active, true))),
    ]);
    for (const unit of report.units) {
      const onUnit = ps.filter(
        (p) => p.active && (p.hireDate === null || p.hireDate <= YESTERDAY) && (p.homeUnitId === unit.unitId || members.some((m) => m.personId === p.id && m.unitId === unit.unitId)),
      );
      let expected = 0;
      for (const p of onUnit) {
        const mine = new Set(roles.filter((r) => r.personId === p.id).map((r) => r.role as string));
        const unitsOf = new Set([p.homeUnitId, ...members.filter((m) => m.personId === p.id).map((m) => m.unitId)]);
        expected += reqs.filter((r) => (r.unitId === null || unitsOf.has(r.unitId)) && (r.role === null || mine.has(r.role))).length;
      }
      expect(unit.people, unit.unit).toBe(onUnit.length);
      expect(unit.cells, unit.unit).toBe(expected);
      expect(STATUSES.reduce((n, s) => n + unit.counts[s], 0), unit.unit).toBe(unit.cells);
      expect(unit.percentCurrent).toBe(Math.round((unit.counts.current / unit.cells) * 1000) / 10);
    }
    expect(STATUSES.reduce((n, s) => n + report.total.counts[s], 0)).toBe(report.total.cells);
  });

  it("for today, gives the Team matrix's compliance by unit (same engine, nothing filtered out)", async () => {
    const manager = world.viewers.manager;
    const report = (await compliance(manager, TEST_TODAY)).report!;
    expect(report.leftOut.hiredLater).toBe(0);
    const scope = await matrixScopeFor(manager.org.id, manager.person.id, manager.roles);
    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const matrix = await loadMatrix(manager.org.id, scope, manager.org.timeZone, options);
    expect(report.units).toEqual(matrix.compliance);
  });

  it("still counts, for yesterday, a waiver revoked today", async () => {
    const manager = world.viewers.manager;
    const scope = await matrixScopeFor(manager.org.id, manager.person.id, manager.roles);
    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const matrix = await loadMatrix(manager.org.id, scope, manager.org.timeZone, options);
    const person = matrix.people.find((p) => p.homeUnitId && Object.values(p.cells).some((c) => c.status === "waived"))!;
    expect(person).toBeDefined();
    const [reqId] = Object.entries(person.cells).find(([, c]) => c.status === "waived")!;
    const unitId = person.homeUnitId!;
    const before = (await compliance(manager, YESTERDAY)).report!.units.find((u) => u.unitId === unitId)!;
    const beforeToday = (await compliance(manager, TEST_TODAY)).report!.units.find((u) => u.unitId === unitId)!;
    expect(before.counts.waived).toBeGreaterThan(0);
    await world.db.write(async (tx) => {
      await tx.update(waivers).set({ revokedAt: new Date() }).where(and(eq(waivers.personId, person.id), eq(waivers.requirementId, reqId)));
    });
    const after = (await compliance(manager, YESTERDAY)).report!.units.find((u) => u.unitId === unitId)!;
    const afterToday = (await compliance(manager, TEST_TODAY)).report!.units.find((u) => u.unitId === unitId)!;
    expect(after.counts).toEqual(before.counts);
    expect(afterToday.counts.waived).toBe(beforeToday.counts.waived - 1);
  });

  it("does not count a credential recorded today in the compliance for yesterday, and counts it for today", async () => {
    const manager = world.viewers.manager;
    // Someone of the manager's units with a credential requirement not met today (Team matrix, same engine).
    const scope = await matrixScopeFor(manager.org.id, manager.person.id, manager.roles);
    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const matrix = await loadMatrix(manager.org.id, scope, manager.org.timeZone, options);
    const credentialColumns = new Set(matrix.columns.filter((c) => c.kind === "credential").map((c) => c.id));
    const person = matrix.people.find((p) => p.homeUnitId && Object.entries(p.cells).some(([id, c]) => credentialColumns.has(id) && (c.status === "lapsed" || c.status === "not-started")))!;
    expect(person).toBeDefined();
    const [reqId, cell] = Object.entries(person.cells).find(([id, c]) => credentialColumns.has(id) && (c.status === "lapsed" || c.status === "not-started"))!;
    const [req] = await world.db.db.select().from(requirements).where(eq(requirements.id, reqId));
    const [type] = await world.db.db.select().from(credentialTypes).where(eq(credentialTypes.id, req.credentialTypeId!));
    const homeUnit = person.homeUnitId!;

    const beforeYesterday = (await compliance(manager, YESTERDAY)).report!.units.find((u) => u.unitId === homeUnit)!;
    const beforeToday = (await compliance(manager, TEST_TODAY)).report!.units.find((u) => u.unitId === homeUnit)!;
    expect(beforeYesterday).toBeDefined();

    // Recorded now (noon in Chicago on TEST_TODAY), valid for years: Current from today.
    await world.db.write(async (tx) => {
      await tx.insert(credentials).values({
        orgId: manager.org.id,
        personId: person.id,
        credentialTypeId: type.id,
        number: "REPORT-TEST-1",
        issuer: "State board",
        issuedOn: TEST_TODAY,
        validThrough: dayOffset(700),
        createdAt: new Date(),
        updatedAt: new Date(),
      });
    });

    const afterYesterday = (await compliance(manager, YESTERDAY)).report!.units.find((u) => u.unitId === homeUnit)!;
    const afterToday = (await compliance(manager, TEST_TODAY)).report!.units.find((u) => u.unitId === homeUnit)!;
    expect(afterYesterday.counts).toEqual(beforeYesterday.counts);
    expect(afterToday.counts.current).toBe(beforeToday.counts.current + 1);
    expect(afterToday.counts[cell.status]).toBe(beforeToday.counts[cell.status] - 1);
    expect(afterToday.cells).toBe(beforeToday.cells);
  });

  it("writes a CSV whose header and rows match the page, and a PDF that reads back", async () => {
    const page = (await compliance(world.viewers.manager, YESTERDAY)).report!;
    const csv = (await call(complianceCsv.loader as Loader, `/reports/compliance.csv?on=${YESTERDAY}`, world.viewers.manager)) as Response;
    expect(csv.headers.get("Content-Disposition")).toContain(`tidemark-compliance-as-of-${YESTERDAY}.csv`);
    const parsed = Papa.parse<string[]>(await csv.text(), { skipEmptyLines: true }).data;
    expect(parsed[0]).toEqual(["Unit", "People", "Requirement records", "% Current", "Current", "Due soon", "Lapsed", "Not started", "Waived"]);
    expect(parsed.length).toBe(page.units.length + 2);
    const first = page.units[0];
    expect(parsed[1]).toEqual([first.unit, String(first.people), String(first.cells), first.percentCurrent.toFixed(1), ...STATUSES.map((s) => String(first.counts[s]))]);

    const pdf = await pdfText((await call(compliancePdf.loader as Loader, `/reports/compliance.pdf?on=${YESTERDAY}`, world.viewers.manager)) as Response);
    expect(pdf.text).toContain(`Compliance by unit as recorded by the end of ${YESTERDAY}`);
    expect(pdf.text).toContain(first.unit);
    expect(pdf.text).toContain("licensed clinical judgement");
    expect(pdf.text).toContain(`Generated ${TEST_TODAY}`);
  });
});

describe("the 12-month trend", () => {
  it("has the 12 month ends before this month, and its last point equals compliance as of that day, on Reports and on Team", async () => {
    const data = (await call(indexPage.loader as Loader, "/reports", world.viewers.manager)) as Awaited<ReturnType<typeof indexPage.loader>>;
    expect(data.trend.monthEnds).toHaveLength(12);
    expect(data.trend.monthEnds[0]).toBe("2025-12-31");
    expect(data.trend.monthEnds[11]).toBe("2026-11-30");
    const nov = (await compliance(world.viewers.manager, "2026-11-30")).report!;
    expect(data.trend.series.length).toBe(nov.units.length);
    for (const s of data.trend.series) {
      expect(s.points).toHaveLength(12);
      expect(s.points[11].percentCurrent).toBe(nov.units.find((u) => u.unitId === s.unitId)!.percentCurrent);
    }
    const teamData = await team(world.viewers.manager);
    expect((await teamData.trend).series.map((s) => s.unitId)).toEqual(data.trend.series.map((s) => s.unitId));
  });
});

describe("expiries and completions", () => {
  it("lists only dates inside the range, and neutralises a hostile name in the CSV", async () => {
    type ExpiriesData = Awaited<ReturnType<typeof expiriesPage.loader>>;
    const data = (await call(expiriesPage.loader as Loader, "/reports/expiries", world.viewers.manager)) as ExpiriesData;
    expect(data.range).toEqual({ from: TEST_TODAY, to: dayOffset(90) });
    expect(data.rows.length).toBeGreaterThan(0);
    for (const r of data.rows) expect(r.date >= TEST_TODAY && r.date <= dayOffset(90)).toBe(true);

    // OWASP, "CSV Injection": a cell starting with = is prefixed with an apostrophe.
    const victim = data.rows[0];
    const hostile = '=HYPERLINK("http://attacker.test","Click")';
    await world.db.write(async (tx) => {
      await tx.update(people).set({ name: hostile }).where(eq(people.id, victim.personId));
    });
    const csv = (await call(expiriesCsv.loader as Loader, "/reports/expiries.csv", world.viewers.manager)) as Response;
    const parsed = Papa.parse<string[]>(await csv.text(), { skipEmptyLines: true }).data;
    expect(parsed[0]).toEqual(["Unit", "Name", "Employee id", "What", "Kind", "Date", "Date is", "Status"]);
    const names = parsed.slice(1).map((r) => r[1]);
    expect(names).toContain(`'${hostile}`);
    expect(names).not.toContain(hostile);

    const bad = (await call(expiriesPage.loader as Loader, `/reports/expiries?from=${TEST_TODAY}&to=${dayOffset(-1)}`, world.viewers.manager)) as ExpiriesData;
    expect(bad.error).toEqual({ field: "to", message: "The last day must be on or after the first day." });
  });

  it("counts completions per exam or checklist and lists each one in the range", async () => {
    type CompletionsData = Awaited<ReturnType<typeof completionsPage.loader>>;
    const data = (await call(completionsPage.loader as Loader, `/reports/completions?from=${dayOffset(-365)}&to=${TEST_TODAY}`, world.viewers.educator)) as CompletionsData;
    const report = data.report!;
    expect(report.rows.length).toBeGreaterThan(0);
    expect(report.counts.reduce((n, c) => n + c.count, 0)).toBe(report.rows.length);
    for (const r of report.rows) expect(r.on >= dayOffset(-365) && r.on <= TEST_TODAY).toBe(true);
    const csv = (await call(completionsCsv.loader as Loader, `/reports/completions.csv?from=${dayOffset(-365)}&to=${TEST_TODAY}`, world.viewers.educator)) as Response;
    const parsed = Papa.parse<string[]>(await csv.text(), { skipEmptyLines: true }).data;
    expect(parsed.length).toBe(report.rows.length + 1);
  });
});

describe("the survey evidence packet", () => {
  it("reads back with the person's name, every requirement, the caution and the shipped font", async () => {
    const therapist = world.viewers.therapist;
    const response = (await call(packetPdf.loader as Loader, `/reports/packet.pdf?person=${therapist.person.id}`, world.viewers.manager)) as Response;
    expect(response.headers.get("Content-Disposition")).toMatch(/attachment; filename="survey-packet-.*\.pdf"/);
    const { text, fonts } = await pdfText(response);
    expect(text).toContain(therapist.person.name);
    const rows = (await plan(therapist)).rows.filter((r) => r.requirementId);
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect(text).toContain(r.title);
    expect(text).toContain("Certificates");
    expect(text).toContain("licensed clinical judgement");
    const sourceSans = fonts.split("\n").filter((l) => /SourceSans3/i.test(l));
    expect(sourceSans.length).toBeGreaterThan(0);
    for (const line of sourceSans) expect(line).toMatch(/\byes\b/);
  });

  it("makes a unit's packet with everyone on it", async () => {
    const unitId = world.viewers.therapist.person.homeUnitId!;
    const response = (await call(packetPdf.loader as Loader, `/reports/packet.pdf?unit=${unitId}`, world.viewers.manager)) as Response;
    const { text } = await pdfText(response);
    expect(text).toContain(world.viewers.therapist.person.name);
  }, 60_000); // one page per person: a unit's packet renders for several seconds on a busy machine

  it("answers 404 for another organisation's person or unit, or an unknown id", async () => {
    const ab = world.viewers.abManager;
    const [abUnit] = await world.db.db.select({ id: units.id }).from(units).where(eq(units.orgId, ab.org.id)).limit(1);
    const m = world.viewers.manager;
    expect(await statusOf(() => call(packetPdf.loader as Loader, `/reports/packet.pdf?person=${ab.person.id}`, m))).toBe(404);
    expect(await statusOf(() => call(packetPdf.loader as Loader, `/reports/packet.pdf?unit=${abUnit.id}`, m))).toBe(404);
    expect(await statusOf(() => call(packetPdf.loader as Loader, "/reports/packet.pdf?person=nobody", m))).toBe(404);
    // And the other way round: their manager cannot reach our therapist.
    expect(await statusOf(() => call(packetPdf.loader as Loader, `/reports/packet.pdf?person=${world.viewers.therapist.person.id}`, ab))).toBe(404);
  });

  it("offers only people of the viewer's scope on the packet page", async () => {
    type PacketData = Awaited<ReturnType<typeof packetPage.loader>>;
    const data = (await call(packetPage.loader as Loader, `/reports/packet?q=${encodeURIComponent(world.viewers.therapist.person.name)}`, world.viewers.manager)) as PacketData;
    expect(data.people.map((p) => p.id)).toContain(world.viewers.therapist.person.id);
    const theirs = (await call(packetPage.loader as Loader, "/reports/packet", world.viewers.abManager)) as PacketData;
    const ours = await world.db.db.select({ id: people.id }).from(people).where(inArray(people.id, theirs.people.map((p) => p.id)));
    expect(ours.every((p) => p.id !== world.viewers.therapist.person.id)).toBe(true);
  });
});
