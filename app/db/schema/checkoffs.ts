import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { calendarDate, createdAt, id, instant, updatedAt } from "./columns";
import { files } from "./auth";
import { organisations, people } from "./core";

export const CHECKLIST_METHODS = [
  "direct-observation",
  "return-demonstration",
  "simulation",
  "case-study",
  "written-or-online-test",
  "peer-review",
  "verbal-review",
  "evidence-of-daily-work",
] as const;

export const STEP_RESULTS = ["met", "not-met", "not-applicable"] as const;

/** A skills check-off template. Its skill is what the Clearance board shows. */
export const checklists = sqliteTable(
  "checklists",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    title: text("title").notNull(),
    /** The skill this checklist clears on the Clearance board. */
    skill: text("skill").notNull(),
    status: text("status", { enum: ["draft", "published", "retired"] }).notNull().default("draft"),
    currentVersionId: text("current_version_id"),
    createdBy: text("created_by").references(() => people.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("checklists_org").on(t.orgId)],
);

export type ChecklistStep = { text: string; critical: boolean };

export const checklistVersions = sqliteTable(
  "checklist_versions",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    checklistId: text("checklist_id").notNull().references(() => checklists.id),
    version: integer("version").notNull(),
    method: text("method", { enum: CHECKLIST_METHODS }).notNull(),
    steps: text("steps", { mode: "json" }).$type<ChecklistStep[]>().notNull(),
    references: text("references").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("checklist_versions_version").on(t.checklistId, t.version)],
);

export const checkoffs = sqliteTable(
  "checkoffs",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    /** The therapist observed. */
    personId: text("person_id").notNull().references(() => people.id),
    checklistVersionId: text("checklist_version_id").notNull().references(() => checklistVersions.id),
    preceptorId: text("preceptor_id").references(() => people.id),
    assignmentId: text("assignment_id"),
    status: text("status", { enum: ["requested", "in-progress", "signed", "acknowledged", "cancelled"] })
      .notNull()
      .default("requested"),
    outcome: text("outcome", { enum: ["competent", "needs-practice"] }),
    practicePlan: text("practice_plan"),
    practiceBy: calendarDate("practice_by"),
    /** SHA-256 of the signed content; a signature binds to this. */
    contentHash: text("content_hash"),
    startedAt: instant("started_at"),
    signedAt: instant("signed_at"),
    acknowledgedAt: instant("acknowledged_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("checkoffs_person").on(t.personId), index("checkoffs_org").on(t.orgId)],
);

export const checkoffStepResults = sqliteTable(
  "checkoff_step_results",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    checkoffId: text("checkoff_id").notNull().references(() => checkoffs.id),
    stepIndex: integer("step_index").notNull(),
    result: text("result", { enum: STEP_RESULTS }).notNull(),
    comment: text("comment"),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("checkoff_step_results_step").on(t.checkoffId, t.stepIndex)],
);

/**
 * An electronic signature (design reference: 21 CFR Part 11 §11.50, §11.70): printed name,
 * date and time, meaning, and a hash of the signed content binding it to its record.
 */
export const signatures = sqliteTable(
  "signatures",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    signerId: text("signer_id").notNull().references(() => people.id),
    recordType: text("record_type", { enum: ["checkoff", "addendum", "certificate"] }).notNull(),
    recordId: text("record_id").notNull(),
    meaning: text("meaning").notNull(),
    printedName: text("printed_name").notNull(),
    credentialLetters: text("credential_letters"),
    signedAt: instant("signed_at").notNull(),
    timeZone: text("time_zone").notNull(),
    contentHash: text("content_hash").notNull(),
    method: text("method", { enum: ["own-session", "shared-device"] }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("signatures_record").on(t.recordType, t.recordId)],
);

/** A signed record is never edited: corrections are addenda. */
export const addenda = sqliteTable("addenda", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  recordType: text("record_type").notNull(),
  recordId: text("record_id").notNull(),
  authorId: text("author_id").notNull().references(() => people.id),
  text: text("text").notNull(),
  createdAt: createdAt(),
});

/**
 * Evidence attached to a check-off (a photo or PDF, e.g. a paper check-off from before Tidemark).
 * The bytes live in `files`; this row says which check-off they belong to, so they are served
 * only to people who may see that check-off.
 */
export const checkoffEvidence = sqliteTable(
  "checkoff_evidence",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    checkoffId: text("checkoff_id").notNull().references(() => checkoffs.id),
    fileId: text("file_id").notNull().references(() => files.id),
    uploadedBy: text("uploaded_by").notNull().references(() => people.id),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [index("checkoff_evidence_checkoff").on(t.checkoffId)],
);

export const orientationPlans = sqliteTable("orientation_plans", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  personId: text("person_id").notNull().references(() => people.id),
  preceptorId: text("preceptor_id").references(() => people.id),
  startsOn: calendarDate("starts_on").notNull(),
  endsOn: calendarDate("ends_on").notNull(),
  status: text("status", { enum: ["active", "completed", "cancelled"] }).notNull().default("active"),
  createdAt: createdAt(),
});

export const orientationPlanItems = sqliteTable("orientation_plan_items", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  planId: text("plan_id").notNull().references(() => orientationPlans.id),
  position: integer("position").notNull(),
  kind: text("kind", { enum: ["exam", "checklist", "other"] }).notNull(),
  examId: text("exam_id"),
  checklistId: text("checklist_id").references(() => checklists.id),
  title: text("title").notNull(),
  dueOn: calendarDate("due_on"),
  completedAt: instant("completed_at"),
});

export type Checklist = typeof checklists.$inferSelect;
export type Checkoff = typeof checkoffs.$inferSelect;
export type Signature = typeof signatures.$inferSelect;
export type CheckoffEvidence = typeof checkoffEvidence.$inferSelect;
export type Addendum = typeof addenda.$inferSelect;
