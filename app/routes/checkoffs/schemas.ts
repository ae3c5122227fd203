/**
 * The Check-offs section's forms: one zod schema per form, shared by conform in the browser and
 * the actions. Not `.server`: nothing here touches the database.
 */
import { z } from "zod";
import { METHODS } from "~/domain/checkoffs/methods";
import { isIsoDate } from "~/domain/status/calendar-date";

export const CHECKOFF_INTENTS = {
  start: "start",
  mark: "mark-step",
  outcome: "set-outcome",
  sign: "sign",
  acknowledge: "acknowledge",
  addendum: "addendum",
  evidence: "evidence",
} as const;

export const INDEX_INTENTS = { request: "request", startFor: "start-for" } as const;

export const markStepSchema = z.object({
  // Parsed from the raw form data: `z.coerce.number` would read a blank field as step 0 (Number("") is 0).
  stepIndex: z
    .string({ message: "Which step? Reload the page and try again." })
    .regex(/^\d{1,4}$/, "Which step? Reload the page and try again.")
    .transform(Number),
  result: z.enum(["met", "not-met", "not-applicable"], { message: "Choose met, not met or not applicable." }),
  comment: z.string().trim().max(2000, "Keep the comment under 2,000 characters.").optional(),
});

export const outcomeSchema = z
  .object({
    outcome: z.enum(["competent", "needs-practice"], { message: "Choose competent or needs practice." }),
    practicePlan: z.string().trim().max(2000, "Keep the plan under 2,000 characters.").optional(),
    practiceBy: z
      .string()
      .optional()
      .refine((v) => !v || isIsoDate(v), "Give the date as a calendar date."),
  })
  .superRefine((v, ctx) => {
    if (v.outcome !== "needs-practice") return;
    if (!v.practicePlan) ctx.addIssue({ code: "custom", path: ["practicePlan"], message: "Needs practice requires a plan: what to practise." });
    if (!v.practiceBy) ctx.addIssue({ code: "custom", path: ["practiceBy"], message: "Needs practice requires a date to practise by." });
  });

const pin = z.string({ message: "Type your signing PIN." }).regex(/^\d{6,12}$/, "A signing PIN is 6 to 12 digits.");
const signerEmail = z.string().trim().email("Type a work e-mail address, or leave it empty to sign as yourself.").optional();

export const signSchema = z.object({ email: signerEmail, pin });

export const addendumSchema = z.object({
  text: z.string({ message: "Write the correction." }).trim().min(1, "Write the correction.").max(4000, "Keep the addendum under 4,000 characters."),
  email: signerEmail,
  pin,
});

export const setPinSchema = z
  .object({
    pin: z.string({ message: "Choose a PIN of at least 6 digits." }).regex(/^\d{6,12}$/, "Use 6 to 12 digits."),
    confirm: z.string({ message: "Type the PIN again." }),
  })
  .refine((v) => v.pin === v.confirm, { path: ["confirm"], message: "The two PINs differ." });

export const requestSchema = z.object({ checklistId: z.string({ message: "Choose a checklist." }).min(1, "Choose a checklist.") });
export const startForSchema = z.object({
  personId: z.string({ message: "Choose the therapist." }).min(1, "Choose the therapist."),
  checklistId: z.string({ message: "Choose a checklist." }).min(1, "Choose a checklist."),
});

/**
 * A checklist's steps are written one per line; a line starting with "!" is a critical step.
 * Plain text keeps the educator's form usable on a tablet and by screen reader.
 */
export function parseStepLines(text: string): { text: string; critical: boolean }[] {
  return text
    .split(/\r?\n/)
    .map((line) => line.trim())
    .filter(Boolean)
    .map((line) => (line.startsWith("!") ? { text: line.slice(1).trim(), critical: true } : { text: line, critical: false }));
}

export function stepLines(steps: readonly { text: string; critical: boolean }[]): string {
  return steps.map((s) => `${s.critical ? "! " : ""}${s.text}`).join("\n");
}


export const checklistSchema = z.object({
  title: z.string({ message: "Give the checklist a title." }).trim().min(3, "Give the checklist a title.").max(200, "Keep the title under 200 characters."),
  skill: z.string({ message: "Name the skill it clears." }).trim().min(2, "Name the skill it clears on the Clearance board.").max(120, "Keep the skill under 120 characters."),
  method: z.enum(METHODS, { message: "Choose the method." }),
  steps: z
    .string({ message: "Write at least one step." })
    .refine((v) => parseStepLines(v).length > 0, "Write at least one step.")
    .refine((v) => parseStepLines(v).length <= 60, "Keep a checklist to 60 steps.")
    .refine((v) => parseStepLines(v).every((s) => s.text.length > 0 && s.text.length <= 500), "Each step needs words (up to 500 characters)."),
  references: z.string().trim().max(4000, "Keep the references under 4,000 characters.").optional(),
});
