/**
 * Team matrix, its CSV export, a cell's evidence page with waivers and extensions, the
 * requirements page and Admin's regulatory references: same answers as My plan, organisation
 * isolation for every new loader, audited writes.
 */
import { and, eq } from "drizzle-orm";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { auditEvents, regulatoryReferences, requirements, units, waivers } from "~/db/schema";
import * as referencesRoute from "~/routes/admin/references";
import * as cellRoute from "~/routes/team/cell";
import * as exportRoute from "~/routes/team/matrix-export";
import * as matrixRoute from "~/routes/team/matrix";
import * as requirementsRoute from "~/routes/team/requirements";
import { decodeCells } from "~/routes/team/matrix-params";
import { plan, useTodayPlanTeamWorld } from "./today-plan-team-harness";
import { args, getRequest, postForm } from "../setup/request";

type MatrixArgs = Parameters<typeof matrixRoute.loader>[0];
type MatrixData = Awaited<ReturnType<typeof matrixRoute.loader>>;
type CellArgs = Parameters<typeof cellRoute.loader>[0];
type CellActionArgs = Parameters<typeof cellRoute.action>[0];

const world = useTodayPlanTeamWorld();

const matrix = async (viewer: Viewer, search = "") => (await matrixRoute.loader(args<MatrixArgs>(getRequest(`/team/matrix${search}`), viewer))) as MatrixData;

async function status(run: () => Promise<unknown>): Promise<number> {
  try {
    const out = await run();
    return out instanceof Response ? out.status : ((out as { init?: { status?: number } })?.init?.status ?? 200);
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    return (thrown as { init?: { status?: number } }).init?.status ?? 500;
  }
}

async function unitId(viewer: Viewer, name: string): Promise<string> {
  const [u] = await world.db.db.select({ id: units.id }).from(units).where(and(eq(units.orgId, viewer.org.id), eq(units.name, name)));
  return u.id;
}

describe("the matrix", () => {
  it("shows each cell with the same status My plan gives the person", async () => {
    const m = await matrix(world.viewers.manager, "?q=" + encodeURIComponent(world.viewers.therapist.person.name));
    const found = m.rows.find((r) => r.id === world.viewers.therapist.person.id)!;
    expect(found).toBeDefined();
    const row = { ...found, cells: decodeCells(found.cells) };
    const mine = (await plan(world.viewers.therapist)).rows;
    m.columns.forEach((col, i) => {
      const cell = row.cells[i];
      const planRow = mine.find((r) => r.key === `requirement:${col.id}`);
      expect(cell?.[0]).toBe(planRow?.result.status);
    });
  });

  it("filters on the server by unit and status, and pages 50 at a time", async () => {
    const icu = await unitId(world.viewers.manager, "Adult ICU");
    const m = await matrix(world.viewers.manager, `?unit=${icu}&status=lapsed`);
    expect(m.matching).toBeGreaterThan(0);
    expect(m.rows.length).toBeLessThanOrEqual(50);
    for (const r of m.rows) expect(decodeCells(r.cells).some((c) => c?.[0] === "lapsed")).toBe(true);
    const all = await matrix(world.viewers.manager);
    expect(m.matching).toBeLessThan(all.matching);
    // Compliance by unit: counts add up to the cells of the people on the unit, and % Current matches.
    const unit = all.compliance.find((u) => u.unitId === icu)!;
    const total = Object.values(unit.counts).reduce((a, b) => a + b, 0);
    expect(unit.cells).toBe(total);
    expect(unit.percentCurrent).toBeCloseTo((unit.counts.current / total) * 100, 1);
    expect(all.expiries.within[30]).toBeLessThanOrEqual(all.expiries.within[60]);
    expect(all.expiries.within[60]).toBeLessThanOrEqual(all.expiries.within[90]);
  });

  it("never shows another organisation's people", async () => {
    const ours = await matrix(world.viewers.manager);
    const theirs = await matrix(world.viewers.abManager);
    const ids = new Set(ours.rows.map((r) => r.id));
    expect(theirs.rows.some((r) => ids.has(r.id))).toBe(false);
    expect(theirs.columns.some((c) => ours.columns.some((o) => o.id === c.id))).toBe(false);
    // Another organisation's unit id in the filter finds no one.
    const icu = await unitId(world.viewers.manager, "Adult ICU");
    expect((await matrix(world.viewers.abManager, `?unit=${icu}`)).matching).toBe(0);
  });

  it("a therapist may not read the matrix, the export or a cell", async () => {
    const t = world.viewers.therapist;
    expect(await status(() => matrixRoute.loader(args<MatrixArgs>(getRequest("/team/matrix"), t)))).toBe(403);
    expect(await status(() => exportRoute.loader(args(getRequest("/team/matrix/export"), t)))).toBe(403);
  });
});

describe("CSV export", () => {
  it("exports the filtered view, parses back with papaparse, one row per matching person", async () => {
    const icu = await unitId(world.viewers.manager, "Adult ICU");
    const res = (await exportRoute.loader(args(getRequest(`/team/matrix/export?unit=${icu}&status=lapsed`), world.viewers.manager))) as Response;
    expect(res.headers.get("Content-Type")).toMatch(/^text\/csv/);
    expect(res.headers.get("Content-Disposition")).toMatch(/^attachment/);
    const parsed = Papa.parse<string[]>(await res.text(), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const m = await matrix(world.viewers.manager, `?unit=${icu}&status=lapsed`);
    expect(parsed.data.length - 1).toBe(m.matching);
    expect(parsed.data[0].slice(0, 3)).toEqual(["Name", "Employee id", "Home unit"]);
    expect(parsed.data.slice(1).every((r) => r.includes("Lapsed"))).toBe(true);
  });

  it("another organisation's export holds none of our people", async () => {
    const ours = await matrix(world.viewers.manager);
    const res = (await exportRoute.loader(args(getRequest("/team/matrix/export"), world.viewers.abManager))) as Response;
    const text = await res.text();
    for (const r of ours.rows) expect(text).not.toContain(r.name);
  });
});

describe("a cell: evidence, waiver and extension", () => {
  it("a manager grants a waiver from a lapsed cell; it is audited and the cell becomes Waived", async () => {
    const manager = world.viewers.manager;
    const icu = await unitId(manager, "Adult ICU");
    const m = await matrix(manager, `?unit=${icu}&status=lapsed`);
    const row = m.rows[0];
    const reqId = m.columns[decodeCells(row.cells).findIndex((c) => c?.[0] === "lapsed")].id;
    const path = `/team/people/${row.id}/requirements/${reqId}`;
    const cell = (await cellRoute.loader(args<CellArgs>(getRequest(path), manager, { personId: row.id, requirementId: reqId }))) as Awaited<ReturnType<typeof cellRoute.loader>>;
    expect(cell.row.result.status).toBe("lapsed");
    expect(cell.row.evidence?.length).toBeGreaterThan(0);

    // Impossible date refused, nothing written.
    const bad = await status(() => cellRoute.action(args<CellActionArgs>(postForm(path, { intent: "grant-waiver", reason: "Leave", endsOn: "2027-02-30" }), manager, { personId: row.id, requirementId: reqId })));
    expect(bad).toBe(400);
    const ok = await status(() => cellRoute.action(args<CellActionArgs>(postForm(path, { intent: "grant-waiver", reason: "Extended medical leave", endsOn: "2027-03-31" }), manager, { personId: row.id, requirementId: reqId })));
    expect(ok).toBe(302);
    const [w] = await world.db.db.select().from(waivers).where(and(eq(waivers.personId, row.id), eq(waivers.requirementId, reqId), eq(waivers.reason, "Extended medical leave")));
    expect(w).toMatchObject({ grantedBy: manager.person.id, endsOn: "2027-03-31" });
    expect(await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, w.id), eq(auditEvents.action, "waiver.granted")))).toHaveLength(1);
    const after = await matrix(manager, `?q=${encodeURIComponent(row.name)}`);
    const col = after.columns.findIndex((c) => c.id === reqId);
    expect(decodeCells(after.rows.find((r) => r.id === row.id)!.cells)[col]).toEqual(["waived", expect.anything(), expect.any(String), "2027-03-31"]);

    // Revoking ends it before its date: refused to an educator and to another organisation's
    // manager, a reason is required, then it is audited and the cell is Lapsed again.
    const p = { personId: row.id, requirementId: reqId };
    const revoke = (reason: string) => postForm(path, { intent: "revoke-waiver", waiverId: w.id, reason });
    expect(await status(() => cellRoute.action(args<CellActionArgs>(revoke("Back at work"), world.viewers.educator, p)))).toBe(403);
    expect(await status(() => cellRoute.action(args<CellActionArgs>(revoke("Back at work"), world.viewers.abManager, p)))).toBe(404);
    expect(await status(() => cellRoute.action(args<CellActionArgs>(revoke(""), manager, p)))).toBe(400);
    expect(await status(() => cellRoute.action(args<CellActionArgs>(revoke("Back at work early"), manager, p)))).toBe(302);
    const [revoked] = await world.db.db.select().from(waivers).where(eq(waivers.id, w.id));
    expect(revoked.revokedAt).toBeInstanceOf(Date);
    expect(await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, w.id), eq(auditEvents.action, "waiver.revoked")))).toHaveLength(1);
    // A second revoke finds nothing in force.
    expect(await status(() => cellRoute.action(args<CellActionArgs>(revoke("Again"), manager, p)))).toBe(404);
    const again = await matrix(manager, `?q=${encodeURIComponent(row.name)}`);
    expect(decodeCells(again.rows.find((r) => r.id === row.id)!.cells)[col]?.[0]).toBe("lapsed");
  });

  it("an educator reads a cell but cannot grant; another organisation's manager cannot open it", async () => {
    const manager = world.viewers.manager;
    const m = await matrix(manager);
    const row = m.rows[0];
    const reqId = m.columns[decodeCells(row.cells).findIndex((c) => c !== null)].id;
    const path = `/team/people/${row.id}/requirements/${reqId}`;
    const p = { personId: row.id, requirementId: reqId };
    expect(await status(() => cellRoute.loader(args<CellArgs>(getRequest(path), world.viewers.educator, p)))).toBe(200);
    expect(await status(() => cellRoute.action(args<CellActionArgs>(postForm(path, { intent: "grant-extension", reason: "Course full", newDueOn: "2027-01-31" }), world.viewers.educator, p)))).toBe(403);
    expect(await status(() => cellRoute.loader(args<CellArgs>(getRequest(path), world.viewers.abManager, p)))).toBe(404);
    expect(await status(() => cellRoute.action(args<CellActionArgs>(postForm(path, { intent: "grant-extension", reason: "Course full", newDueOn: "2027-01-31" }), world.viewers.abManager, p)))).toBe(404);
  });
});

describe("requirements and regulatory references", () => {
  it("the requirements page cites each requirement's reference with its last-verified date, for this organisation only", async () => {
    const data = (await requirementsRoute.loader(args(getRequest("/team/requirements"), world.viewers.educator))) as Awaited<ReturnType<typeof requirementsRoute.loader>>;
    expect(data.requirements.length).toBeGreaterThan(5);
    expect(data.requirements.filter((r) => r.reference).length).toBe(data.requirements.length);
    const theirs = (await requirementsRoute.loader(args(getRequest("/team/requirements"), world.viewers.abManager))) as Awaited<ReturnType<typeof requirementsRoute.loader>>;
    expect(theirs.requirements.some((r) => data.requirements.some((d) => d.id === r.id))).toBe(false);
  });

  it("an admin edits a reference and its last-verified date (audited); another organisation's admin cannot", async () => {
    const admin = world.viewers.admin;
    const [ref] = await world.db.db.select().from(regulatoryReferences).where(eq(regulatoryReferences.orgId, admin.org.id)).limit(1);
    const body = { referenceId: ref.id, code: "Accreditation standard HR-01.2", title: ref.title, body: ref.body, lastVerifiedOn: "2026-12-01" };
    expect(await status(() => referencesRoute.action(args(postForm("/admin/references", body), world.viewers.abAdmin)))).toBe(404);
    expect(await status(() => referencesRoute.action(args(postForm("/admin/references", { ...body, lastVerifiedOn: "2026-13-01" }), admin)))).toBe(400);
    expect(await status(() => referencesRoute.action(args(postForm("/admin/references", body), admin)))).toBe(302);
    const [after] = await world.db.db.select().from(regulatoryReferences).where(eq(regulatoryReferences.id, ref.id));
    expect(after).toMatchObject({ code: "Accreditation standard HR-01.2", lastVerifiedOn: "2026-12-01" });
    expect(await status(() => referencesRoute.loader(args(getRequest("/admin/references"), world.viewers.manager)))).toBe(403);
  });

  it("an educator sets a requirement's grace period and reference (audited); a therapist cannot; another organisation's reference is refused", async () => {
    const educator = world.viewers.educator;
    const [req] = await world.db.db.select().from(requirements).where(eq(requirements.orgId, educator.org.id)).limit(1);
    const [ref] = await world.db.db.select().from(regulatoryReferences).where(eq(regulatoryReferences.orgId, educator.org.id)).limit(1);
    const [theirs] = await world.db.db.select().from(regulatoryReferences).where(eq(regulatoryReferences.orgId, world.viewers.abAdmin.org.id)).limit(1);
    const post = (viewer: Viewer, fields: Record<string, string>) => status(() => requirementsRoute.action(args(postForm("/team/requirements", fields), viewer)));
    // Recurrence and audience are sent as the form shows them (unchanged); kind decides whether recurrence applies.
    const body = { intent: "update-requirement", requirementId: req.id, recurrence: req.recurrence ?? "", unitId: req.unitId ?? "", role: req.role ?? "", graceDays: "30", regulatoryReferenceId: ref.id, lapseLeaves: "supervised" };
    expect(await post(world.viewers.therapist, body)).toBe(403);
    expect(await post(educator, { ...body, graceDays: "-1" })).toBe(400);
    expect(await post(educator, { ...body, regulatoryReferenceId: theirs.id })).toBe(400);
    expect(await post(world.viewers.abManager, body)).toBe(404);
    expect(await post(educator, body)).toBe(302);
    const [after] = await world.db.db.select().from(requirements).where(eq(requirements.id, req.id));
    expect(after).toMatchObject({ graceDays: 30, regulatoryReferenceId: ref.id, lapseLeaves: "supervised", recurrence: req.recurrence, unitId: req.unitId, role: req.role });
    expect(await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, req.id), eq(auditEvents.action, "requirement.updated")))).toHaveLength(1);
  });
});
