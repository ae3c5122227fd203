/**
 * Valid-through dates of seeded credentials, and issue dates chosen so that a credential lands
 * in a wanted status relative to the demo day.
 *
 * The application's own validity engine (app/domain/validity) does not exist yet; this module
 * computes only what the seed stores (`credentials.valid_through`) and states each rule's source.
 * When the domain module lands, the seed should call it instead.
 */
import { addDays, addMonths, daysBetween, endOfMonth, formatIsoDate, parseIsoDate, type IsoDate } from "./calendar";
import type { Prng } from "./prng";

/** The JSON stored in credential_types.rule. */
export type ValidityRule =
  | { kind: "months-end-of-month"; months: number }
  | { kind: "months-exact"; months: number }
  | { kind: "birth-month"; months: number };

export type ValidityTerms = { rule: ValidityRule; neverExpiresIfIssuedBefore?: IsoDate | null };

/**
 * Last valid date (inclusive), or null for no expiry.
 * - months-end-of-month: life-support cards are "valid for two years through the end of the
 *   month during which the course completion card was issued" (American Heart Association,
 *   "Course Card Information", cpr.heart.org); the board credential is five years ending on the
 *   last day of the month the exam was passed, and one earned before 2002-07-01 never expires
 *   (NBRC, "Credential Maintenance & State License Renewal", nbrc.org).
 * - months-exact: through the day before the same date `months` later, or through the end of the
 *   month when that date does not exist (neonatal resuscitation: two years, from memory; the rule
 *   is data, so it can be changed).
 * - birth-month: some state licences end on the last day of the holder's birth month
 *   (California Business & Professions Code §2535, as cited in shared/TESTING.md C6). Our
 *   reading: the last end of the birth month on or before issue + `months`, so a term is never
 *   longer than `months`. Without a birth month on file it falls back to end-of-month.
 */
export function validThroughFor(terms: ValidityTerms, issuedOn: IsoDate, birthMonth?: number | null): IsoDate | null {
  if (terms.neverExpiresIfIssuedBefore && issuedOn < terms.neverExpiresIfIssuedBefore) return null;
  const { rule } = terms;
  switch (rule.kind) {
    case "months-end-of-month":
      return endOfMonth(addMonths(issuedOn, rule.months));
    case "months-exact": {
      const anniversary = addMonths(issuedOn, rule.months);
      // A clamped anniversary (29 February in a common year) already is the last day of the term.
      return parseIsoDate(anniversary).day < parseIsoDate(issuedOn).day ? anniversary : addDays(anniversary, -1);
    }
    case "birth-month": {
      if (!birthMonth) return endOfMonth(addMonths(issuedOn, rule.months));
      const limit = addMonths(issuedOn, rule.months);
      const { year: y, month: m } = parseIsoDate(limit);
      const year = birthMonth <= m ? y : y - 1;
      return endOfMonth(formatIsoDate(year, birthMonth, 1));
    }
  }
}

/** The reminder window: "due soon" means valid but expiring within this many days (PRODUCT.md). */
export const DUE_SOON_DAYS = 90;

export type DateStatus = "current" | "due-soon" | "lapsed";

/** Status of a valid-through date on `today` (both calendar dates in the organisation's zone). */
export function dateStatus(validThrough: IsoDate | null, today: IsoDate): DateStatus {
  if (validThrough === null) return "current";
  if (validThrough < today) return "lapsed";
  return validThrough <= addDays(today, DUE_SOON_DAYS) ? "due-soon" : "current";
}

/**
 * An issue date whose valid-through date has the wanted status on `today`. Rejection sampling
 * over the plausible issue window keeps this rule-agnostic; lapsed cards lapsed within ~5 months.
 * Falls back to the last draw if no draw matched (cannot happen for the rules above).
 */
export function issueDateForStatus(
  terms: ValidityTerms,
  wanted: DateStatus,
  today: IsoDate,
  prng: Prng,
  birthMonth?: number | null,
): IsoDate {
  const months = terms.rule.months;
  const earliest = addDays(addMonths(today, -months), -150);
  // Issued at least three weeks before the demo day.
  const span = Math.max(1, daysBetween(earliest, today) - 21);
  let issued = today;
  for (let tries = 0; tries < 500; tries++) {
    issued = addDays(earliest, prng.int(0, span));
    if (dateStatus(validThroughFor(terms, issued, birthMonth), today) === wanted) return issued;
  }
  return issued;
}

/** Draws a status with the given probabilities of lapsed and due soon (the rest current). */
export function drawStatus(prng: Prng, lapsed: number, dueSoon: number): DateStatus {
  const r = prng.next();
  if (r < lapsed) return "lapsed";
  return r < lapsed + dueSoon ? "due-soon" : "current";
}
