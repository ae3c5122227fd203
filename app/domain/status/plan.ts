/**
 * One person's plan: the requirements that apply to them (by role and unit), their open
 * assignments and the credentials they hold, each with its status, in due-date order.
 * Pure: the caller loads the rows (app/db/queries/plan.server.ts) and passes `today`.
 */
import { addMonths, type IsoDate } from "./calendar-date";
import {
  compareByDate,
  heldStatus,
  outstandingStatus,
  withWaiver,
  type StatusOptions,
  type StatusResult,
  type WaiverSpan,
} from "./index";

export type WorkKind = "exam" | "checklist" | "credential";
export type Recurrence = "at-hire" | "every-12-months" | "every-24-months" | "once";

export type PlanPerson = { roles: readonly string[]; unitIds: readonly string[] };

export type PlanRequirement = {
  id: string;
  name: string;
  kind: WorkKind;
  examId: string | null;
  checklistId: string | null;
  credentialTypeId: string | null;
  recurrence: Recurrence | null;
  /** null: every unit. */
  unitId: string | null;
  /** null: any role. */
  role: string | null;
  active: boolean;
};

export type PlanCredential = {
  id: string;
  credentialTypeId: string;
  typeName: string;
  number: string | null;
  issuer: string | null;
  issuedOn: IsoDate;
  /** Inclusive; null: never expires. */
  validThrough: IsoDate | null;
  verified: boolean;
};

export type PlanAssignment = {
  id: string;
  kind: "exam" | "checklist";
  refId: string | null;
  requirementId: string | null;
  title: string;
  dueOn: IsoDate;
};

/** A passed exam or a check-off signed competent, on the organisation's calendar date. */
export type PlanCompletion = { kind: "exam" | "checklist"; refId: string; completedOn: IsoDate };

export type PlanWaiver = WaiverSpan & { requirementId: string };
export type PlanExtension = { requirementId: string; newDueOn: IsoDate };

export type PlanInput = {
  person: PlanPerson;
  requirements: readonly PlanRequirement[];
  credentials: readonly PlanCredential[];
  assignments: readonly PlanAssignment[];
  completions: readonly PlanCompletion[];
  waivers: readonly PlanWaiver[];
  extensions: readonly PlanExtension[];
};

export type PlanRow = {
  key: string;
  kind: WorkKind;
  title: string;
  /** What the row's date means: a due date for work not done, a valid-through date for what is held. */
  dateMeaning: "due" | "valid-through";
  result: StatusResult;
  /** A due date moved by a manager's extension. */
  extendedTo: IsoDate | null;
  /** For a held credential: the card or licence that counts. */
  credential: Pick<PlanCredential, "number" | "issuer" | "issuedOn" | "verified"> | null;
};

function credentialDetail(c: PlanCredential | undefined): PlanRow["credential"] {
  return c ? { number: c.number, issuer: c.issuer, issuedOn: c.issuedOn, verified: c.verified } : null;
}

/** requirements.unitId null = everyone; role null = any role (app/db/schema/compliance.ts). */
export function requirementApplies(requirement: PlanRequirement, person: PlanPerson): boolean {
  if (!requirement.active) return false;
  if (requirement.unitId !== null && !person.unitIds.includes(requirement.unitId)) return false;
  if (requirement.role !== null && !person.roles.includes(requirement.role)) return false;
  return true;
}

/**
 * Valid-through date of a met exam or check-off requirement: due again on the same date
 * 12 or 24 months later (clamped to the month's end) and still valid on that day; "at hire"
 * and "once" do not recur. Common practice, no source — issue 8's engine refines this.
 */
export function validThroughAfter(completedOn: IsoDate, recurrence: Recurrence | null): IsoDate | null {
  if (recurrence === "every-12-months") return addMonths(completedOn, 12);
  if (recurrence === "every-24-months") return addMonths(completedOn, 24);
  return null;
}

/** The credential that counts for its type: one that never expires, else the latest valid-through. */
export function bestCredential<C extends { validThrough: IsoDate | null; issuedOn: IsoDate }>(held: readonly C[]): C | undefined {
  let best: C | undefined;
  for (const c of held) {
    if (!best) best = c;
    else if (best.validThrough === null) continue;
    else if (c.validThrough === null || c.validThrough > best.validThrough || (c.validThrough === best.validThrough && c.issuedOn > best.issuedOn)) best = c;
  }
  return best;
}

/** The latest of two optional dates. */
function later(a: IsoDate | null, b: IsoDate | null): IsoDate | null {
  if (a === null) return b;
  if (b === null) return a;
  return a > b ? a : b;
}

function groupBy<T>(items: readonly T[], key: (item: T) => string | null): Map<string, T[]> {
  const map = new Map<string, T[]>();
  for (const item of items) {
    const k = key(item);
    if (k === null) continue;
    const list = map.get(k);
    if (list) list.push(item);
    else map.set(k, [item]);
  }
  return map;
}

/**
 * The rows of a person's plan: one per requirement that applies (met by a credential of its
 * type, or a passed exam / signed check-off, or still owed with its assignment's due date),
 * one per open assignment no requirement claimed, and one per credential type held beyond what
 * is required — sorted by date, overdue first.
 */
export function buildPlan(input: PlanInput, options: StatusOptions): PlanRow[] {
  const { today } = options;
  const applying = input.requirements.filter((r) => requirementApplies(r, input.person));
  const credentialsByType = groupBy(input.credentials, (c) => c.credentialTypeId);
  const waiversByRequirement = groupBy(input.waivers, (w) => w.requirementId);
  const extensionByRequirement = new Map<string, IsoDate>();
  for (const e of input.extensions) extensionByRequirement.set(e.requirementId, later(extensionByRequirement.get(e.requirementId) ?? null, e.newDueOn)!);
  const latestCompletion = new Map<string, IsoDate>();
  for (const c of input.completions) {
    const k = `${c.kind}:${c.refId}`;
    latestCompletion.set(k, later(latestCompletion.get(k) ?? null, c.completedOn)!);
  }

  const rows: PlanRow[] = [];
  const usedAssignments = new Set<string>();
  const coveredTypes = new Set<string>();

  for (const req of applying) {
    const waivers = waiversByRequirement.get(req.id) ?? [];
    const extendedTo = extensionByRequirement.get(req.id) ?? null;
    let result: StatusResult;
    let dateMeaning: PlanRow["dateMeaning"];
    let credential: PlanRow["credential"] = null;
    const title = req.name;

    if (req.kind === "credential") {
      if (req.credentialTypeId) coveredTypes.add(req.credentialTypeId);
      const best = bestCredential(credentialsByType.get(req.credentialTypeId ?? "") ?? []);
      if (best) {
        dateMeaning = "valid-through";
        credential = credentialDetail(best);
        // A card's valid-through date is a fact of the card: an extension moves due dates of work, not it.
        result = heldStatus(best.validThrough, options);
      } else {
        dateMeaning = "due";
        result = outstandingStatus(extendedTo, options);
      }
    } else {
      const refId = req.kind === "exam" ? req.examId : req.checklistId;
      const completedOn = refId ? latestCompletion.get(`${req.kind}:${refId}`) : undefined;
      const open = input.assignments
        .filter((a) => !usedAssignments.has(a.id) && (a.requirementId === req.id || (a.requirementId === null && a.kind === req.kind && a.refId === refId)))
        .sort((a, b) => (a.dueOn < b.dueOn ? -1 : 1));
      for (const a of open) usedAssignments.add(a.id);
      const validThrough = completedOn ? validThroughAfter(completedOn, req.recurrence) : null;
      const held = completedOn ? heldStatus(validThrough, options) : null;
      // A lapsed completion with fresh work assigned shows the new due date; otherwise the record.
      if (held && (held.status !== "lapsed" || open.length === 0)) {
        dateMeaning = "valid-through";
        result = held;
      } else {
        dateMeaning = "due";
        result = outstandingStatus(later(open[0]?.dueOn ?? null, extendedTo), options);
      }
    }
    const usedExtension = extendedTo !== null && dateMeaning === "due" ? extendedTo : null;
    rows.push({ key: `requirement:${req.id}`, kind: req.kind, title, dateMeaning, result: withWaiver(result, waivers, today), extendedTo: usedExtension, credential });
  }

  for (const a of input.assignments) {
    if (usedAssignments.has(a.id)) continue;
    const extendedTo = a.requirementId ? (extensionByRequirement.get(a.requirementId) ?? null) : null;
    const waivers = a.requirementId ? (waiversByRequirement.get(a.requirementId) ?? []) : [];
    rows.push({
      key: `assignment:${a.id}`,
      kind: a.kind,
      title: a.title,
      dateMeaning: "due",
      result: withWaiver(outstandingStatus(later(a.dueOn, extendedTo), options), waivers, today),
      extendedTo,
      credential: null,
    });
  }

  // Credentials held beyond what a requirement asks are still the person's record.
  const typeWaivers = waiversForTypes(input.requirements, input.waivers);
  for (const [typeId, held] of credentialsByType) {
    if (coveredTypes.has(typeId)) continue;
    const best = bestCredential(held)!;
    rows.push({
      key: `credential:${best.id}`,
      kind: "credential",
      title: best.typeName,
      dateMeaning: "valid-through",
      result: withWaiver(heldStatus(best.validThrough, options), typeWaivers.get(typeId) ?? [], today),
      extendedTo: null,
      credential: credentialDetail(best),
    });
  }

  return rows.sort((a, b) => compareByDate(a.result, b.result) || a.title.localeCompare(b.title));
}

/** Waivers keyed by the credential type their requirement asks for. */
export function waiversForTypes(
  requirements: readonly Pick<PlanRequirement, "id" | "credentialTypeId">[],
  waivers: readonly PlanWaiver[],
): Map<string, PlanWaiver[]> {
  const typeOf = new Map(requirements.filter((r) => r.credentialTypeId).map((r) => [r.id, r.credentialTypeId!]));
  return groupBy(waivers, (w) => typeOf.get(w.requirementId) ?? null);
}
