/**
 * What an organisation's education office keeps: topics, credential types, regulatory
 * references, exams and checklists. Each `add…` function appends rows to a Dataset and returns
 * the ids the roster and records need.
 */
import { addDays, type IsoDate } from "./calendar";
import { CHECKLISTS } from "./checklists";
import type { ValidityTerms } from "./credential-dates";
import type { Dataset } from "./dataset";

/** What every builder of one organisation shares. */
export type OrgContext = {
  data: Dataset;
  /** Stable id under this organisation's prefix. */
  id: (...parts: (string | number)[]) => string;
  orgId: string;
  today: IsoDate;
  /** The fixed instant used for created/updated timestamps of reference rows. */
  at: Date;
};

/** PRODUCT.md "Main objects": the eight topics. */
export const TOPICS = [
  ["cycle-variables", "Cycle variables"],
  ["trigger-variables", "Trigger variables"],
  ["limit-variables", "Limit variables"],
  ["alarm-reasoning", "Alarm reasoning"],
  ["waveform-reading", "Waveform reading"],
  ["patient-ventilator-asynchrony", "Patient–ventilator asynchrony"],
  ["lung-mechanics", "Lung mechanics"],
  ["modes", "Modes"],
] as const;

export type CredentialTypeCode =
  | "state-licence"
  | "board-credential"
  | "basic-life-support"
  | "advanced-cardiac-life-support"
  | "pediatric-advanced-life-support"
  | "neonatal-resuscitation";

export type CredentialTypeSpec = ValidityTerms & {
  code: CredentialTypeCode;
  name: string;
  category: "licence" | "board" | "life-support" | "other";
  reinstatementMonths?: number;
};

/** Generic names only; rules and their sources: seeds/credential-dates.ts. */
export const CREDENTIAL_TYPES: readonly CredentialTypeSpec[] = [
  { code: "state-licence", name: "State respiratory care licence", category: "licence", rule: { kind: "months-end-of-month", months: 24 } },
  {
    code: "board-credential",
    name: "Respiratory therapy board credential",
    category: "board",
    rule: { kind: "months-end-of-month", months: 60 },
    neverExpiresIfIssuedBefore: "2002-07-01",
    reinstatementMonths: 6,
  },
  { code: "basic-life-support", name: "Basic life support", category: "life-support", rule: { kind: "months-end-of-month", months: 24 } },
  { code: "advanced-cardiac-life-support", name: "Advanced cardiac life support", category: "life-support", rule: { kind: "months-end-of-month", months: 24 } },
  { code: "pediatric-advanced-life-support", name: "Pediatric advanced life support", category: "life-support", rule: { kind: "months-end-of-month", months: 24 } },
  { code: "neonatal-resuscitation", name: "Neonatal resuscitation", category: "life-support", rule: { kind: "months-exact", months: 24 } },
];

export type CredentialTypeRef = { id: string; spec: CredentialTypeSpec };

export function addTopics(ctx: OrgContext): void {
  for (const [slug, name] of TOPICS) {
    ctx.data.topics.push({ id: ctx.id("topic", slug), orgId: ctx.orgId, slug, name, createdAt: ctx.at });
  }
}

export function addCredentialTypes(ctx: OrgContext, specs: readonly CredentialTypeSpec[]): Map<CredentialTypeCode, CredentialTypeRef> {
  const refs = new Map<CredentialTypeCode, CredentialTypeRef>();
  for (const spec of specs) {
    const id = ctx.id("credential-type", spec.code);
    ctx.data.credentialTypes.push({
      id,
      orgId: ctx.orgId,
      code: spec.code,
      name: spec.name,
      category: spec.category,
      rule: spec.rule,
      neverExpiresIfIssuedBefore: spec.neverExpiresIfIssuedBefore ?? null,
      reinstatementMonths: spec.reinstatementMonths ?? null,
      createdAt: ctx.at,
    });
    refs.set(spec.code, { id, spec });
  }
  return refs;
}

export type RegulatoryReferenceSpec = { key: string; code: string; title: string; body: string; verifiedDaysAgo: number };

/** Invented codes and wording: real standards are renumbered, so these are editable rows. */
export const REGULATORY_REFERENCES: readonly RegulatoryReferenceSpec[] = [
  {
    key: "competence",
    code: "Accreditation standard HR-01",
    title: "Competence assessed at hire and periodically",
    body: "Staff competence is assessed, demonstrated and documented during orientation and at the interval the organisation sets — at least yearly for high-risk equipment such as mechanical ventilators.",
    verifiedDaysAgo: 41,
  },
  {
    key: "primary-source",
    code: "Accreditation standard HR-02",
    title: "Licences and certifications verified with the primary source",
    body: "Licences, registrations and certifications required by law or by the organisation are verified with the issuing body at hire and at each renewal, and the verification is recorded.",
    verifiedDaysAgo: 41,
  },
  {
    key: "life-support",
    code: "Accreditation standard HR-05",
    title: "Resuscitation training kept current",
    body: "Staff who work in areas that require it hold current resuscitation training at the level the organisation defines for each area.",
    verifiedDaysAgo: 97,
  },
  {
    key: "state-practice",
    code: "State practice rule RC-4.10",
    title: "A current licence to practise respiratory care",
    body: "No person practises respiratory care without a current licence; an employer confirms the licence before the first shift and keeps it current.",
    verifiedDaysAgo: 160,
  },
];

export function addRegulatoryReferences(ctx: OrgContext, specs: readonly RegulatoryReferenceSpec[]): Map<string, string> {
  const refs = new Map<string, string>();
  for (const spec of specs) {
    const id = ctx.id("regulatory-reference", spec.key);
    ctx.data.regulatoryReferences.push({
      id,
      orgId: ctx.orgId,
      code: spec.code,
      title: spec.title,
      body: spec.body,
      lastVerifiedOn: addDays(ctx.today, -spec.verifiedDaysAgo),
      createdAt: ctx.at,
      updatedAt: ctx.at,
    });
    refs.set(spec.key, id);
  }
  return refs;
}

export type ExamKey = "annual-modes" | "alarms-waveforms";

/** Two published exams; blueprints count items per topic slug (the bank is filled by a later issue). */
export function addExams(ctx: OrgContext, authorId: string): Map<ExamKey, string> {
  const specs: { key: ExamKey; title: string; description: string; topics: Record<string, number>; minutes: number }[] = [
    {
      key: "annual-modes",
      title: "Annual ventilation modes exam",
      description: "Yearly exam on how each mode starts, limits and ends a breath, and what the waveforms show.",
      topics: { "cycle-variables": 4, "trigger-variables": 3, "limit-variables": 3, modes: 6, "waveform-reading": 4 },
      minutes: 30,
    },
    {
      key: "alarms-waveforms",
      title: "Alarm reasoning and waveform exam",
      description: "Orientation exam on working out the cause of an alarm and reading asynchrony from the waveforms.",
      topics: { "alarm-reasoning": 6, "waveform-reading": 4, "patient-ventilator-asynchrony": 5, "lung-mechanics": 5 },
      minutes: 40,
    },
  ];
  const refs = new Map<ExamKey, string>();
  for (const spec of specs) {
    const examId = ctx.id("exam", spec.key);
    const versionId = ctx.id("exam-version", spec.key, 1);
    ctx.data.exams.push({
      id: examId,
      orgId: ctx.orgId,
      title: spec.title,
      status: "published",
      currentVersionId: versionId,
      createdBy: authorId,
      createdAt: ctx.at,
      updatedAt: ctx.at,
    });
    ctx.data.examVersions.push({
      id: versionId,
      orgId: ctx.orgId,
      examId,
      version: 1,
      description: spec.description,
      blueprint: { topics: spec.topics },
      timeLimitMinutes: spec.minutes,
      passMarkPercent: 80,
      attemptsAllowed: 2,
      shuffleItems: true,
      shuffleOptions: true,
      reviewPolicy: "score-and-topics",
      multipleResponseScoring: "all-or-nothing",
      availableFrom: null,
      availableUntil: null,
      publishedAt: ctx.at,
      createdAt: ctx.at,
    });
    refs.set(spec.key, examId);
  }
  return refs;
}

/** The six checklists, each with a published version 1. Returns checklist ids by key. */
export function addChecklists(ctx: OrgContext, authorId: string): Map<string, string> {
  const refs = new Map<string, string>();
  for (const spec of CHECKLISTS) {
    const checklistId = ctx.id("checklist", spec.key);
    const versionId = ctx.id("checklist-version", spec.key, 1);
    ctx.data.checklists.push({
      id: checklistId,
      orgId: ctx.orgId,
      title: spec.title,
      skill: spec.skill,
      status: "published",
      currentVersionId: versionId,
      createdBy: authorId,
      createdAt: ctx.at,
      updatedAt: ctx.at,
    });
    ctx.data.checklistVersions.push({
      id: versionId,
      orgId: ctx.orgId,
      checklistId,
      version: 1,
      method: spec.method,
      steps: spec.steps,
      references: spec.references,
      createdAt: ctx.at,
    });
    refs.set(spec.key, checklistId);
  }
  return refs;
}
