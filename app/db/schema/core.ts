import { sql } from "drizzle-orm";
import { index, integer, primaryKey, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { calendarDate, createdAt, id, updatedAt } from "./columns";

import { ROLES } from "../../auth/roles";

export { ROLES, type Role } from "../../auth/roles";

export const organisations = sqliteTable("organisations", {
  id: id(),
  name: text("name").notNull(),
  slug: text("slug").notNull().unique(),
  /** IANA time zone used for every calendar date of this organisation. */
  timeZone: text("time_zone").notNull().default("America/Chicago"),
  /** Free-form settings (education lead, reminder policy…), JSON. */
  settings: text("settings", { mode: "json" }).$type<OrganisationSettings>().notNull().default(sql`'{}'`),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});
export type OrganisationSettings = {
  educationLeadName?: string;
  /**
   * Reminder thresholds in days before a date (0: on the day). The status engine reads its
   * "Due soon" window from the largest; the reminder job sends at each (app/domain/reminders).
   */
  reminderDays?: number[];
  /** The rest of the reminder policy (app/domain/reminders/policy.ts); absent: the defaults. */
  reminderPolicy?: { weeklyWhileLapsed: boolean; boardMonthsBefore: number[]; managerDigest: boolean };
  contactEmail?: string;
};

export const units = sqliteTable(
  "units",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    name: text("name").notNull(),
    code: text("code").notNull(),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("units_org_code").on(t.orgId, t.code), uniqueIndex("units_org_name").on(t.orgId, t.name)],
);

export const people = sqliteTable(
  "people",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    /** Lower-cased; sign-in address. Unique across Tidemark: one address, one organisation. */
    email: text("email").notNull().unique(),
    name: text("name").notNull(),
    employeeId: text("employee_id"),
    title: text("title"),
    /** Post-nominal credentials shown with a signature, e.g. "RRT". */
    credentialLetters: text("credential_letters"),
    hireDate: calendarDate("hire_date"),
    homeUnitId: text("home_unit_id").references(() => units.id),
    /** 1–12; some state licences expire at the end of the birth month. */
    birthMonth: integer("birth_month"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    /** Hashed signing PIN (second signature component); set by the person. */
    signingPinHash: text("signing_pin_hash"),
    signingPinFailures: integer("signing_pin_failures").notNull().default(0),
    /** The person's choice: each reminder as its own e-mail, or one daily digest (issue 9 §1). */
    reminderDelivery: text("reminder_delivery", { enum: ["each", "digest"] }).notNull().default("each"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("people_org").on(t.orgId),
    uniqueIndex("people_org_employee").on(t.orgId, t.employeeId),
  ],
);

export const personRoles = sqliteTable(
  "person_roles",
  {
    personId: text("person_id").notNull().references(() => people.id),
    orgId: text("org_id").notNull().references(() => organisations.id),
    role: text("role", { enum: ROLES }).notNull(),
    grantedBy: text("granted_by"),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.personId, t.role] }), index("person_roles_org").on(t.orgId)],
);

/** Units a person works on beyond the home unit, and the units a manager manages. */
export const personUnits = sqliteTable(
  "person_units",
  {
    personId: text("person_id").notNull().references(() => people.id),
    unitId: text("unit_id").notNull().references(() => units.id),
    orgId: text("org_id").notNull().references(() => organisations.id),
    relation: text("relation", { enum: ["member", "manages"] }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.personId, t.unitId, t.relation] })],
);

export type Organisation = typeof organisations.$inferSelect;
export type Unit = typeof units.$inferSelect;
export type Person = typeof people.$inferSelect;
export type NewPerson = typeof people.$inferInsert;
