/** The requirement form on Team → Requirements (grace period, cited reference, what a lapse leaves). */
import { z } from "zod";

export const requirementEditSchema = z.object({
  requirementId: z.string().min(1),
  graceDays: z.coerce
    .number({ error: "Enter the grace period in whole days (0 for none)." })
    .int("Enter whole days.")
    .min(0, "A grace period cannot be negative.")
    .max(365, "At most 365 days."),
  regulatoryReferenceId: z
    .string()
    .optional()
    .transform((v) => (v ? v : null)),
  lapseLeaves: z.enum(["supervised", "not-cleared"], { error: "Choose what a lapse leaves." }),
});
