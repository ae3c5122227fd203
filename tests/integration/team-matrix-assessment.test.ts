/**
 * The Team matrix's fast assessment (issue 8: 2,000 people × 40 requirements assessed in a few
 * hundred milliseconds) gives exactly what the straightforward path gives: each person's full plan
 * from `buildPlan` (every row, sorted, as My plan shows it), one Intl conversion per completion,
 * `localeCompare` for every order, and every unit's compliance counted cell by cell. The
 * organisation is the seeded one with three waivers on one cell (and a revoked one) and an
 * extension added, so the paths the fast one takes short cuts around are exercised too.
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { isRole } from "~/auth/roles";
import type { Database } from "~/db/client.server";
import { assessMatrix, readMatrixRows, type Matrix } from "~/db/queries/team-matrix.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { extensions, people, waivers } from "~/db/schema";
import { addDays, calendarDateIn, STATUS_URGENCY, type StatusOptions } from "~/domain/status";
import { buildPlan, type PlanRequirement } from "~/domain/status/plan";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { viewerFor } from "../setup/request";

let db: Database;
let manager: Viewer;
let options: StatusOptions;

beforeAll(async () => {
  db = await useSeededDatabase();
  manager = await viewerFor("manager@kestrelvalley.test");
  options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
  const therapist = await viewerFor("therapist@kestrelvalley.test");
  // Two of the therapist's cells that are not Current and are owed work: a waiver and an extension show on those.
  const before = assessMatrix(await readMatrixRows(manager.org.id, { unitIds: null }), { unitIds: null }, manager.org.timeZone, options);
  const owed = Object.entries(before.people.find((p) => p.id === therapist.person.id)!.cells).filter(([, c]) => c.status !== "current" && c.dateMeaning === "due");
  if (owed.length < 2) throw new Error("the seeded therapist should owe at least two requirements");
  const [first, second] = owed.map(([id]) => ({ id }));
  await db.write(async (tx) => {
    // Three waivers in force on one cell, two ending the same day, and a revoked one; an extension on another.
    for (const [endsOn, revoked] of [
      [addDays(TEST_TODAY, 30), false],
      [addDays(TEST_TODAY, 30), false],
      [addDays(TEST_TODAY, 10), false],
      [addDays(TEST_TODAY, 60), true],
    ] as const)
      await tx.insert(waivers).values({
        orgId: manager.org.id,
        personId: therapist.person.id,
        requirementId: first.id,
        endsOn,
        reason: "On leave (test)",
        grantedBy: manager.person.id,
        revokedAt: revoked ? new Date() : null,
      });
    await tx.insert(extensions).values({ orgId: manager.org.id, personId: therapist.person.id, requirementId: second.id, newDueOn: addDays(TEST_TODAY, 20), reason: "Short-staffed (test)", grantedBy: manager.person.id });
  });
});

/** The matrix as it was built before the fast path: full plans, nothing cached, nothing skipped. */
function straightforward(raw: Awaited<ReturnType<typeof readMatrixRows>>, timeZone: string): Matrix {
  const requirementsList: PlanRequirement[] = raw.requirements.map((r) => ({
    id: r.id,
    name: r.name,
    kind: r.kind,
    examId: r.exam_id,
    checklistId: r.checklist_id,
    credentialTypeId: r.credential_type_id,
    recurrence: r.recurrence,
    unitId: r.unit_id,
    role: r.role,
    active: true,
    graceDays: Number(r.grace_days ?? 0),
  }));
  const of = <T extends { person_id: string }>(rows: T[], id: string) => rows.filter((r) => r.person_id === id);
  const dateOf = (at: number) => calendarDateIn(timeZone, new Date(at < 1e11 ? at * 1000 : at));
  const matrixPeople = raw.people.map((p) => {
    const unitIds = [...new Set([...(p.home_unit_id ? [p.home_unit_id] : []), ...of(raw.members, p.id).map((m) => m.unit_id)])];
    const roles = of(raw.roles, p.id)
      .map((r) => r.role)
      .filter(isRole);
    const rows = buildPlan(
      {
        person: { roles, unitIds },
        requirements: requirementsList,
        credentials: of(raw.credentials, p.id).map((c) => ({ id: c.id, credentialTypeId: c.credential_type_id, typeName: c.type_name, number: c.number, issuer: c.issuer, issuedOn: c.issued_on, validThrough: c.valid_through, verified: Boolean(c.verified) })),
        assignments: of(raw.assignments, p.id).map((a) => ({ id: a.id, kind: a.kind, refId: a.kind === "exam" ? a.exam_id : a.checklist_id, requirementId: a.requirement_id, title: "", dueOn: a.due_on })),
        completions: [
          ...of(raw.passed, p.id).map((c) => ({ kind: "exam" as const, refId: c.ref_id, completedOn: dateOf(Number(c.at)) })),
          ...of(raw.signed, p.id).map((c) => ({ kind: "checklist" as const, refId: c.ref_id, completedOn: dateOf(Number(c.at)) })),
        ],
        waivers: of(raw.waivers, p.id).map((w) => ({ id: w.id, requirementId: w.requirement_id, endsOn: w.ends_on, reason: w.reason, grantedBy: w.granted_by })),
        extensions: of(raw.extensions, p.id).map((e) => ({ id: e.id, requirementId: e.requirement_id, newDueOn: e.new_due_on, reason: e.reason, grantedBy: e.granted_by })),
      },
      options,
    );
    const cells: Matrix["people"][number]["cells"] = {};
    for (const row of rows)
      if (row.requirementId && row.key.startsWith("requirement:"))
        cells[row.requirementId] = { status: row.result.status, date: row.result.date, dateMeaning: row.dateMeaning, extendedTo: row.extendedTo, waivedThrough: row.result.waivedThrough ?? null };
    const values = Object.values(cells);
    return {
      id: p.id,
      name: p.name,
      employeeId: p.employee_id,
      homeUnitId: p.home_unit_id,
      homeUnit: p.home_unit,
      unitIds,
      roles,
      cells,
      statuses: new Set(values.map((c) => c.status)),
      lapsedCount: values.filter((c) => c.status === "lapsed").length,
      needle: `${p.name}\n${p.employee_id ?? ""}`.toLowerCase(),
    };
  });
  matrixPeople.sort((a, b) => a.name.localeCompare(b.name, "en", { sensitivity: "base" }) || (a.id < b.id ? -1 : 1));
  const compliance = raw.units.map((u) => {
    const counts = { current: 0, "due-soon": 0, lapsed: 0, "not-started": 0, waived: 0 };
    let count = 0;
    for (const p of matrixPeople) {
      if (!p.unitIds.includes(u.id)) continue;
      count += 1;
      for (const c of Object.values(p.cells)) counts[c.status] += 1;
    }
    const cells = Object.values(counts).reduce((a, b) => a + b, 0);
    return { unitId: u.id, unit: u.name, people: count, cells, counts, percentCurrent: cells === 0 ? 0 : Math.round((counts.current / cells) * 1000) / 10 };
  });
  // Expiries in the order the old path gave: date, name, then each person's plan order.
  const horizon = addDays(options.today, 90);
  const names = new Map(raw.requirements.map((r) => [r.id, r.name]));
  const all = matrixPeople.flatMap((p) =>
    Object.entries(p.cells)
      .filter(([, c]) => c.dateMeaning === "valid-through" && c.date !== null && c.date >= options.today && c.date <= horizon)
      .sort(([ra, a], [rb, b]) => STATUS_URGENCY[a.status] - STATUS_URGENCY[b.status] || names.get(ra)!.localeCompare(names.get(rb)!))
      .map(([reqId, c]) => ({ personId: p.id, name: p.name, requirementId: reqId, requirement: names.get(reqId) ?? "", validThrough: c.date!, status: c.status })),
  );
  all.sort((a, b) => (a.validThrough < b.validThrough ? -1 : a.validThrough > b.validThrough ? 1 : a.name.localeCompare(b.name)));
  const count = (days: number) => all.filter((e) => e.validThrough <= addDays(options.today, days)).length;
  return {
    columns: raw.requirements.map((r) => ({ id: r.id, name: r.name, kind: r.kind })),
    people: matrixPeople,
    units: raw.units,
    compliance,
    expiries: { within: { 30: count(30), 60: count(60), 90: count(90) }, soonest: all.slice(0, 20) },
  };
}

/** Cells with their keys in column order, and status sets as sorted lists, so two matrices compare as data. */
function comparable(m: Matrix) {
  return {
    ...m,
    people: m.people.map((p) => ({ ...p, cells: m.columns.map((c) => [c.id, p.cells[c.id] ?? null]), statuses: [...p.statuses].sort() })),
  };
}

describe("the Team matrix assessment", () => {
  it("gives every cell, count and order the straightforward path gives, for the whole organisation and a manager's units", async () => {
    const [therapistRow] = await db.db.select({ id: people.id }).from(people).where(eq(people.email, "therapist@kestrelvalley.test"));
    for (const scope of [{ unitIds: null }, { unitIds: (await readMatrixRows(manager.org.id, { unitIds: null })).units.slice(0, 1).map((u) => u.id) }]) {
      const raw = await readMatrixRows(manager.org.id, scope);
      const fast = assessMatrix(raw, scope, manager.org.timeZone, options);
      const slow = straightforward(raw, manager.org.timeZone);
      const units = scope.unitIds === null ? slow.units : slow.units.filter((u) => scope.unitIds!.includes(u.id));
      const expected = { ...slow, units, compliance: slow.compliance.filter((c) => units.some((u) => u.id === c.unitId)) };
      expect(comparable(fast)).toEqual(comparable(expected));
      // The data is not trivial: the waived and extended cells are there, and so are all five words.
      expect(fast.people.length).toBeGreaterThanOrEqual(scope.unitIds === null ? 40 : 5);
      if (scope.unitIds === null) {
        const mine = fast.people.find((p) => p.id === therapistRow.id)!;
        expect(Object.values(mine.cells).some((c) => c.waivedThrough === addDays(TEST_TODAY, 30))).toBe(true);
        expect(Object.values(mine.cells).some((c) => c.extendedTo === addDays(TEST_TODAY, 20))).toBe(true);
        expect(new Set(fast.people.flatMap((p) => [...p.statuses]))).toEqual(new Set(["current", "due-soon", "lapsed", "not-started", "waived"]));
        expect(fast.expiries.soonest.length).toBeGreaterThan(0);
      }
    }
  });
});
