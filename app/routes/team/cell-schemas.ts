/**
 * Forms on a matrix cell's evidence page: a waiver and a due-date extension. Dates must exist and
 * lie ahead: a waiver ends today or later, and an extension moves the due date later than the
 * current one and not into the past. "Today" is the organisation's calendar date
 * (`calendarDateIn` in app/domain/status), passed in by the loader for the browser and computed
 * again by the action on the server.
 */
import { z } from "zod";
import { formatCalendarDate } from "~/components/calendar-date";
import { isIsoDate } from "~/domain/validity";

export const CELL_INTENTS = { waive: "grant-waiver", revoke: "revoke-waiver", extend: "grant-extension", verify: "verify-credential" } as const;

const calendarDate = (label: string) =>
  z
    .string({ error: `Enter the ${label} as YYYY-MM-DD.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `Enter the ${label} as YYYY-MM-DD.`, abort: true })
    .refine(isIsoDate, { error: `There is no such day: check the ${label}.`, abort: true });

const reason = z.string({ error: "Give the reason; it is kept with the record." }).trim().min(3, "Give the reason; it is kept with the record.").max(500, "At most 500 characters.");

/** A waiver in the past would excuse nothing; ISO dates compare as strings. */
export function waiverSchema(today: string) {
  return z.object({
    intent: z.literal(CELL_INTENTS.waive),
    reason,
    endsOn: calendarDate("end date").refine((d) => d >= today, "A waiver must end today or later."),
  });
}

/**
 * `currentDue`: the last day the cell is on time now — its due date (already moved by any
 * extension) or its valid-through date; null when nothing is due yet. The new date must be
 * later than that, and not before today.
 */
export function extensionSchema(today: string, currentDue: string | null) {
  return z.object({
    intent: z.literal(CELL_INTENTS.extend),
    reason,
    newDueOn: calendarDate("new due date")
      .refine((d) => d >= today, { error: "The new due date must be today or later.", abort: true })
      .refine((d) => currentDue === null || d > currentDue, currentDue ? `The new due date must be after the current one, ${formatCalendarDate(currentDue)}.` : "The new due date must be after the current one."),
  });
}

export const verifySchema = z.object({ intent: z.literal(CELL_INTENTS.verify), credentialId: z.string().min(1), method: z.string().trim().min(3).max(200) });
export const revokeSchema = z.object({ intent: z.literal(CELL_INTENTS.revoke), waiverId: z.string().min(1), reason });
