/**
 * Valid-through dates of seeded credentials, and issue dates chosen so that a credential lands
 * in a wanted status relative to the demo day. The rules themselves, with their sources, are the
 * application's (app/domain/validity): the seed stores what the app would compute.
 */
import { validThroughForType, type CredentialTerms, type StoredValidityRule } from "../app/domain/validity";
import { addDays, addMonths, daysBetween, type IsoDate } from "./calendar";
import type { Prng } from "./prng";

/** The JSON stored in credential_types.rule. */
export type ValidityRule = StoredValidityRule;

export type ValidityTerms = CredentialTerms;

/** Last valid date (inclusive), or null for no expiry: app/domain/validity's `validThroughForType`. */
export function validThroughFor(terms: ValidityTerms, issuedOn: IsoDate, birthMonth?: number | null): IsoDate | null {
  return validThroughForType(terms, issuedOn, birthMonth);
}

/** The length of a rule's term in months, for choosing plausible issue dates. */
function termMonths(rule: ValidityRule): number {
  switch (rule.kind) {
    case "months-end-of-month":
    case "months-exact":
      return rule.months;
    case "birth-month":
      return rule.years * 12;
    case "fixed-date":
      return rule.everyYears * 12;
    case "never":
      return 24;
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
  const months = termMonths(terms.rule);
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
