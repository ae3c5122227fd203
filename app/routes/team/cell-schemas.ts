/** Forms on a matrix cell's evidence page: a waiver and a due-date extension (dates must exist and lie ahead). */
import { z } from "zod";
import { isIsoDate } from "~/domain/validity";

export const CELL_INTENTS = { waive: "grant-waiver", revoke: "revoke-waiver", extend: "grant-extension", verify: "verify-credential" } as const;

const futureDate = (label: string) =>
  z
    .string({ error: `Enter the ${label} as YYYY-MM-DD.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Enter the ${label} as YYYY-MM-DD.`)
    .refine(isIsoDate, `There is no such day: check the ${label}.`);

const reason = z.string({ error: "Give the reason; it is kept with the record." }).trim().min(3, "Give the reason; it is kept with the record.").max(500, "At most 500 characters.");

export const waiverSchema = z.object({ intent: z.literal(CELL_INTENTS.waive), reason, endsOn: futureDate("end date") });
export const extensionSchema = z.object({ intent: z.literal(CELL_INTENTS.extend), reason, newDueOn: futureDate("new due date") });
export const verifySchema = z.object({ intent: z.literal(CELL_INTENTS.verify), credentialId: z.string().min(1), method: z.string().trim().min(3).max(200) });
export const revokeSchema = z.object({ intent: z.literal(CELL_INTENTS.revoke), waiverId: z.string().min(1), reason });
