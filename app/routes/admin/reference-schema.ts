/** The regulatory-reference form (Admin): shared by conform in the browser and the action. */
import { z } from "zod";
import { isIsoDate } from "~/domain/validity";

export const referenceSchema = z.object({
  referenceId: z.string().min(1),
  code: z.string({ error: "Enter the standard's number or code." }).trim().min(1, "Enter the standard's number or code.").max(80, "At most 80 characters."),
  title: z.string({ error: "Enter a short title." }).trim().min(1, "Enter a short title.").max(200, "At most 200 characters."),
  body: z
    .string()
    .trim()
    .max(4000, "At most 4,000 characters.")
    .optional()
    .transform((v) => v ?? ""),
  lastVerifiedOn: z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Enter the date as YYYY-MM-DD.")
    .refine(isIsoDate, "There is no such day.")
    .optional()
    .transform((v) => v ?? null),
});
