import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { calendarDate, createdAt, id, instant, updatedAt } from "./columns";
import { checklists } from "./checkoffs";
import { organisations, people, units } from "./core";
import { itemVersions } from "./bank";

export const REVIEW_POLICIES = ["score-only", "score-and-topics", "full-rationale"] as const;

export const exams = sqliteTable(
  "exams",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    title: text("title").notNull(),
    status: text("status", { enum: ["draft", "published", "retired"] }).notNull().default("draft"),
    currentVersionId: text("current_version_id"),
    createdBy: text("created_by").references(() => people.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("exams_org").on(t.orgId)],
);

export const examVersions = sqliteTable(
  "exam_versions",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    examId: text("exam_id").notNull().references(() => exams.id),
    version: integer("version").notNull(),
    description: text("description"),
    /** Blueprint: topic → count, difficulty mix, fixed items. JSON. */
    blueprint: text("blueprint", { mode: "json" }).notNull(),
    timeLimitMinutes: integer("time_limit_minutes"),
    passMarkPercent: real("pass_mark_percent").notNull(),
    attemptsAllowed: integer("attempts_allowed").notNull().default(2),
    shuffleItems: integer("shuffle_items", { mode: "boolean" }).notNull().default(true),
    shuffleOptions: integer("shuffle_options", { mode: "boolean" }).notNull().default(true),
    reviewPolicy: text("review_policy", { enum: REVIEW_POLICIES }).notNull().default("score-and-topics"),
    multipleResponseScoring: text("multiple_response_scoring", { enum: ["all-or-nothing", "partial"] })
      .notNull()
      .default("all-or-nothing"),
    orderingScoring: text("ordering_scoring", { enum: ["exact", "partial"] }).notNull().default("exact"),
    availableFrom: calendarDate("available_from"),
    availableUntil: calendarDate("available_until"),
    publishedAt: instant("published_at"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("exam_versions_exam_version").on(t.examId, t.version)],
);

/** Work given to a person: an exam to take or a checklist to be observed, with a due date. */
export const assignments = sqliteTable(
  "assignments",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    kind: text("kind", { enum: ["exam", "checklist"] }).notNull(),
    examId: text("exam_id").references(() => exams.id),
    checklistId: text("checklist_id").references(() => checklists.id),
    requirementId: text("requirement_id"),
    /** How it was assigned: to the person, a unit, or a role. */
    viaUnitId: text("via_unit_id").references(() => units.id),
    viaRole: text("via_role"),
    dueOn: calendarDate("due_on").notNull(),
    status: text("status", { enum: ["open", "completed", "cancelled"] }).notNull().default("open"),
    completedAt: instant("completed_at"),
    assignedBy: text("assigned_by").references(() => people.id),
    createdAt: createdAt(),
  },
  (t) => [index("assignments_person").on(t.personId), index("assignments_org").on(t.orgId)],
);

export const attempts = sqliteTable(
  "attempts",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    examVersionId: text("exam_version_id").notNull().references(() => examVersions.id),
    assignmentId: text("assignment_id").references(() => assignments.id),
    /** Seed for the drawn form, shuffles and scenario items: replays exactly. */
    seed: integer("seed").notNull(),
    /** 1 for the first sitting of this exam in the person's current cycle (since the exam was last assigned to them), 2 for the second… */
    attemptNumber: integer("attempt_number").notNull().default(1),
    /** The drawn items in order, with their item-version ids. JSON. */
    form: text("form", { mode: "json" }).notNull(),
    startedAt: instant("started_at").notNull(),
    /** Server-held deadline; null for an untimed sitting. */
    deadlineAt: instant("deadline_at"),
    /** The time this sitting was given, after any accommodation (null = untimed), and why. */
    allowedSeconds: integer("allowed_seconds"),
    accommodationId: text("accommodation_id"),
    /** The therapist's choice: one item at a time or all on one page. */
    layout: text("layout", { enum: ["one", "all"] }).notNull().default("one"),
    /** Where the therapist was (item position), so a resumed attempt opens there. */
    lastPosition: integer("last_position").notNull().default(0),
    submittedAt: instant("submitted_at"),
    closedReason: text("closed_reason", { enum: ["submitted", "deadline"] }),
    rawScore: real("raw_score"),
    maxScore: real("max_score"),
    scorePercent: real("score_percent"),
    passed: integer("passed", { mode: "boolean" }),
    /** Per-topic subscores at grading. JSON. */
    subscores: text("subscores", { mode: "json" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("attempts_person").on(t.personId),
    index("attempts_exam_version").on(t.examVersionId),
    index("attempts_open_deadline").on(t.submittedAt, t.deadlineAt),
  ],
);

export const responses = sqliteTable(
  "responses",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    attemptId: text("attempt_id").notNull().references(() => attempts.id),
    itemVersionId: text("item_version_id").notNull().references(() => itemVersions.id),
    position: integer("position").notNull(),
    answer: text("answer", { mode: "json" }),
    flagged: integer("flagged", { mode: "boolean" }).notNull().default(false),
    score: real("score"),
    savedAt: instant("saved_at").notNull(),
  },
  (t) => [uniqueIndex("responses_attempt_position").on(t.attemptId, t.position)],
);

/** WCAG 2.2.1 Timing Adjustable: extra time or an untimed sitting, with a reason. */
export const accommodations = sqliteTable("accommodations", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  personId: text("person_id").notNull().references(() => people.id),
  kind: text("kind", { enum: ["multiplier", "untimed"] }).notNull(),
  multiplier: real("multiplier"),
  reason: text("reason").notNull(),
  endsOn: calendarDate("ends_on"),
  grantedBy: text("granted_by").references(() => people.id),
  revokedAt: instant("revoked_at"),
  revokedBy: text("revoked_by").references(() => people.id),
  createdAt: createdAt(),
});

/**
 * Things that happened which other work acts on later, e.g. "attempt.passed" → a certificate.
 * A consumer marks a row processed in the same transaction as the work it did.
 */
export const domainEvents = sqliteTable(
  "domain_events",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    kind: text("kind", { enum: ["attempt.passed", "checkoff.signed"] }).notNull(),
    subjectId: text("subject_id").notNull(),
    personId: text("person_id").references(() => people.id),
    payload: text("payload", { mode: "json" }),
    processedAt: instant("processed_at"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("domain_events_once").on(t.kind, t.subjectId), index("domain_events_pending").on(t.processedAt)],
);

export type Exam = typeof exams.$inferSelect;
export type Assignment = typeof assignments.$inferSelect;
export type Attempt = typeof attempts.$inferSelect;
export type ExamVersion = typeof examVersions.$inferSelect;
export type Accommodation = typeof accommodations.$inferSelect;

/**
 * A modified Angoff panel (Livingston & Zieky, "Passing Scores", ETS 1982): each educator's
 * estimate, per item, of the chance that a minimally competent therapist answers it correctly.
 * Round 1 is rated blind; round 2 optionally after seeing the item statistics.
 */
export const angoffRatings = sqliteTable(
  "angoff_ratings",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    examId: text("exam_id").notNull().references(() => exams.id),
    judgeId: text("judge_id").notNull().references(() => people.id),
    itemId: text("item_id").notNull(),
    round: integer("round").notNull().default(1),
    /** Between 0 and 1. */
    rating: real("rating").notNull(),
    updatedAt: updatedAt(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("angoff_ratings_once").on(t.examId, t.judgeId, t.itemId, t.round), index("angoff_ratings_exam").on(t.examId)],
);
