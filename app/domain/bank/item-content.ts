/**
 * The portable content of one item version: what the edit form produces, what import reads and
 * export writes, what the demo bank is written in, and what is stored in item_versions
 * (type, stem, body, scenario, rationale, reference, topics). Pure: runs in the browser and on
 * the server. One zod schema validates it everywhere, so an imported row and a typed form are
 * held to the same rules.
 */
import { z } from "zod";
import { TEMPLATE_IDS, validateScenario, type TemplateId } from "~/domain/bench";
import { rangeProblems } from "./scenario-ranges";

export const ITEM_TYPE_LABELS = {
  single: "Single best answer",
  multiple: "Multiple response",
  numeric: "Numeric",
  "waveform-point": "Waveform point",
  ordering: "Ordering",
} as const;
export type ItemType = keyof typeof ITEM_TYPE_LABELS;
export const ITEM_TYPE_LIST = Object.keys(ITEM_TYPE_LABELS) as ItemType[];

/** Topic slugs (PRODUCT.md "Main objects"; seeded per organisation by seeds/catalogue.ts). */
export const TOPIC_SLUGS = [
  "cycle-variables",
  "trigger-variables",
  "limit-variables",
  "alarm-reasoning",
  "waveform-reading",
  "patient-ventilator-asynchrony",
  "lung-mechanics",
  "modes",
] as const;

const text = (what: string, max: number) =>
  z
    .string({ error: `Enter the ${what}.` })
    .trim()
    .min(1, `Enter the ${what}.`)
    .max(max, `Keep the ${what} to ${max} characters.`);

const optionList = z
  .array(text("option", 300), { error: "List the options." })
  .min(2, "Give at least two options.")
  .max(8, "Give at most eight options.")
  .refine((o) => new Set(o.map((x) => x.toLowerCase())).size === o.length, "Two options have the same wording.");

export const singleBody = z.strictObject({
  kind: z.literal("single"),
  options: optionList,
  /** Index of the one correct option (0-based). */
  correct: z.number().int().min(0),
});

export const multipleBody = z.strictObject({
  kind: z.literal("multiple"),
  options: optionList,
  /** Indexes of every correct option (0-based, ascending). */
  correct: z.array(z.number().int().min(0)).min(1, "Mark at least one option correct."),
});

export const numericBody = z.strictObject({
  kind: z.literal("numeric"),
  answer: z.number({ error: "Enter the correct answer as a number." }).finite(),
  unit: text("unit", 30),
  /** Answers within ± tolerance of the key are correct. */
  tolerance: z.number({ error: "Enter the tolerance as a number." }).min(0, "The tolerance cannot be negative."),
  /** How many decimals the therapist is asked to give. */
  decimals: z.number().int().min(0, "Decimals run from 0 to 3.").max(3, "Decimals run from 0 to 3."),
});

export const waveformPointBody = z.strictObject({
  kind: z.literal("waveform-point"),
  /** The bench scenario the waveform comes from (bench scenario file format; replayed exactly). */
  bench: z.record(z.string(), z.unknown()),
  /** The stretch of the run drawn for the therapist. */
  viewFromS: z.number().min(0),
  viewToS: z.number().positive(),
  /** A click inside [fromS, toS] is correct. */
  window: z.strictObject({ fromS: z.number().min(0), toS: z.number().positive() }),
});

export const orderingBody = z.strictObject({
  kind: z.literal("ordering"),
  /** The steps in their correct order; the therapist sees them shuffled. */
  steps: z.array(text("step", 300)).min(3, "Give at least three steps.").max(8, "Give at most eight steps."),
});

/** A scenario item's body: the question, key and tolerance come from the bench template. */
export const scenarioBody = z.strictObject({ kind: z.literal("scenario") });

export const itemBody = z.discriminatedUnion("kind", [singleBody, multipleBody, numericBody, waveformPointBody, orderingBody, scenarioBody], {
  error: "The body must say its kind: single, multiple, numeric, waveform-point, ordering or scenario.",
});
export type ItemBody = z.infer<typeof itemBody>;

export const scenarioConfig = z.strictObject({
  templateId: z.enum(TEMPLATE_IDS as [TemplateId, ...TemplateId[]], { error: `Choose a bench template (${TEMPLATE_IDS.join(", ")}).` }),
  /** Seeds the educator previews side by side (each attempt draws its own). */
  previewSeeds: z.array(z.number().int().min(0)).min(1).max(6),
  /** Narrowed parameter ranges (within the template's own); absent = the template's ranges. */
  ranges: z.record(z.string(), z.strictObject({ min: z.number(), max: z.number() })).optional(),
});
export type ScenarioConfig = z.infer<typeof scenarioConfig>;

export const itemContent = z
  .strictObject({
    type: z.enum(ITEM_TYPE_LIST as [ItemType, ...ItemType[]], { error: `Type must be one of ${ITEM_TYPE_LIST.join(", ")}.` }),
    stem: text("stem", 2000),
    topics: z
      .array(z.enum(TOPIC_SLUGS, { error: `Topics must be among ${TOPIC_SLUGS.join(", ")}.` }))
      .min(1, "Choose at least one topic.")
      .refine((t) => new Set(t).size === t.length, "A topic is listed twice."),
    body: itemBody,
    scenario: scenarioConfig.nullable(),
    rationale: text("rationale", 3000),
    reference: text("reference", 500),
  })
  .superRefine((item, ctx) => {
    const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
    const b = item.body;
    if (b.kind === "scenario") {
      if (!item.scenario) issue(["scenario"], "A scenario item needs a bench template.");
      if (item.type !== "numeric" && item.type !== "single") issue(["type"], "A scenario item is numeric or single best answer, as its template asks.");
      if (item.scenario?.ranges) {
        for (const [name, message] of Object.entries(rangeProblems(item.scenario.templateId, item.scenario.ranges))) {
          issue(name ? ["scenario", "ranges", name] : ["scenario", "ranges"], message);
        }
      }
      return;
    }
    if (item.scenario) issue(["scenario"], "Only a scenario item has a bench template.");
    const expectedType: Record<Exclude<ItemBody["kind"], "scenario">, ItemType> = {
      single: "single",
      multiple: "multiple",
      numeric: "numeric",
      "waveform-point": "waveform-point",
      ordering: "ordering",
    };
    if (expectedType[b.kind] !== item.type) issue(["type"], `The type is ${item.type} but the body is ${b.kind}.`);
    if (b.kind === "single" && b.correct >= b.options.length) issue(["body", "correct"], "The correct option is not one of the options.");
    if (b.kind === "multiple") {
      if (b.correct.some((c) => c >= b.options.length)) issue(["body", "correct"], "A correct option is not one of the options.");
      if (new Set(b.correct).size !== b.correct.length || b.correct.some((c, i) => i > 0 && c < b.correct[i - 1])) {
        issue(["body", "correct"], "List the correct options once each, in ascending order.");
      }
    }
    if (b.kind === "waveform-point") {
      const checked = validateScenario(b.bench);
      if (!checked.ok) issue(["body", "bench"], `The bench scenario is not valid: ${checked.errors.map((e) => `${e.field} ${e.message}`).join("; ")}`);
      if (b.viewToS <= b.viewFromS) issue(["body", "viewToS"], "The view must end after it starts.");
      if (b.window.toS <= b.window.fromS) issue(["body", "window"], "The correct window must end after it starts.");
      if (b.window.fromS < b.viewFromS || b.window.toS > b.viewToS) issue(["body", "window"], "The correct window must lie inside the view.");
    }
  });
export type ItemContent = z.infer<typeof itemContent>;

/** A scenario item's type follows its template's question (numeric or single best answer). */
export function isScenarioItem(content: Pick<ItemContent, "body">): boolean {
  return content.body.kind === "scenario";
}

/** Human-readable errors of one content, as "field: message" (import rows, seeds' checks). */
export function contentErrors(input: unknown): { field: string; message: string }[] {
  const result = itemContent.safeParse(input);
  if (result.success) return [];
  return result.error.issues.map((i) => ({ field: i.path.length ? i.path.join(".") : "item", message: i.message }));
}
