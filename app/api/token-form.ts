/**
 * The Admin → API forms: one zod schema per form, used by conform in the browser and by the
 * action. Not `.server`: the page draws its fields from it.
 */
import { z } from "zod";
import { isIsoDate } from "~/domain/validity";

export const TOKEN_INTENTS = { create: "create-token", revoke: "revoke-token" } as const;

export const createTokenSchema = z.object({
  intent: z.literal(TOKEN_INTENTS.create),
  name: z
    .string({ error: "Name the token after the system that will use it, e.g. “Staffing system”." })
    .trim()
    .min(2, "Name the token after the system that will use it, e.g. “Staffing system”.")
    .max(80, "A token's name is at most 80 characters."),
  scopes: z
    .array(z.enum(["read", "write"]), { error: "Choose at least one scope: read, write or both." })
    .min(1, "Choose at least one scope: read, write or both."),
  expiresOn: z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Enter the expiry date as YYYY-MM-DD, or leave it blank for none.")
    .refine(isIsoDate, { message: "There is no such day: check the expiry date." })
    .optional(),
});

export const revokeTokenSchema = z.object({
  intent: z.literal(TOKEN_INTENTS.revoke),
  tokenId: z.string().min(1),
  confirm: z.literal("yes", { error: "Confirm to go ahead: press the confirming button." }),
});
