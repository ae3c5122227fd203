/**
 * Forms on /team/accommodations: granting extra time or an untimed sitting, and revoking one.
 * Used by conform in the browser and by the action; the bounds come from the timing rules
 * (app/domain/exams/timing.ts: at least 1.1 so it is real extra time, at most 10 as WCAG 2.2
 * SC 2.2.1 Timing Adjustable asks a limit to be adjustable to ten times, W3C 2023).
 */
import { z } from "zod";
import { MAX_MULTIPLIER, MIN_MULTIPLIER } from "~/domain/exams/timing";
import { isIsoDate, type IsoDate } from "~/domain/status/calendar-date";

export const ACCOMMODATION_INTENTS = { grant: "grant-accommodation", revoke: "revoke-accommodation" } as const;
export const ACCOMMODATION_KINDS = ["multiplier", "untimed"] as const;
export const REASON_MIN = 5;
export const REASON_MAX = 500;

const KIND_MESSAGE = "Choose extra time or no time limit.";

function baseFields(today: IsoDate) {
  return {
    intent: z.literal(ACCOMMODATION_INTENTS.grant),
    personId: z.string({ error: "Choose the person." }).trim().min(1, "Choose the person."),
    reason: z
      .string({ error: "Give the reason; it is kept with the record." })
      .trim()
      .min(REASON_MIN, `Give the reason in at least ${REASON_MIN} characters; it is kept with the record.`)
      .max(REASON_MAX, `At most ${REASON_MAX} characters.`),
    endsOn: z
      .string()
      .trim()
      .regex(/^\d{4}-\d{2}-\d{2}$/, "Enter the end date as YYYY-MM-DD, or leave it empty for no end date.")
      .refine(isIsoDate, "There is no such day: check the end date.")
      // ISO dates compare as text; "today" is the organisation's calendar date.
      .refine((d) => d >= today, `The end date cannot be in the past: today is ${today}.`)
      .optional(),
  };
}

/** The grant form; `today` is the organisation's calendar date, the earliest end date allowed. */
export function grantAccommodationSchema(today: IsoDate) {
  const base = baseFields(today);
  return z.discriminatedUnion(
    "kind",
    [
      z.object({
        ...base,
        kind: z.literal("multiplier"),
        multiplier: z
          .number({ error: "Enter the extra time as a number, such as 1.5." })
          .min(MIN_MULTIPLIER, `At least ${MIN_MULTIPLIER}: less than that is no real extra time.`)
          .max(MAX_MULTIPLIER, `At most ${MAX_MULTIPLIER} times the time limit; for more, choose “No time limit”.`),
      }),
      // A multiplier typed before switching to "No time limit" is ignored, not refused.
      z.object({ ...base, kind: z.literal("untimed"), multiplier: z.unknown().optional().transform(() => null) }),
    ],
    { error: KIND_MESSAGE },
  );
}

export type GrantValues = z.output<ReturnType<typeof grantAccommodationSchema>>;

export const revokeAccommodationSchema = z.object({
  intent: z.literal(ACCOMMODATION_INTENTS.revoke),
  accommodationId: z.string().min(1, "Which accommodation? Reload the page and try again."),
  confirm: z.literal("yes", { error: "Confirm to go ahead: press the confirming button." }),
});

/** "1.5 × the time limit" or "No time limit", as the table and messages say it. */
export function describeAccommodation(a: { kind: "multiplier" | "untimed"; multiplier: number | null }): string {
  return a.kind === "untimed" ? "No time limit" : `${formatMultiplier(a.multiplier ?? 1)} × the time limit`;
}

export function formatMultiplier(m: number): string {
  return String(Math.round(m * 100) / 100);
}
