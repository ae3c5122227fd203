import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { calendarDate, createdAt, id, instant, updatedAt } from "./columns";
import { files } from "./auth";
import { checklists } from "./checkoffs";
import { organisations, people, units, ROLES } from "./core";
import { exams } from "./exams";

export const RECURRENCES = ["at-hire", "every-12-months", "every-24-months", "once"] as const;
export const CLEARANCE_LEVELS = ["independent", "supervised", "not-cleared"] as const;

/** Editable text of an accreditation standard or rule; standards are renumbered, so none is hard-coded. */
export const regulatoryReferences = sqliteTable("regulatory_references", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  code: text("code").notNull(),
  title: text("title").notNull(),
  body: text("body").notNull().default(""),
  lastVerifiedOn: calendarDate("last_verified_on"),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const credentialTypes = sqliteTable(
  "credential_types",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    code: text("code").notNull(),
    name: text("name").notNull(),
    category: text("category", { enum: ["licence", "board", "life-support", "other"] }).notNull(),
    /** Validity rule, see app/domain/validity. JSON. */
    rule: text("rule", { mode: "json" }).notNull(),
    /** Credentials issued before this date never expire (e.g. a board credential before 2002-07-01). */
    neverExpiresIfIssuedBefore: calendarDate("never_expires_if_issued_before"),
    reinstatementMonths: integer("reinstatement_months"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("credential_types_org_code").on(t.orgId, t.code)],
);

export const requirements = sqliteTable(
  "requirements",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    name: text("name").notNull(),
    kind: text("kind", { enum: ["exam", "checklist", "credential"] }).notNull(),
    examId: text("exam_id").references(() => exams.id),
    checklistId: text("checklist_id").references(() => checklists.id),
    credentialTypeId: text("credential_type_id").references(() => credentialTypes.id),
    recurrence: text("recurrence", { enum: RECURRENCES }),
    graceDays: integer("grace_days").notNull().default(0),
    /** Applies to everyone on this unit, or with this role; both null = everyone in the organisation. */
    unitId: text("unit_id").references(() => units.id),
    role: text("role", { enum: ROLES }),
    regulatoryReferenceId: text("regulatory_reference_id").references(() => regulatoryReferences.id),
    lapseLeaves: text("lapse_leaves", { enum: ["supervised", "not-cleared"] }).notNull().default("not-cleared"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("requirements_org").on(t.orgId)],
);

export const waivers = sqliteTable("waivers", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  personId: text("person_id").notNull().references(() => people.id),
  requirementId: text("requirement_id").notNull().references(() => requirements.id),
  reason: text("reason").notNull(),
  endsOn: calendarDate("ends_on").notNull(),
  grantedBy: text("granted_by").notNull().references(() => people.id),
  revokedAt: instant("revoked_at"),
  createdAt: createdAt(),
});

export const extensions = sqliteTable("extensions", {
  id: id(),
  orgId: text("org_id").notNull().references(() => organisations.id),
  personId: text("person_id").notNull().references(() => people.id),
  requirementId: text("requirement_id").notNull().references(() => requirements.id),
  newDueOn: calendarDate("new_due_on").notNull(),
  reason: text("reason").notNull(),
  grantedBy: text("granted_by").notNull().references(() => people.id),
  createdAt: createdAt(),
});

export const credentials = sqliteTable(
  "credentials",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    credentialTypeId: text("credential_type_id").notNull().references(() => credentialTypes.id),
    number: text("number"),
    issuer: text("issuer"),
    issuedOn: calendarDate("issued_on").notNull(),
    /** Last valid date (inclusive) — "valid through". Null: no expiry. */
    validThrough: calendarDate("valid_through"),
    scanFileId: text("scan_file_id").references(() => files.id),
    verifiedBy: text("verified_by").references(() => people.id),
    verifiedAt: instant("verified_at"),
    /** How it was verified against the primary source, e.g. "State board online licence lookup". */
    verificationMethod: text("verification_method"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("credentials_person").on(t.personId), index("credentials_org").on(t.orgId)],
);

/** What a person may do on a unit, per skill (a checklist), as last derived. */
export const clearances = sqliteTable(
  "clearances",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    unitId: text("unit_id").notNull().references(() => units.id),
    checklistId: text("checklist_id").notNull().references(() => checklists.id),
    level: text("level", { enum: CLEARANCE_LEVELS }).notNull(),
    reason: text("reason"),
    derivedAt: instant("derived_at").notNull(),
  },
  (t) => [uniqueIndex("clearances_person_unit_skill").on(t.personId, t.unitId, t.checklistId)],
);

export const certificates = sqliteTable(
  "certificates",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    requirementId: text("requirement_id").references(() => requirements.id),
    sourceType: text("source_type", { enum: ["attempt", "checkoff"] }).notNull(),
    sourceId: text("source_id").notNull(),
    title: text("title").notNull(),
    /** Public verification code printed on the PDF and in its QR code. */
    code: text("code").notNull().unique(),
    issuedOn: calendarDate("issued_on").notNull(),
    validThrough: calendarDate("valid_through"),
    signerName: text("signer_name").notNull(),
    revokedAt: instant("revoked_at"),
    revokedReason: text("revoked_reason"),
    revokedBy: text("revoked_by").references(() => people.id),
    createdAt: createdAt(),
  },
  (t) => [index("certificates_person").on(t.personId)],
);

/** One e-mail for one person, requirement, due date and threshold: never sent twice. */
export const reminders = sqliteTable(
  "reminders",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    requirementId: text("requirement_id").notNull().references(() => requirements.id),
    dueOn: calendarDate("due_on").notNull(),
    /** e.g. "90d", "on-day", "lapsed-2026-W14". */
    threshold: text("threshold").notNull(),
    sentAt: instant("sent_at"),
    messageId: text("message_id"),
    /** How it went out: its own e-mail, or a line in the person's daily digest. */
    channel: text("channel", { enum: ["email", "digest"] }).notNull().default("email"),
    /** Why the send failed (the transport's message); null when sent or still claimed. */
    failure: text("failure"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("reminders_once").on(t.personId, t.requirementId, t.dueOn, t.threshold), index("reminders_org_created").on(t.orgId, t.createdAt)],
);

/** A manager's weekly digest of their units' Due soon and Lapsed people: one per manager and ISO week. */
export const managerDigests = sqliteTable(
  "manager_digests",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    managerId: text("manager_id").notNull().references(() => people.id),
    /** ISO 8601 week, e.g. "2026-W49". */
    week: text("week").notNull(),
    /** How many people the digest listed. */
    people: integer("people").notNull().default(0),
    sentAt: instant("sent_at"),
    messageId: text("message_id"),
    failure: text("failure"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("manager_digests_once").on(t.managerId, t.week)],
);

/** One run of the reminder job for one organisation (Admin → Reminders shows the last ones). */
export const reminderRuns = sqliteTable(
  "reminder_runs",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    /** The organisation's calendar date the run judged. */
    ranOn: calendarDate("ran_on").notNull(),
    trigger: text("trigger", { enum: ["script", "app", "test"] }).notNull(),
    startedAt: instant("started_at").notNull(),
    finishedAt: instant("finished_at").notNull(),
    /** Reminders this run claimed and sent (each its own e-mail or a digest line). */
    sent: integer("sent").notNull().default(0),
    /** E-mails sent (separate reminders, daily digests and manager digests). */
    emails: integer("emails").notNull().default(0),
    failed: integer("failed").notNull().default(0),
  },
  (t) => [index("reminder_runs_org_ran").on(t.orgId, t.ranOn)],
);

export type Requirement = typeof requirements.$inferSelect;
export type Credential = typeof credentials.$inferSelect;
export type CredentialType = typeof credentialTypes.$inferSelect;
