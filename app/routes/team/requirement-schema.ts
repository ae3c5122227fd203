/**
 * The forms on Team → Requirements: a new requirement, changing one (recurrence, audience, grace
 * period, cited reference, what a lapse leaves), retiring one and bringing it back. Checks that
 * need the database (the exam is this organisation's and published, the name is not taken) run
 * in app/db/queries/requirements.server.ts and come back as field errors.
 */
import { z } from "zod";

export const REQUIREMENT_INTENTS = {
  create: "create-requirement",
  update: "update-requirement",
  retire: "retire-requirement",
  restore: "restore-requirement",
} as const;

/** Same list as `RECURRENCES` in app/db/schema/compliance.ts (kept here so the browser bundle stays free of the schema). */
export const RECURRENCES = ["at-hire", "every-12-months", "every-24-months", "once"] as const;

export const REQUIREMENT_KINDS = ["exam", "checklist", "credential"] as const;
export type RequirementKind = (typeof REQUIREMENT_KINDS)[number];

/** Who a requirement can be aimed at by role; admins run the system and hold no clinical requirements. */
export const AUDIENCE_ROLES = ["therapist", "preceptor", "educator", "manager"] as const;

export const RECURRENCE_LABELS: Record<(typeof RECURRENCES)[number], string> = {
  "at-hire": "At hire",
  "every-12-months": "Every 12 months",
  "every-24-months": "Every 24 months",
  once: "Once",
};

/** An empty select or text box means "none". */
const optionalId = z
  .string()
  .optional()
  .transform((v) => (v ? v : null));

const graceDays = z.coerce
  .number({ error: "Enter the grace period in whole days (0 for none)." })
  .int("Enter whole days.")
  .min(0, "A grace period cannot be negative.")
  .max(365, "At most 365 days.");

// conform's parseWithZod turns an empty field into undefined before these run.
const recurrence = z
  .enum(RECURRENCES, { error: "Choose how often it recurs." })
  .optional()
  .transform((v) => v ?? null);

const role = z
  .enum(AUDIENCE_ROLES, { error: "Choose a role from the list, or any role." })
  .optional()
  .transform((v) => v ?? null);

const lapseLeaves = z.enum(["supervised", "not-cleared"], { error: "Choose what a lapse leaves." });

const REF_FIELD = { exam: "examId", checklist: "checklistId", credential: "credentialTypeId" } as const;
const REF_MISSING = {
  exam: "Choose the exam this requirement asks for.",
  checklist: "Choose the check-off this requirement asks for.",
  credential: "Choose the credential type this requirement asks for.",
} as const;
const KIND_WORD = { exam: "an exam", checklist: "a check-off", credential: "a credential type" } as const;

export const requirementCreateSchema = z
  .object({
    intent: z.literal(REQUIREMENT_INTENTS.create),
    name: z
      .string({ error: "Name the requirement." })
      .trim()
      .min(3, "Name the requirement (at least 3 characters).")
      .max(120, "At most 120 characters."),
    kind: z.enum(REQUIREMENT_KINDS, { error: "Choose what kind of requirement it is." }),
    examId: optionalId,
    checklistId: optionalId,
    credentialTypeId: optionalId,
    recurrence,
    graceDays,
    unitId: optionalId,
    role,
    regulatoryReferenceId: optionalId,
    lapseLeaves,
  })
  .superRefine((v, ctx) => {
    // Exactly one thing is asked for, and it matches the kind.
    const wanted = REF_FIELD[v.kind];
    if (!v[wanted]) ctx.addIssue({ code: "custom", path: [wanted], message: REF_MISSING[v.kind] });
    for (const kind of REQUIREMENT_KINDS) {
      const field = REF_FIELD[kind];
      if (kind !== v.kind && v[field]) ctx.addIssue({ code: "custom", path: [field], message: `This requirement is ${KIND_WORD[v.kind]}; it cannot also name ${KIND_WORD[kind]}.` });
    }
    if (v.kind !== "credential" && !v.recurrence) ctx.addIssue({ code: "custom", path: ["recurrence"], message: "Choose how often it recurs." });
    if (v.kind === "credential" && v.recurrence)
      ctx.addIssue({ code: "custom", path: ["recurrence"], message: "A credential counts as long as its type's validity rule says; leave the recurrence empty." });
  });

export type RequirementCreateInput = z.infer<typeof requirementCreateSchema>;

/** Kind and what it asks for stay as created (history depends on them); the rest can change. */
export const requirementEditSchema = z.object({
  intent: z.literal(REQUIREMENT_INTENTS.update),
  requirementId: z.string().min(1),
  recurrence,
  graceDays,
  unitId: optionalId,
  role,
  regulatoryReferenceId: optionalId,
  lapseLeaves,
});

export const requirementRetireSchema = z.object({
  intent: z.literal(REQUIREMENT_INTENTS.retire),
  requirementId: z.string().min(1),
  confirm: z.literal("yes", { error: "Confirm to go ahead: press the confirming button." }),
});

export const requirementRestoreSchema = z.object({
  intent: z.literal(REQUIREMENT_INTENTS.restore),
  requirementId: z.string().min(1),
});
