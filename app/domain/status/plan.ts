/**
 * One person's plan: the requirements that apply to them (by role and unit), their open
 * assignments and the credentials they hold, each with its status, in due-date order.
 * Pure: the caller loads the rows (app/db/queries/plan.server.ts) and passes `today`.
 */
import { addMonths, daysBetween, type IsoDate } from "./calendar-date";
import { assessOn, type AssessInput, type Evidence } from "./engine";
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
  /** Days after valid-through that still count as Due soon (issue 8 §4); 0 when absent. */
  graceDays?: number;
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

export type PlanWaiver = WaiverSpan & { requirementId: string; id?: string; reason?: string; grantedBy?: string | null };
export type PlanExtension = { requirementId: string; newDueOn: IsoDate; id?: string; reason?: string; grantedBy?: string | null };

/** What the person should do next for a row (issue 8 §5). */
export type NextStep = "take-exam" | "ask-for-checkoff" | "upload-card" | "upload-renewed-card" | "await-verification" | "none";

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
  /** The requirement this row answers, when it answers one. */
  requirementId?: string | null;
  /** The credential type a credential row is about (to pre-fill "upload a renewed card"). */
  credentialTypeId?: string | null;
  /** The first day the status changes on its own, and to what (status engine). */
  nextChangeOn?: IsoDate | null;
  nextStatus?: StatusResult["status"] | null;
  nextStep?: NextStep;
  evidence?: Evidence[];
};

/**
 * What to do next: work not done → take the exam / ask for a check-off; a card missing → upload
 * it; a card lapsed or due soon → upload the renewed one; a card on file but not verified →
 * wait for the manager. Current and waived rows need nothing.
 */
export function nextStepFor(kind: WorkKind, status: StatusResult["status"], credential: PlanRow["credential"]): NextStep {
  if (status === "current" || status === "waived") return credential && !credential.verified ? "await-verification" : "none";
  if (kind === "exam") return "take-exam";
  if (kind === "checklist") return "ask-for-checkoff";
  if (!credential) return "upload-card";
  return "upload-renewed-card";
}

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

// `a.localeCompare(b)` builds a collator on every call (ECMA-402: the same as
// `new Intl.Collator(undefined, undefined).compare`); the Team matrix sorts 2,000 plans, so one is kept.
const byTitle = new Intl.Collator().compare;
const NONE: readonly never[] = Object.freeze([]);

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
 *
 * `requirementsOnly`: just the rows answering requirements, in the requirements' order, unsorted
 * — the same rows, for the Team matrix (one cell per requirement, 2,000 plans per assessment).
 */
export function buildPlan(input: PlanInput, options: StatusOptions, shape: { requirementsOnly?: boolean } = {}): PlanRow[] {
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
    let credential: PlanRow["credential"] = null;
    const title = req.name;

    // Most cells have no waiver, extension or open assignment: they share one empty list.
    const engineWaivers =
      waivers.length === 0 ? NONE : waivers.map((w, i) => ({ id: w.id ?? `waiver-${i}`, reason: w.reason ?? "", endsOn: w.endsOn, grantedBy: w.grantedBy ?? null, revoked: w.revoked }));
    const engineExtensions =
      input.extensions.length === 0
        ? NONE
        : input.extensions
            .filter((e) => e.requirementId === req.id)
            .map((e, i) => ({ id: e.id ?? `extension-${i}`, reason: e.reason ?? "", newDueOn: e.newDueOn, grantedBy: e.grantedBy ?? null }));
    // Every input is built with the same fields in the same order (no object spread): V8 then keeps
    // one shape for 80,000 cells of the Team matrix, measured several times faster.
    const graceDays = req.graceDays ?? 0;
    const inputOf = (held: AssessInput["held"], dueOn: IsoDate | null, dueEvidence: Evidence | null = null): AssessInput => ({
      graceDays,
      waivers: engineWaivers,
      extensions: engineExtensions,
      held,
      dueOn,
      dueEvidence,
    });
    let assessInput: AssessInput;

    if (req.kind === "credential") {
      if (req.credentialTypeId) coveredTypes.add(req.credentialTypeId);
      const best = bestCredential(credentialsByType.get(req.credentialTypeId ?? "") ?? []);
      if (best) {
        credential = credentialDetail(best);
        assessInput = inputOf({ validThrough: best.validThrough, evidence: { kind: "credential", id: best.id, typeName: best.typeName, number: best.number, issuer: best.issuer, issuedOn: best.issuedOn, validThrough: best.validThrough, verified: best.verified } }, null);
      } else {
        assessInput = inputOf(null, null);
      }
    } else {
      const refId = req.kind === "exam" ? req.examId : req.checklistId;
      const completedOn = refId ? latestCompletion.get(`${req.kind}:${refId}`) : undefined;
      const open: readonly PlanAssignment[] =
        input.assignments.length === 0
          ? NONE
          : input.assignments
        .filter((a) => !usedAssignments.has(a.id) && (a.requirementId === req.id || (a.requirementId === null && a.kind === req.kind && a.refId === refId)))
        .sort((a, b) => (a.dueOn < b.dueOn ? -1 : 1));
      for (const a of open) usedAssignments.add(a.id);
      const validThrough = completedOn ? validThroughAfter(completedOn, req.recurrence) : null;
      const heldInput: AssessInput | null =
        completedOn && refId
          ? inputOf({ validThrough, evidence: { kind: "completion", of: req.kind, refId, completedOn, validThrough } }, null)
          : null;
      // A lapsed completion with fresh work assigned shows the new due date; otherwise the record.
      if (heldInput && (assessOn(heldInput, today, options.reminderDays).status !== "lapsed" || open.length === 0)) {
        assessInput = heldInput;
        // The row shows the record, not a due date: work assigned without naming this requirement
        // (an educator's ad-hoc exam assignment) would vanish from the plan and Today, so it keeps its own row.
        for (const a of open) if (a.requirementId === null) usedAssignments.delete(a.id);
      } else {
        const first = open[0];
        assessInput = inputOf(null, first?.dueOn ?? null, first ? { kind: "assignment", id: first.id, dueOn: first.dueOn } : null);
      }
    }
    const a = assessOn(assessInput, today, options.reminderDays);
    const dateMeaning = a.dateMeaning;
    // The date judged: an extension in force replaces a due date; a card keeps its own date.
    const date = dateMeaning === "due" ? later(a.date, a.extendedTo) : a.date;
    const daysLeft = date === null ? null : daysBetween(today, date);
    const result: StatusResult = {
      status: a.status,
      date,
      daysLeft,
      daysLapsed: a.status === "lapsed" && daysLeft !== null ? -daysLeft : null,
      ...(a.waivedThrough ? { waivedThrough: a.waivedThrough } : {}),
    };
    rows.push({
      key: `requirement:${req.id}`,
      kind: req.kind,
      title,
      dateMeaning,
      result,
      extendedTo: a.extendedTo,
      credential,
      requirementId: req.id,
      credentialTypeId: req.credentialTypeId,
      nextChangeOn: a.nextChangeOn,
      nextStatus: a.nextStatus,
      nextStep: nextStepFor(req.kind, a.status, credential),
      evidence: a.evidence,
    });
  }

  if (shape.requirementsOnly) return rows;

  for (const a of input.assignments) {
    if (usedAssignments.has(a.id)) continue;
    const extendedTo = a.requirementId ? (extensionByRequirement.get(a.requirementId) ?? null) : null;
    const waivers = a.requirementId ? (waiversByRequirement.get(a.requirementId) ?? []) : [];
    const result = withWaiver(outstandingStatus(later(a.dueOn, extendedTo), options), waivers, today);
    rows.push({
      key: `assignment:${a.id}`,
      kind: a.kind,
      title: a.title,
      dateMeaning: "due",
      result,
      extendedTo,
      credential: null,
      requirementId: a.requirementId,
      nextStep: nextStepFor(a.kind, result.status, null),
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
      credentialTypeId: typeId,
    });
    const last = rows[rows.length - 1]!;
    last.nextStep = nextStepFor("credential", last.result.status, last.credential);
  }

  return rows.sort((a, b) => compareByDate(a.result, b.result) || byTitle(a.title, b.title));
}

/** Waivers keyed by the credential type their requirement asks for. */
export function waiversForTypes(
  requirements: readonly Pick<PlanRequirement, "id" | "credentialTypeId">[],
  waivers: readonly PlanWaiver[],
): Map<string, PlanWaiver[]> {
  const typeOf = new Map(requirements.filter((r) => r.credentialTypeId).map((r) => [r.id, r.credentialTypeId!]));
  return groupBy(waivers, (w) => typeOf.get(w.requirementId) ?? null);
}
