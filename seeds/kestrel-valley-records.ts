/**
 * Kestrel Valley's requirements and each person's records: credentials in a realistic mix of
 * current, due soon and lapsed on the demo day, a few waivers, the annual exam and check-off
 * assignments with spread due dates, and the new hires' orientation plans.
 */
import { addDays, addMonths, instantOn, type IsoDate } from "./calendar";
import type { CredentialTypeCode, CredentialTypeRef, ExamKey, OrgContext } from "./catalogue";
import { drawStatus, type DateStatus } from "./credential-dates";
import { addCredential, type CredentialOptions, type CredentialPlan } from "./credential-records";
import { KESTREL_VALLEY, type KvPerson, type KvRoster, type KvUnitKey } from "./kestrel-valley";
import { addSeededCertificates } from "./certificates";
import { addSignedCheckoff } from "./orientation-checkoffs";
import { prngFor, type Prng } from "./prng";
import { addSkillHistory } from "./skill-history";

export type KvCatalogue = {
  references: Map<string, string>;
  types: Map<CredentialTypeCode, CredentialTypeRef>;
  exams: Map<ExamKey, string>;
  checklists: Map<string, string>;
};

/** The annual check-off pairs with the annual modes exam. */
const ANNUAL_CHECKLIST = "vc-to-apc";

type RequirementKey = "annual-exam" | "annual-checkoff" | CredentialTypeCode;
type RequirementSpec = {
  key: RequirementKey;
  name: string;
  unit?: KvUnitKey;
  reference: string;
  lapseLeaves: "supervised" | "not-cleared";
} & ({ kind: "credential" } | { kind: "exam" | "checklist" });

/** Every requirement applies to the therapist role; unit ones to therapists whose home unit it is. */
const REQUIREMENTS: readonly RequirementSpec[] = [
  { key: "state-licence", kind: "credential", name: "State respiratory care licence", reference: "state-practice", lapseLeaves: "not-cleared" },
  { key: "board-credential", kind: "credential", name: "Respiratory therapy board credential", reference: "primary-source", lapseLeaves: "not-cleared" },
  { key: "basic-life-support", kind: "credential", name: "Basic life support", reference: "life-support", lapseLeaves: "not-cleared" },
  { key: "annual-exam", kind: "exam", name: "Annual ventilation modes exam", reference: "competence", lapseLeaves: "supervised" },
  { key: "annual-checkoff", kind: "checklist", name: "Annual check-off: volume control to adaptive pressure control", reference: "competence", lapseLeaves: "supervised" },
  { key: "advanced-cardiac-life-support", kind: "credential", unit: "adult-icu", name: "Advanced cardiac life support (Adult ICU)", reference: "life-support", lapseLeaves: "supervised" },
  { key: "neonatal-resuscitation", kind: "credential", unit: "neonatal-icu", name: "Neonatal resuscitation (Neonatal ICU)", reference: "life-support", lapseLeaves: "supervised" },
  { key: "pediatric-advanced-life-support", kind: "credential", unit: "neonatal-icu", name: "Pediatric advanced life support (Neonatal ICU)", reference: "life-support", lapseLeaves: "supervised" },
];

function addRequirements(ctx: OrgContext, roster: KvRoster, cat: KvCatalogue): Map<RequirementKey, string> {
  const ids = new Map<RequirementKey, string>();
  for (const spec of REQUIREMENTS) {
    const id = ctx.id("requirement", spec.key);
    const isCredential = spec.kind === "credential";
    ctx.data.requirements.push({
      id,
      orgId: ctx.orgId,
      name: spec.name,
      kind: spec.kind,
      examId: spec.kind === "exam" ? cat.exams.get("annual-modes") : null,
      checklistId: spec.kind === "checklist" ? cat.checklists.get(ANNUAL_CHECKLIST) : null,
      credentialTypeId: isCredential ? cat.types.get(spec.key as CredentialTypeCode)?.id : null,
      recurrence: isCredential ? null : "every-12-months",
      graceDays: 0,
      unitId: spec.unit ? roster.units[spec.unit] : null,
      role: "therapist",
      regulatoryReferenceId: cat.references.get(spec.reference) ?? null,
      lapseLeaves: spec.lapseLeaves,
      active: true,
      createdAt: ctx.at,
      updatedAt: ctx.at,
    });
    ids.set(spec.key, id);
  }
  return ids;
}

/** Cards held for work on each unit: the required ones, plus those Emergency staff keep anyway. */
const CARDS_BY_UNIT: Record<KvUnitKey, readonly CredentialTypeCode[]> = {
  "adult-icu": ["advanced-cardiac-life-support"],
  "neonatal-icu": ["neonatal-resuscitation", "pediatric-advanced-life-support"],
  emergency: ["advanced-cardiac-life-support", "pediatric-advanced-life-support"],
  "adult-floors": [],
};

/** Chance of lapsed and of due soon, by category (the rest current). Invented for the demo. */
const STATUS_ODDS: Record<CredentialTypeRef["spec"]["category"], [number, number]> = {
  licence: [0.03, 0.1],
  board: [0.02, 0.06],
  "life-support": [0.08, 0.15],
  other: [0.05, 0.1],
};

type Forced = Partial<Record<CredentialTypeCode, DateStatus>>;

function addCredentials(ctx: OrgContext, roster: KvRoster, cat: KvCatalogue, forced: Map<string, Forced>): void {
  const issuers: CredentialOptions["issuers"] = {
    licence: "State respiratory care board",
    board: "National respiratory therapy credentialing board",
    "life-support": "Kestrel Valley Simulation Center",
    other: "Kestrel Valley Medical Center",
  };
  const manager = roster.demo.manager;
  const newHireIds = new Set(roster.newHires.map((p) => p.id));
  const unitKeyOf = new Map(Object.entries(roster.units).map(([key, id]) => [id, key as KvUnitKey]));
  const holders: KvPerson[] = [...roster.therapists, manager];
  for (const person of holders) {
    const prng = prngFor(`kv:credentials:${person.key}`);
    // Unit requirements follow every unit a person works on (home unit and member units), as My plan does.
    const worksOn = [person.unit, ...(person.memberOf ?? []).map((id) => unitKeyOf.get(id)).filter((k): k is KvUnitKey => k !== undefined)];
    const codes = new Set<CredentialTypeCode>(["state-licence", "board-credential"]);
    if (person.roles.includes("therapist")) for (const code of ["basic-life-support", ...worksOn.flatMap((u) => CARDS_BY_UNIT[u])] as const) codes.add(code);
    for (const code of codes) {
      const type = cat.types.get(code);
      if (!type) throw new Error(`no credential type ${code}`);
      const [lapsed, dueSoon] = STATUS_ODDS[type.spec.category];
      const drawn = drawStatus(prng, lapsed, dueSoon);
      const status = forced.get(person.id)?.[code] ?? (newHireIds.has(person.id) ? "current" : drawn);
      let plan: CredentialPlan = { status };
      // A board credential earned before 2002-07-01 never expires (NBRC, "Credential Maintenance").
      if (code === "board-credential" && person.hireDate < "2002-07-01" && prng.chance(0.8)) {
        plan = { issuedOn: addMonths(person.hireDate, -prng.int(2, 10)) };
      }
      // Some cards were uploaded recently and wait for the manager; one new hire's card always does.
      const awaiting = (!forced.has(person.id) && status !== "lapsed" && prng.chance(0.06)) || (person.id === roster.newHires[0]?.id && code === "basic-life-support");
      addCredential(ctx, person, type, plan, prng, { issuers, verifier: awaiting ? null : manager.id });
    }
  }
}

type Due = { exam: IsoDate; checkoff: IsoDate };

/** Annual work spread over the year: ~8 % overdue, ~25 % due within 90 days, the rest later. */
function spreadDue(today: IsoDate, prng: Prng): Due {
  const r = prng.next();
  const offset = r < 0.08 ? -prng.int(3, 45) : r < 0.33 ? prng.int(0, 90) : prng.int(91, 360);
  const exam = addDays(today, offset);
  return { exam, checkoff: addDays(exam, prng.int(7, 30)) };
}

function addAssignments(ctx: OrgContext, roster: KvRoster, cat: KvCatalogue, reqs: Map<RequirementKey, string>, fixed: Map<string, Due>): void {
  const examId = cat.exams.get("annual-modes");
  const checklistId = cat.checklists.get(ANNUAL_CHECKLIST);
  for (const person of roster.therapists) {
    const due = fixed.get(person.id) ?? spreadDue(ctx.today, prngFor(`kv:assignments:${person.key}`));
    const common = { orgId: ctx.orgId, personId: person.id, viaUnitId: null, viaRole: "therapist", status: "open" as const, completedAt: null, assignedBy: roster.demo.educator.id };
    const assignedAt = (dueOn: IsoDate) => instantOn([addDays(dueOn, -90), ctx.today].sort()[0]);
    ctx.data.assignments.push(
      { ...common, id: ctx.id("assignment", person.key, "annual-exam"), kind: "exam", examId, checklistId: null, requirementId: reqs.get("annual-exam"), dueOn: due.exam, createdAt: assignedAt(due.exam) },
      { ...common, id: ctx.id("assignment", person.key, "annual-checkoff"), kind: "checklist", examId: null, checklistId, requirementId: reqs.get("annual-checkoff"), dueOn: due.checkoff, createdAt: assignedAt(due.checkoff) },
    );
  }
}

const ORIENTATION: readonly { day: number; kind: "exam" | "checklist" | "other"; ref?: string; title: string }[] = [
  { day: 3, kind: "other", title: "Department orientation: policies, documentation and the ventilator fleet" },
  { day: 7, kind: "other", title: "Equipment walk-through with the preceptor" },
  { day: 14, kind: "checklist", ref: "ventilator-setup", title: "Ventilator set-up and pre-use check" },
  { day: 21, kind: "checklist", ref: "circuit-change", title: "Circuit change" },
  { day: 28, kind: "exam", ref: "alarms-waveforms", title: "Alarm reasoning and waveform exam" },
  { day: 35, kind: "checklist", ref: "inline-suction", title: "In-line suctioning" },
  { day: 49, kind: "checklist", ref: "high-pressure-alarm", title: "Responding to a high-pressure alarm" },
  { day: 63, kind: "checklist", ref: "flow-starvation", title: "Recognising and correcting flow starvation" },
  { day: 77, kind: "checklist", ref: ANNUAL_CHECKLIST, title: "Changing from volume control to adaptive pressure control" },
  { day: 84, kind: "exam", ref: "annual-modes", title: "Annual ventilation modes exam" },
];
export const ORIENTATION_DAYS = 84;

function addOrientationPlans(ctx: OrgContext, roster: KvRoster, cat: KvCatalogue): void {
  const others = roster.preceptors.slice(1);
  roster.newHires.forEach((hire, k) => {
    // The demo preceptor follows the first two orientees; others go to a preceptor on their unit.
    const sameUnit = others.filter((p) => p.unit === hire.unit);
    const preceptor = k < 2 || others.length === 0 ? roster.demo.preceptor : (sameUnit[k % Math.max(1, sameUnit.length)] ?? others[k % others.length]);
    const planId = ctx.id("orientation-plan", hire.key);
    ctx.data.orientationPlans.push({
      id: planId,
      orgId: ctx.orgId,
      personId: hire.id,
      preceptorId: preceptor.id,
      startsOn: hire.hireDate,
      endsOn: addDays(hire.hireDate, ORIENTATION_DAYS),
      status: "active",
      createdAt: instantOn(hire.hireDate),
    });
    ORIENTATION.forEach((item, position) => {
      const dueOn = addDays(hire.hireDate, item.day);
      ctx.data.orientationPlanItems.push({
        id: ctx.id("orientation-plan-item", hire.key, position),
        orgId: ctx.orgId,
        planId,
        position,
        kind: item.kind,
        examId: item.kind === "exam" ? cat.exams.get(item.ref as ExamKey) : null,
        checklistId: item.kind === "checklist" ? cat.checklists.get(item.ref ?? "") : null,
        title: item.title,
        dueOn,
        // Talks and walk-throughs are ticked off; a check-off part is done through its signed check-off below.
        completedAt: item.kind === "other" && dueOn < ctx.today ? instantOn(dueOn, 240) : null,
      });
      if (item.kind === "checklist" && item.ref && dueOn < ctx.today) {
        addSignedCheckoff(ctx, { hire, preceptor, checklistKey: item.ref, on: dueOn, timeZone: KESTREL_VALLEY.timeZone });
      }
    });
  });
}

const WAIVER_REASONS = {
  acls: "Renewal class was cancelled by the training site; rebooked for the next available date.",
  exam: "On approved leave; the exam is rescheduled for the first month after return.",
  checkoff: "Modified duty after an injury: no bedside ventilator work until occupational health clears return.",
} as const;

/** Builds every record. The demo accounts' records are fixed so each demo shows the same story. */
export function addKvRecords(ctx: OrgContext, roster: KvRoster, cat: KvCatalogue): void {
  const reqs = addRequirements(ctx, roster, cat);
  const t = ctx.today;
  const { therapist, preceptor, educator } = roster.demo;
  const forced = new Map<string, Forced>([
    [therapist.id, { "state-licence": "current", "board-credential": "current", "basic-life-support": "due-soon", "advanced-cardiac-life-support": "current" }],
    [preceptor.id, { "state-licence": "current", "board-credential": "current", "basic-life-support": "current", "neonatal-resuscitation": "current", "pediatric-advanced-life-support": "due-soon" }],
    [educator.id, { "state-licence": "current", "board-credential": "current", "basic-life-support": "current", "advanced-cardiac-life-support": "current" }],
  ]);
  // Two Adult ICU staff have a lapsed advanced cardiac life support card; the second has a waiver.
  const icuStaff = roster.staff.filter((p) => p.unit === "adult-icu");
  for (const p of icuStaff.slice(0, 2)) forced.set(p.id, { "advanced-cardiac-life-support": "lapsed" });
  addCredentials(ctx, roster, cat, forced);

  const fixed = new Map<string, Due>([
    [therapist.id, { exam: addDays(t, 21), checkoff: addDays(t, -9) }],
    [preceptor.id, { exam: addDays(t, 64), checkoff: addDays(t, 78) }],
    [educator.id, { exam: addDays(t, 150), checkoff: addDays(t, 170) }],
  ]);
  for (const hire of roster.newHires) {
    const end = addDays(hire.hireDate, ORIENTATION_DAYS);
    fixed.set(hire.id, { exam: end, checkoff: end });
  }
  addAssignments(ctx, roster, cat, reqs, fixed);

  const waive = (person: KvPerson, key: RequirementKey, reason: string, days: number) => {
    const requirementId = reqs.get(key);
    if (!requirementId) throw new Error(`no requirement ${key}`);
    ctx.data.waivers.push({
      id: ctx.id("waiver", person.key, key),
      orgId: ctx.orgId,
      personId: person.id,
      requirementId,
      reason,
      endsOn: addDays(t, days),
      grantedBy: roster.demo.manager.id,
      revokedAt: null,
      createdAt: instantOn(addDays(t, -6)),
    });
  };
  if (icuStaff[1]) waive(icuStaff[1], "advanced-cardiac-life-support", WAIVER_REASONS.acls, 30);
  roster.staff.forEach((p, i) => {
    if (i % 14 !== 3) return;
    if (Math.floor(i / 14) % 2 === 0) waive(p, "annual-exam", WAIVER_REASONS.exam, 60);
    else waive(p, "annual-checkoff", WAIVER_REASONS.checkoff, 45);
  });
  addOrientationPlans(ctx, roster, cat);
  // The demo therapist's refresher check-off of a skill outside the requirements, signed competent
  // by the demo preceptor six weeks ago: so the demo therapist has a certificate to download.
  addSignedCheckoff(ctx, { hire: therapist, preceptor, checklistKey: "high-pressure-alarm", on: addDays(t, -40), timeZone: KESTREL_VALLEY.timeZone });
  // Staff's past check-offs of the skills no requirement renews (the Clearance board's variety).
  addSkillHistory(ctx, roster, KESTREL_VALLEY.timeZone);
  addSeededCertificates(ctx, KESTREL_VALLEY.timeZone);
}
