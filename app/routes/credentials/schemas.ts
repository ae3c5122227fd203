/**
 * The Credentials section's forms: one zod schema per form, shared by the browser (conform's
 * `useForm`) and the actions. Not `.server`: checks that need the database (is the type one of
 * the organisation's, is the scan a PNG, JPEG or PDF by content) run in the action and come back
 * as field errors.
 */
import { z } from "zod";
import { isIsoDate } from "~/domain/validity";

/** How a manager checked a credential with its primary source (issue 8 §3: who, when, how). */
export const VERIFICATION_METHODS = [
  "Online lookup with the issuing body",
  "Telephone call to the issuing body",
  "Written confirmation from the issuing body",
  "Original card checked with the training centre",
] as const;

export const CREDENTIAL_INTENTS = { record: "record-credential", verify: "verify-credential" } as const;

function optionalText(max: number, label: string) {
  return z
    .string()
    .trim()
    .max(max, `${label} is at most ${max} characters.`)
    .optional()
    .transform((v) => (v ? v : null));
}

/** A calendar date typed as YYYY-MM-DD that must exist: 2026-02-31 is refused, not rolled to 3 March. */
function calendarDate(label: string) {
  return z
    .string({ error: `Enter the ${label} as YYYY-MM-DD.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Enter the ${label} as YYYY-MM-DD, e.g. 2026-03-12.`)
    .refine(isIsoDate, { message: `There is no such day: check the ${label} (for example, February has 28 days, 29 in a leap year).` });
}

export const recordCredentialSchema = z
  .object({
    intent: z.literal(CREDENTIAL_INTENTS.record),
    personId: z.string().min(1),
    credentialTypeId: z.string({ error: "Choose the type of card or licence." }).min(1, "Choose the type of card or licence."),
    number: optionalText(60, "The number"),
    issuer: optionalText(120, "The issuer"),
    issuedOn: calendarDate("issue date"),
    validThrough: calendarDate("valid-through date").optional(),
  })
  .superRefine((v, ctx) => {
    if (v.validThrough && isIsoDate(v.issuedOn) && isIsoDate(v.validThrough) && v.validThrough < v.issuedOn) {
      ctx.addIssue({ code: "custom", path: ["validThrough"], message: "The valid-through date is before the issue date. Check both dates on the card." });
    }
  });

export const verifyCredentialSchema = z.object({
  intent: z.literal(CREDENTIAL_INTENTS.verify),
  credentialId: z.string().min(1),
  method: z.string({ error: "Say how you checked it with the issuing body." }).trim().min(3, "Say how you checked it with the issuing body.").max(200),
});
