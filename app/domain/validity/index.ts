/**
 * Credential validity rules: how long a card or licence stays valid after it is issued.
 * Pure (no database, no clock), so the same rules run in the browser (the proposed expiry on
 * the credential form), on the server (saving) and in the seed.
 *
 * Dates are calendar dates, ISO 'YYYY-MM-DD', in the organisation's time zone. Arithmetic is
 * calendar arithmetic on year/month/day, never "+730 days" (shared/TESTING.md "Credential
 * dates"). Every function returns a "valid through" date: the LAST day the credential is valid,
 * inclusive — distinct from an "expires on" wording, which some cards use for the same day.
 *
 * Sources of the rule kinds (checked in index.test.ts):
 * - months-end-of-month: life-support course completion cards are "valid for two years through
 *   the end of the month during which the course completion card was issued" (American Heart
 *   Association, "Course Card Information", cpr.heart.org); the board credential runs five years
 *   ending on the last day of the month the exam was passed (NBRC, "Credential Maintenance &
 *   State License Renewal", nbrc.org).
 * - months-exact: the same day N months later, clamped to the month's end (neonatal
 *   resuscitation, two years — from memory; the rule is data, so an organisation can change it).
 * - birth-month and fixed-date: state licences, "mostly biennial, some annual; some expire at the
 *   end of the birth month, some on a fixed statutory date" (AARC, "Respiratory Therapist State
 *   Licensure Information"; California Business & Professions Code §2535, end of birth month).
 * - never: no expiry.
 */
import { addMonths, daysInMonth, endOfMonth, formatIsoDate, isIsoDate, parseIsoDate, type IsoDate } from "../status/calendar-date";

export type { IsoDate } from "../status/calendar-date";

export type ValidityRule =
  /** Valid through the last day of the month N months after issue. */
  | { kind: "months-end-of-month"; months: number }
  /** Valid through the same day N months later, clamped to that month's end. */
  | { kind: "months-exact"; months: number }
  /** Valid through the last day of the holder's birth month in the year the term ends (issue year + years). */
  | { kind: "birth-month"; years: number; birthMonth: number }
  /** Valid through month/day of the year the term ends (issue year + everyYears); 29 February clamps. */
  | { kind: "fixed-date"; month: number; day: number; everyYears: number }
  | { kind: "never" };

export const RULE_KINDS = ["months-end-of-month", "months-exact", "birth-month", "fixed-date", "never"] as const;
export type RuleKind = (typeof RULE_KINDS)[number];

/**
 * The rule as a credential type stores it (credential_types.rule, JSON): a birth-month rule is
 * the same for everyone of that type, so its birth month comes from the person (people.birth_month)
 * when a date is computed — see `ruleForPerson`.
 */
export type StoredValidityRule =
  | Exclude<ValidityRule, { kind: "birth-month" }>
  | { kind: "birth-month"; years: number; birthMonth?: number | null };

/** A credential type's terms: its rule, the never-expires cut-off and the reinstatement window. */
export type CredentialTerms = {
  rule: StoredValidityRule;
  /** Credentials issued before this date never expire (NBRC: board credentials earned before 2002-07-01). */
  neverExpiresIfIssuedBefore?: IsoDate | null;
  /** Months after the valid-through date in which the credential can still be reinstated (NBRC: 6). */
  reinstatementMonths?: number | null;
};

const positiveInt = (n: unknown, max: number): n is number => typeof n === "number" && Number.isInteger(n) && n >= 1 && n <= max;

/** Whether a value read from the database (JSON) is a well-formed stored rule. */
export function isStoredRule(value: unknown): value is StoredValidityRule {
  if (!value || typeof value !== "object") return false;
  const r = value as Record<string, unknown>;
  switch (r.kind) {
    case "months-end-of-month":
    case "months-exact":
      return positiveInt(r.months, 1200);
    case "birth-month":
      return positiveInt(r.years, 100) && (r.birthMonth === undefined || r.birthMonth === null || positiveInt(r.birthMonth, 12));
    case "fixed-date":
      // 29 February is allowed: it clamps to the 28th in common years.
      return positiveInt(r.month, 12) && positiveInt(r.day, daysInMonth(2024, r.month as number)) && positiveInt(r.everyYears, 100);
    case "never":
      return true;
    default:
      return false;
  }
}

/**
 * The rule for one person. A birth-month rule without a birth month on file cannot be applied
 * as written; it falls back to the end of the month the term ends (issue + years), the
 * life-support card reading, so a date is still proposed and the person can correct it.
 */
export function ruleForPerson(rule: StoredValidityRule, birthMonth: number | null | undefined): ValidityRule {
  if (rule.kind !== "birth-month") return rule;
  const month = rule.birthMonth ?? birthMonth;
  if (positiveInt(month, 12)) return { kind: "birth-month", years: rule.years, birthMonth: month };
  return { kind: "months-end-of-month", months: rule.years * 12 };
}

/** Last valid calendar date ('YYYY-MM-DD', inclusive), or null for no expiry. Throws on a date that does not exist. */
export function validThrough(rule: ValidityRule, issuedOn: IsoDate): IsoDate | null {
  const { year } = parseIsoDate(issuedOn);
  switch (rule.kind) {
    case "months-end-of-month":
      return endOfMonth(addMonths(issuedOn, rule.months));
    case "months-exact":
      return addMonths(issuedOn, rule.months);
    case "birth-month":
      return endOfMonth(formatIsoDate(year + rule.years, rule.birthMonth, 1));
    case "fixed-date": {
      const y = year + rule.everyYears;
      return formatIsoDate(y, rule.month, Math.min(rule.day, daysInMonth(y, rule.month)));
    }
    case "never":
      return null;
  }
}

/**
 * Valid-through date under a type's full terms: the never-expires cut-off first (issued strictly
 * before it → null), then the rule for this person.
 */
export function validThroughForType(terms: CredentialTerms, issuedOn: IsoDate, birthMonth?: number | null): IsoDate | null {
  if (terms.neverExpiresIfIssuedBefore && issuedOn < terms.neverExpiresIfIssuedBefore) {
    parseIsoDate(issuedOn);
    return null;
  }
  return validThrough(ruleForPerson(terms.rule, birthMonth), issuedOn);
}

/**
 * Last day a lapsed credential can still be reinstated, or null when the type has no window or
 * the credential never expires. NBRC: "within 6 months after" expiry. Our reading: N calendar
 * months after the valid-through date, and a window that starts at a month's end ends at a month's
 * end (2026-04-30 + 6 months → 2026-10-31), the way the NBRC's own dates are month ends.
 */
export function reinstatableThrough(validThroughOn: IsoDate | null, reinstatementMonths: number | null | undefined): IsoDate | null {
  if (validThroughOn === null || !reinstatementMonths) return null;
  const shifted = addMonths(validThroughOn, reinstatementMonths);
  return validThroughOn === endOfMonth(validThroughOn) ? endOfMonth(shifted) : shifted;
}

export type Standing = "valid" | "reinstatable" | "expired";

/** A credential's standing on a calendar day: valid, lapsed but reinstatable, or expired for good (needs a new exam or course). */
export function standingOn(validThroughOn: IsoDate | null, reinstatementMonths: number | null | undefined, on: IsoDate): Standing {
  if (validThroughOn === null || on <= validThroughOn) return "valid";
  const window = reinstatableThrough(validThroughOn, reinstatementMonths);
  return window !== null && on <= window ? "reinstatable" : "expired";
}

/** Plain-language description of a rule, for forms and requirement pages. */
export function describeRule(terms: CredentialTerms): string {
  const r = terms.rule;
  let text: string;
  switch (r.kind) {
    case "months-end-of-month":
      text = `valid ${r.months} months, through the end of the month`;
      break;
    case "months-exact":
      text = `valid ${r.months} months, to the same day`;
      break;
    case "birth-month":
      text = `valid ${r.years} year${r.years === 1 ? "" : "s"}, through the end of the holder's birth month`;
      break;
    case "fixed-date":
      text = `valid through ${formatIsoDate(2000, r.month, r.day).slice(5)} (month-day), every ${r.everyYears} year${r.everyYears === 1 ? "" : "s"}`;
      break;
    case "never":
      text = "never expires";
      break;
  }
  if (terms.neverExpiresIfIssuedBefore) text += `; never expires if issued before ${terms.neverExpiresIfIssuedBefore}`;
  if (terms.reinstatementMonths) text += `; can be reinstated within ${terms.reinstatementMonths} months after it lapses`;
  return text;
}

export { isIsoDate };
