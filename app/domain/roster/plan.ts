/**
 * What importing a checked roster would change, compared with the organisation's people now.
 * Pure: the caller reads the people (inside its write transaction when applying), so the
 * preview and the apply compute the same plan from the same rules, and `planKey` lets the
 * apply refuse when the plan is no longer the one the admin confirmed.
 *
 * - Matched by employee id, exactly as written (after trimming).
 * - New: an employee id no one in the organisation has.
 * - Changed: name, e-mail, hire date, and — when the file has the column — title, home unit,
 *   active, and roles not yet held (roles are only added).
 * - Deactivated: only when the admin ticks "deactivate people missing from the file": an active
 *   person with an employee id who is not in the file. Never the importing admin, never anyone
 *   holding the admin role (deactivate them on their person page, where the last-admin guard
 *   is), never a person without an employee id (added by hand, not from HR).
 * - An e-mail already used by someone else (here or in another organisation) is a row error;
 *   so is active=no for the importing admin or for an admin.
 * - A person who is inactive, in the file and has no active column stays inactive.
 */
import type { Role } from "~/auth/roles";
import type { RosterProblem, RosterRow } from "./parse";

export type CurrentPerson = {
  id: string;
  employeeId: string | null;
  name: string;
  email: string;
  title: string | null;
  hireDate: string | null;
  homeUnitId: string | null;
  active: boolean;
  roles: Role[];
};

export type PersonFields = { name: string; email: string; hireDate: string; title?: string | null; homeUnitId?: string | null; active?: boolean };
export type FieldChange = { before: unknown; after: unknown };

export type PlannedNew = { row: number; employeeId: string; values: PersonFields & { active: boolean }; roles: Role[] };
export type PlannedChange = { row: number; personId: string; employeeId: string; name: string; changes: Record<string, FieldChange>; rolesAdded: Role[] };
export type PlannedDeactivation = { personId: string; employeeId: string; name: string };

export type RosterPlan = {
  created: PlannedNew[];
  changed: PlannedChange[];
  deactivated: PlannedDeactivation[];
  unchanged: number;
  problems: RosterProblem[];
};

export type PlanContext = {
  people: readonly CurrentPerson[];
  /** E-mails of the file that belong to people of other organisations. */
  foreignEmails: ReadonlySet<string>;
  actorId: string;
  deactivateMissing: boolean;
  /** Column labels of the file, for the problems this step finds (e.g. "C (email)"). */
  columnLabel: (column: "email" | "active") => string;
};

const FIELDS = ["name", "email", "hireDate", "title", "homeUnitId", "active"] as const;

export function planRoster(rows: readonly RosterRow[], ctx: PlanContext): RosterPlan {
  const byEmployeeId = new Map(ctx.people.filter((p) => p.employeeId).map((p) => [p.employeeId as string, p]));
  const byEmail = new Map(ctx.people.map((p) => [p.email, p]));
  const plan: RosterPlan = { created: [], changed: [], deactivated: [], unchanged: 0, problems: [] };
  const inFile = new Set<string>();

  for (const r of rows) {
    inFile.add(r.employeeId);
    const current = byEmployeeId.get(r.employeeId);
    const holder = byEmail.get(r.email);
    if (holder && holder.id !== current?.id) {
      plan.problems.push({
        row: r.row,
        column: ctx.columnLabel("email"),
        message: `${r.email} already belongs to ${holder.name}${holder.employeeId ? ` (employee id ${holder.employeeId})` : ""}. Each person signs in with their own address.`,
      });
      continue;
    }
    if (ctx.foreignEmails.has(r.email)) {
      // Naming someone of another organisation would leak data across organisations.
      plan.problems.push({ row: r.row, column: ctx.columnLabel("email"), message: `${r.email} is already in use in Tidemark. Each person signs in with their own address.` });
      continue;
    }
    const values: PersonFields = { name: r.name, email: r.email, hireDate: r.hireDate };
    if (r.title !== undefined) values.title = r.title;
    if (r.homeUnitId !== undefined) values.homeUnitId = r.homeUnitId;
    if (r.active !== undefined) values.active = r.active;

    if (!current) {
      plan.created.push({ row: r.row, employeeId: r.employeeId, values: { ...values, active: r.active ?? true }, roles: r.roles ?? [] });
      continue;
    }
    if (r.active === false && (current.id === ctx.actorId || current.roles.includes("admin"))) {
      plan.problems.push({
        row: r.row,
        column: ctx.columnLabel("active"),
        message:
          current.id === ctx.actorId
            ? "This row would deactivate you, the admin importing the file. Another admin can deactivate you on your person page."
            : `${current.name} is an admin; deactivate an admin on their person page, not by import.`,
      });
      continue;
    }
    const changes: Record<string, FieldChange> = {};
    for (const f of FIELDS) {
      if (!(f in values)) continue;
      const before = current[f] ?? null;
      const after = values[f] ?? null;
      if (before !== after) changes[f] = { before, after };
    }
    const rolesAdded = (r.roles ?? []).filter((role) => !current.roles.includes(role));
    if (Object.keys(changes).length === 0 && rolesAdded.length === 0) plan.unchanged++;
    else plan.changed.push({ row: r.row, personId: current.id, employeeId: r.employeeId, name: current.name, changes, rolesAdded });
  }

  if (ctx.deactivateMissing) {
    for (const p of ctx.people) {
      if (!p.active || !p.employeeId || inFile.has(p.employeeId)) continue;
      if (p.id === ctx.actorId || p.roles.includes("admin")) continue;
      plan.deactivated.push({ personId: p.id, employeeId: p.employeeId, name: p.name });
    }
  }
  return plan;
}

export function planCounts(plan: RosterPlan) {
  return { created: plan.created.length, changed: plan.changed.length, deactivated: plan.deactivated.length, unchanged: plan.unchanged };
}

export function planIsEmpty(plan: RosterPlan): boolean {
  return plan.created.length + plan.changed.length + plan.deactivated.length === 0;
}

/** A stable text of what the plan would write; its hash ties the confirmation to the preview. */
export function planKey(plan: RosterPlan): string {
  return JSON.stringify([plan.created, plan.changed, plan.deactivated]);
}
