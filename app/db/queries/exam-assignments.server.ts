/**
 * Assigning an exam (issue 5, item 1): to chosen people, to everyone on a unit, or to everyone
 * holding a role — active people of the viewer's organisation only — with a due date. Each person
 * holds at most one open assignment per exam: people who already hold one are skipped and
 * counted. Each assignment links to an active exam requirement for that exam when there is one
 * (so it answers that requirement in the plan), and records how it was given (unit or role).
 * One audit event per batch, with its counts.
 */
import { and, asc, eq, inArray, or } from "drizzle-orm";
import { isRole, ROLE_LABELS } from "~/auth/roles";
import type { AssignTarget } from "~/routes/bank/exam-form";
import { recordAudit } from "../audit.server";
import { database, type DbOrTx } from "../client.server";
import { assignments, exams, people, personRoles, personUnits, requirements, units } from "../schema";

export type AssignResult = { ok: true; created: number; skipped: number; requirementName: string | null } | { ok: false; reason: string; field?: "personIds" | "unitId" | "role" };

/** Active people of the organisation the target names. */
async function peopleOf(db: DbOrTx, orgId: string, target: AssignTarget): Promise<{ ids: string[]; problem?: { reason: string; field: "personIds" | "unitId" | "role" } }> {
  if (target.kind === "people") {
    const rows = await db
      .select({ id: people.id })
      .from(people)
      .where(and(eq(people.orgId, orgId), eq(people.active, true), inArray(people.id, target.personIds)));
    if (rows.length !== target.personIds.length) {
      const missing = target.personIds.length - rows.length;
      return { ids: [], problem: { field: "personIds", reason: `${missing === 1 ? "One person chosen is" : `${missing} people chosen are`} not an active person of your organisation. Choose again from the list.` } };
    }
    return { ids: rows.map((r) => r.id) };
  }
  if (target.kind === "unit") {
    const [unit] = await db.select({ id: units.id, active: units.active }).from(units).where(and(eq(units.orgId, orgId), eq(units.id, target.unitId)));
    if (!unit || !unit.active) return { ids: [], problem: { field: "unitId", reason: "Choose an active unit of your organisation." } };
    // On the unit: its members, and everyone whose home unit it is (as the plan counts them).
    const rows = await db
      .selectDistinct({ id: people.id })
      .from(people)
      .leftJoin(personUnits, and(eq(personUnits.personId, people.id), eq(personUnits.orgId, orgId), eq(personUnits.relation, "member"), eq(personUnits.unitId, unit.id)))
      .where(and(eq(people.orgId, orgId), eq(people.active, true), or(eq(people.homeUnitId, unit.id), eq(personUnits.unitId, unit.id))));
    return { ids: rows.map((r) => r.id) };
  }
  const rows = await db
    .selectDistinct({ id: people.id })
    .from(people)
    .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.orgId, orgId), eq(personRoles.role, target.role)))
    .where(and(eq(people.orgId, orgId), eq(people.active, true)));
  return { ids: rows.map((r) => r.id) };
}

/**
 * The active exam requirement an assignment answers: the one for the target's unit or role when
 * there is one, else one that applies to everyone, else the first by name.
 */
async function requirementFor(db: DbOrTx, orgId: string, examId: string, target: AssignTarget) {
  const rows = await db
    .select({ id: requirements.id, name: requirements.name, unitId: requirements.unitId, role: requirements.role })
    .from(requirements)
    .where(and(eq(requirements.orgId, orgId), eq(requirements.kind, "exam"), eq(requirements.examId, examId), eq(requirements.active, true)))
    .orderBy(asc(requirements.name), asc(requirements.id));
  const exact = rows.find((r) => (target.kind === "unit" && r.unitId === target.unitId) || (target.kind === "role" && r.role === target.role));
  return exact ?? rows.find((r) => r.unitId === null && r.role === null) ?? rows[0] ?? null;
}

export async function assignExam(orgId: string, actorId: string, examId: string, target: AssignTarget, dueOn: string, today: string, now = new Date()): Promise<AssignResult> {
  const { write } = await database();
  return write(async (tx) => {
    const [exam] = await tx.select({ id: exams.id, status: exams.status, title: exams.title }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.id, examId)));
    if (!exam) return { ok: false, reason: "not-found" };
    if (exam.status !== "published") return { ok: false, reason: exam.status === "draft" ? "Publish the exam before assigning it." : "A retired exam cannot be assigned. Publish it again first." };
    if (dueOn < today) return { ok: false, reason: `The due date must be today (${today}) or later.` };
    const { ids, problem } = await peopleOf(tx, orgId, target);
    if (problem) return { ok: false, ...problem };
    const holders = ids.length
      ? await tx
          .select({ personId: assignments.personId })
          .from(assignments)
          .where(and(eq(assignments.orgId, orgId), eq(assignments.kind, "exam"), eq(assignments.examId, examId), eq(assignments.status, "open"), inArray(assignments.personId, ids)))
      : [];
    const holding = new Set(holders.map((h) => h.personId));
    const fresh = ids.filter((id) => !holding.has(id));
    const requirement = await requirementFor(tx, orgId, examId, target);
    if (fresh.length) {
      await tx.insert(assignments).values(
        fresh.map((personId) => ({
          orgId,
          personId,
          kind: "exam" as const,
          examId,
          requirementId: requirement?.id ?? null,
          viaUnitId: target.kind === "unit" ? target.unitId : null,
          viaRole: target.kind === "role" ? target.role : null,
          dueOn,
          status: "open" as const,
          assignedBy: actorId,
          createdAt: now,
        })),
      );
    }
    await recordAudit(
      tx,
      {
        orgId,
        actorId,
        action: "assignment.created",
        entityType: "exam",
        entityId: examId,
        detail: {
          to: target.kind,
          ...(target.kind === "unit" ? { unitId: target.unitId } : target.kind === "role" ? { role: target.role } : {}),
          dueOn,
          created: fresh.length,
          skipped: holding.size,
          requirementId: requirement?.id ?? null,
          personIds: fresh,
        },
      },
      now,
    );
    return { ok: true, created: fresh.length, skipped: holding.size, requirementName: requirement?.name ?? null };
  });
}

export type CancelResult = { ok: true } | { ok: false; reason: string };

export async function cancelAssignment(orgId: string, actorId: string, examId: string, assignmentId: string, now = new Date()): Promise<CancelResult> {
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx
      .select({ id: assignments.id, status: assignments.status, personId: assignments.personId, dueOn: assignments.dueOn })
      .from(assignments)
      .where(and(eq(assignments.orgId, orgId), eq(assignments.id, assignmentId), eq(assignments.kind, "exam"), eq(assignments.examId, examId)));
    if (!row) return { ok: false, reason: "not-found" };
    if (row.status !== "open") return { ok: false, reason: `This assignment is already ${row.status}.` };
    await tx.update(assignments).set({ status: "cancelled" }).where(eq(assignments.id, row.id));
    await recordAudit(tx, { orgId, actorId, action: "assignment.cancelled", entityType: "assignment", entityId: row.id, detail: { examId, personId: row.personId, dueOn: row.dueOn } }, now);
    return { ok: true };
  });
}

export type OpenAssignmentRow = { id: string; personName: string; dueOn: string; via: string; requirementName: string | null; assignedBy: string | null };

/** The exam's open assignments, soonest due first. */
export async function listOpenAssignments(orgId: string, examId: string): Promise<OpenAssignmentRow[]> {
  const { db } = await database();
  const rows = await db
    .select({
      id: assignments.id,
      personName: people.name,
      dueOn: assignments.dueOn,
      viaUnit: units.name,
      viaRole: assignments.viaRole,
      requirementName: requirements.name,
      assignedById: assignments.assignedBy,
    })
    .from(assignments)
    .innerJoin(people, and(eq(people.id, assignments.personId), eq(people.orgId, orgId)))
    .leftJoin(units, and(eq(units.id, assignments.viaUnitId), eq(units.orgId, orgId)))
    .leftJoin(requirements, and(eq(requirements.id, assignments.requirementId), eq(requirements.orgId, orgId)))
    .where(and(eq(assignments.orgId, orgId), eq(assignments.kind, "exam"), eq(assignments.examId, examId), eq(assignments.status, "open")))
    .orderBy(asc(assignments.dueOn), asc(people.name));
  const assignerIds = [...new Set(rows.map((r) => r.assignedById).filter((x): x is string => !!x))];
  const assigners = assignerIds.length
    ? await db.select({ id: people.id, name: people.name }).from(people).where(and(eq(people.orgId, orgId), inArray(people.id, assignerIds)))
    : [];
  const nameOf = new Map(assigners.map((a) => [a.id, a.name]));
  return rows.map((r) => ({
    id: r.id,
    personName: r.personName,
    dueOn: r.dueOn,
    via: r.viaUnit ? `Unit: ${r.viaUnit}` : r.viaRole ? `Role: ${isRole(r.viaRole) ? ROLE_LABELS[r.viaRole] : r.viaRole}` : "Chosen by name",
    requirementName: r.requirementName,
    assignedBy: r.assignedById ? (nameOf.get(r.assignedById) ?? null) : null,
  }));
}

/** Choices for the assign panel: active people (with home unit) and active units. */
export async function assignChoices(orgId: string) {
  const { db } = await database();
  const [folk, unitRows] = await Promise.all([
    db
      .select({ id: people.id, name: people.name, title: people.title, unit: units.name })
      .from(people)
      .leftJoin(units, and(eq(units.id, people.homeUnitId), eq(units.orgId, orgId)))
      .where(and(eq(people.orgId, orgId), eq(people.active, true)))
      .orderBy(asc(people.name)),
    db.select({ id: units.id, name: units.name }).from(units).where(and(eq(units.orgId, orgId), eq(units.active, true))).orderBy(asc(units.name)),
  ]);
  return { people: folk, units: unitRows };
}

