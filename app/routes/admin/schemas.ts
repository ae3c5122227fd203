/**
 * The Admin section's forms: one zod schema per form, shared by the browser (conform's
 * `useForm`) and the actions. Not `.server`, so nothing here may touch the database: checks
 * that need it (a taken e-mail, a unit of another organisation) come in as functions from the
 * action and run in the schema's refine, so they return as field errors (STYLE.md "Forms").
 */
import { z } from "zod";
import { ROLES, type Role } from "~/auth/roles";

// ── Intents (the `name="intent"` value of each button; anything else is a 400) ──────────────

export const UNIT_INTENTS = {
  create: "create-unit",
  rename: "rename-unit",
  deactivate: "deactivate-unit",
  reactivate: "reactivate-unit",
} as const;

export const PERSON_INTENTS = {
  update: "update-person",
  deactivate: "deactivate-person",
  reactivate: "reactivate-person",
  grantRole: "grant-role",
  removeRole: "remove-role",
  addManagedUnit: "add-managed-unit",
  removeManagedUnit: "remove-managed-unit",
} as const;

export const ORGANISATION_INTENT = "save-organisation";

// ── Shared pieces ───────────────────────────────────────────────────────────────────────────

/** Conform turns an empty field into `undefined`; a field of spaces trims to "" — both mean "none". */
function optionalText(max: number, tooLong: string) {
  return z
    .string()
    .trim()
    .max(max, tooLong)
    .optional()
    .transform((v) => (v ? v : null));
}

function emailField(missing: string) {
  return z
    .string({ error: missing })
    .trim()
    .toLowerCase()
    .min(1, missing)
    .max(254, "That address is too long (254 characters at most).")
    .email("Enter a full e-mail address, like name@hospital.org.");
}

const MONTH_NAMES = [
  "January", "February", "March", "April", "May", "June",
  "July", "August", "September", "October", "November", "December",
] as const;

export const BIRTH_MONTH_OPTIONS = MONTH_NAMES.map((label, i) => ({ value: String(i + 1), label }));

export function monthName(month: number): string {
  return MONTH_NAMES[month - 1] ?? String(month);
}

/** Gregorian leap years: every 4th year, except centuries not divisible by 400. */
function isLeapYear(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

function daysIn(y: number, m: number): number {
  return [31, isLeapYear(y) ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][m - 1];
}

/**
 * Why a `YYYY-MM-DD` string is not a real calendar date, or null when it is. The browser's
 * date picker cannot produce 2026-02-30, but a typed value, an old browser or a script can,
 * and `new Date("2026-02-30")` would quietly roll it to 2 March (shared/STACK.md "Dates").
 */
export function calendarDateProblem(value: string): string | null {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (!match) return "Use the form YYYY-MM-DD, like 2024-03-12.";
  const [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  if (y < 1900 || y > 2100) return "Enter a year between 1900 and 2100.";
  if (m < 1 || m > 12) return `There is no month ${match[2]}: months run from 01 to 12.`;
  const last = daysIn(y, m);
  if (d < 1 || d > last) return `${value} is not a real date: ${MONTH_NAMES[m - 1]} ${y} has ${last} days.`;
  return null;
}

function calendarDateField(missing: string) {
  return z
    .string({ error: missing })
    .trim()
    .min(1, missing)
    .superRefine((value, ctx) => {
      const problem = calendarDateProblem(value);
      if (problem) ctx.addIssue({ code: "custom", message: problem });
    });
}

// ── Organisation settings (/admin) ──────────────────────────────────────────────────────────

/**
 * `timeZones` is the server's `Intl.supportedValuesOf("timeZone")` (handed to the page by the
 * loader, so the browser validates against the same list the server does).
 */
export function createOrganisationSchema(timeZones: readonly string[]) {
  const known = new Set(timeZones);
  return z.object({
    name: z
      .string({ error: "Enter the organisation's name." })
      .trim()
      .min(1, "Enter the organisation's name.")
      .max(120, "Keep the name to 120 characters."),
    timeZone: z
      .string({ error: "Choose the organisation's time zone." })
      .refine((tz) => known.has(tz), "Choose a time zone from the list (for example America/Chicago)."),
    educationLeadName: optionalText(120, "Keep the name to 120 characters."),
    contactEmail: z
      .string()
      .trim()
      .toLowerCase()
      .max(254, "That address is too long (254 characters at most).")
      .email("Enter a full e-mail address, like education@hospital.org.")
      .optional()
      .transform((v) => v ?? null),
  });
}
export type OrganisationValues = z.output<ReturnType<typeof createOrganisationSchema>>;

// ── Units (/admin/units) ────────────────────────────────────────────────────────────────────

export type UnitChecks = {
  /** True when another unit of the organisation already has this name (any letter case). */
  nameTaken: (name: string) => Promise<boolean>;
  codeTaken: (code: string) => Promise<boolean>;
};

/**
 * The database checks are async, so they are added only on the server: in the browser the
 * schema must stay synchronous (conform validates with a synchronous parse there).
 */
export function createUnitSchema(checks?: UnitChecks) {
  const unit = z.object({
    name: z
      .string({ error: "Enter the unit's name, like Adult ICU." })
      .trim()
      .min(1, "Enter the unit's name, like Adult ICU.")
      .max(60, "Keep the name to 60 characters."),
    code: z
      .string({ error: "Enter a short code, like AICU." })
      .trim()
      .toUpperCase()
      .min(1, "Enter a short code, like AICU.")
      .max(12, "Keep the short code to 12 characters.")
      .regex(/^[A-Z0-9-]+$/, "Use letters, digits and hyphens only, like AICU or 4-WEST."),
  });
  if (!checks) return unit;
  return unit.superRefine(async (value, ctx) => {
    if (await checks.nameTaken(value.name)) {
      ctx.addIssue({ code: "custom", path: ["name"], message: `Your organisation already has a unit called ${value.name}.` });
    }
    if (await checks.codeTaken(value.code)) {
      ctx.addIssue({ code: "custom", path: ["code"], message: `The short code ${value.code} is already used by another unit.` });
    }
  });
}
export type UnitValues = z.output<ReturnType<typeof createUnitSchema>>;

// ── People (/admin/people/new, /admin/people/:personId) ─────────────────────────────────────

export type PersonChecks = {
  /** Who already signs in with this address, anywhere in Tidemark (not the person being edited). */
  emailHolder: (email: string) => Promise<{ sameOrganisation: boolean; name: string } | null>;
  /** Who in this organisation already has this employee id (not the person being edited). */
  employeeIdHolder: (employeeId: string) => Promise<{ name: string } | null>;
  /** True when the unit belongs to this organisation. */
  unitKnown: (unitId: string) => Promise<boolean>;
};

const personFields = {
  name: z
    .string({ error: "Enter the person's full name." })
    .trim()
    .min(1, "Enter the person's full name.")
    .max(120, "Keep the name to 120 characters."),
  email: emailField("Enter the person's work e-mail address; they sign in with it."),
  employeeId: optionalText(40, "Keep the employee id to 40 characters."),
  title: optionalText(120, "Keep the title to 120 characters."),
  credentialLetters: z
    .string()
    .trim()
    .max(40, "Keep the credential letters to 40 characters.")
    .regex(/^[A-Za-z0-9 ,.\-()/]*$/, "Use letters, digits, spaces, commas and periods, like RRT, RRT-NPS.")
    .optional()
    .transform((v) => (v ? v : null)),
  hireDate: calendarDateField("Enter the hire date, like 2024-03-12."),
  homeUnitId: z
    .string()
    .optional()
    .transform((v) => v ?? null),
  birthMonth: z
    .number({ error: "Choose a month from the list." })
    .int("Choose a month from the list.")
    .min(1, "Choose a month from the list.")
    .max(12, "Choose a month from the list.")
    .optional()
    .transform((v) => v ?? null),
};

async function checkPerson(
  person: { email: string; employeeId: string | null; homeUnitId: string | null },
  ctx: z.RefinementCtx,
  checks: PersonChecks,
) {
  const holder = await checks.emailHolder(person.email);
  if (holder) {
    ctx.addIssue({
      code: "custom",
      path: ["email"],
      // Naming someone of another organisation would leak data across organisations.
      message: holder.sameOrganisation
        ? `${person.email} already belongs to ${holder.name}. Each person signs in with their own address.`
        : `${person.email} is already in use in Tidemark. Each person signs in with their own address.`,
    });
  }
  if (person.employeeId) {
    const taken = await checks.employeeIdHolder(person.employeeId);
    if (taken) {
      ctx.addIssue({ code: "custom", path: ["employeeId"], message: `Employee id ${person.employeeId} already belongs to ${taken.name}.` });
    }
  }
  if (person.homeUnitId && !(await checks.unitKnown(person.homeUnitId))) {
    ctx.addIssue({ code: "custom", path: ["homeUnitId"], message: "Choose one of your organisation's units." });
  }
}

/** With `checks` (server only) the schema is async; without, it stays synchronous for the browser. */
export function createPersonSchema(checks?: PersonChecks) {
  const person = z.object(personFields);
  return checks ? person.superRefine((value, ctx) => checkPerson(value, ctx, checks)) : person;
}
export type PersonValues = z.output<ReturnType<typeof createPersonSchema>>;

/** Adding a person also offers one role to start with, so they see their sections at first sign-in. */
export function createNewPersonSchema(checks?: PersonChecks) {
  const person = z.object({
    ...personFields,
    firstRole: z
      .enum(["none", ...ROLES], { error: "Choose a role from the list." })
      .optional()
      .transform((r): Role | null => (r && r !== "none" ? r : null)),
  });
  return checks ? person.superRefine((value, ctx) => checkPerson(value, ctx, checks)) : person;
}
export type NewPersonValues = z.output<ReturnType<typeof createNewPersonSchema>>;

export const RoleSchema = z.object({
  role: z.enum(ROLES, { error: "Choose a role from the list." }),
});

export const ManagedUnitSchema = z.object({
  unitId: z.string({ error: "Choose a unit to manage." }).min(1, "Choose a unit to manage."),
});

/** The second "ask" of a destructive action: the confirming button sends confirm=yes. */
export const ConfirmSchema = z.object({
  confirm: z.literal("yes", { error: "Confirm to go ahead: press the confirming button." }),
});

// ── People list filters (/admin/people?q=&unit=&role=&status=&page=) ───────────────────────

export const PEOPLE_STATUS = ["active", "inactive", "all"] as const;

export const PeopleFilterSchema = z.object({
  q: z.string().trim().max(100).catch(""),
  unit: z.string().max(64).catch(""),
  role: z.enum(ROLES).or(z.literal("")).catch(""),
  status: z.enum(PEOPLE_STATUS).catch("active"),
  page: z.coerce.number().int().min(1).max(10_000).catch(1),
});
export type PeopleFilter = z.output<typeof PeopleFilterSchema>;

export function readPeopleFilter(url: URL): PeopleFilter {
  const get = (k: string) => url.searchParams.get(k) ?? undefined;
  return PeopleFilterSchema.parse({ q: get("q") ?? "", unit: get("unit") ?? "", role: get("role") ?? "", status: get("status"), page: get("page") });
}
