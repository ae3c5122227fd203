/**
 * The item form: one zod schema shared by conform in the browser and the actions. The form's
 * fields are flat (options and steps one per line, the correct options as numbers); the schema
 * turns them into an item's content and holds it to the same rules as an import
 * (app/domain/bank/item-content.ts), reporting each problem on the field that caused it.
 */
import { z } from "zod";
import { SCENARIO_TEMPLATES, type TemplateId } from "~/domain/bench";
import { itemContent, TOPIC_SLUGS, type ItemContent } from "~/domain/bank/item-content";
import { scenarioItemType } from "~/domain/bank/present";
import { canNarrow } from "~/domain/bank/scenario-ranges";
import { presetById, WAVEFORM_PRESETS } from "~/domain/bank/waveform-presets";

export const FORM_KINDS = ["single", "multiple", "numeric", "waveform-point", "ordering", "scenario"] as const;
export type FormKind = (typeof FORM_KINDS)[number];
export const FORM_KIND_LABELS: Record<FormKind, string> = {
  single: "Single best answer",
  multiple: "Multiple response",
  numeric: "Numeric",
  "waveform-point": "Waveform point",
  ordering: "Ordering",
  scenario: "Scenario (numbers drawn by the bench)",
};

const lines = (v: string | undefined) => (v ?? "").split(/\r?\n/).map((l) => l.trim()).filter(Boolean);
const numbersIn = (v: string | undefined) => (v ?? "").split(/[\s,]+/).filter(Boolean).map(Number);

export const itemFormSchema = z
  .object({
    kind: z.enum(FORM_KINDS, { error: "Choose the item type." }),
    // Text fields are optional here so that every problem is reported at once by the item's
    // own rules below (an empty field arrives from conform as undefined).
    stem: z.string().optional(),
    topics: z.preprocess((v) => (v === undefined ? [] : typeof v === "string" ? [v] : v), z.array(z.enum(TOPIC_SLUGS, { error: "Choose topics from the list." }))),
    rationale: z.string().optional(),
    reference: z.string().optional(),
    options: z.string().optional(),
    correct: z.string().optional(),
    answer: z.string().optional(),
    unit: z.string().optional(),
    tolerance: z.string().optional(),
    decimals: z.string().optional(),
    steps: z.string().optional(),
    preset: z.string().optional(),
    viewFromS: z.string().optional(),
    viewToS: z.string().optional(),
    windowFromS: z.string().optional(),
    windowToS: z.string().optional(),
    templateId: z.string().optional(),
    previewSeeds: z.string().optional(),
    /** Scenario items: the educator's narrowed ranges, `range.<parameter>.min` and `.max`. */
    range: z.record(z.string(), z.object({ min: z.string().optional(), max: z.string().optional() })).optional(),
  })
  .transform((f, ctx): ItemContent => {
    const reported = new Set<string>();
    const fail = (path: string, message: string) => {
      if (!reported.has(path)) ctx.addIssue({ code: "custom", path: [path], message });
      reported.add(path);
      return z.NEVER;
    };
    const num = (path: string, v: string | undefined, what: string) => {
      const n = Number((v ?? "").trim());
      if ((v ?? "").trim() === "" || !Number.isFinite(n)) fail(path, `Enter the ${what} as a number.`);
      return n;
    };
    let candidate: Record<string, unknown>;
    const base = { stem: f.stem ?? "", topics: f.topics, rationale: f.rationale ?? "", reference: f.reference ?? "", scenario: null };
    switch (f.kind) {
      case "single": {
        const c = numbersIn(f.correct);
        if (c.length !== 1 || !Number.isInteger(c[0]) || c[0] < 1) fail("correct", "Enter the number of the one correct option, like 2.");
        candidate = { ...base, type: "single", body: { kind: "single", options: lines(f.options), correct: c[0] - 1 } };
        break;
      }
      case "multiple": {
        const c = numbersIn(f.correct);
        if (c.length === 0 || c.some((n) => !Number.isInteger(n) || n < 1)) fail("correct", "Enter the numbers of the correct options, like 1, 3.");
        candidate = { ...base, type: "multiple", body: { kind: "multiple", options: lines(f.options), correct: [...new Set(c)].sort((a, b) => a - b).map((n) => n - 1) } };
        break;
      }
      case "numeric":
        candidate = {
          ...base,
          type: "numeric",
          body: { kind: "numeric", answer: num("answer", f.answer, "answer"), unit: (f.unit ?? "").trim(), tolerance: num("tolerance", f.tolerance, "tolerance"), decimals: num("decimals", f.decimals, "number of decimals") },
        };
        break;
      case "ordering":
        candidate = { ...base, type: "ordering", body: { kind: "ordering", steps: lines(f.steps) } };
        break;
      case "waveform-point": {
        const preset = presetById(f.preset ?? "");
        if (!preset) return fail("preset", "Choose the bench run to draw.");
        candidate = {
          ...base,
          type: "waveform-point",
          body: {
            kind: "waveform-point",
            bench: preset.bench,
            viewFromS: num("viewFromS", f.viewFromS, "start of the view"),
            viewToS: num("viewToS", f.viewToS, "end of the view"),
            window: { fromS: num("windowFromS", f.windowFromS, "start of the correct window"), toS: num("windowToS", f.windowToS, "end of the correct window") },
          },
        };
        break;
      }
      case "scenario": {
        const template = SCENARIO_TEMPLATES[f.templateId as TemplateId];
        if (!template) return fail("templateId", "Choose a bench template.");
        const seeds = numbersIn(f.previewSeeds);
        if (seeds.length < 1 || seeds.length > 6 || seeds.some((s) => !Number.isInteger(s) || s < 0)) fail("previewSeeds", "Enter one to six whole-number seeds, like 1, 2, 3.");
        // The template decides the question's kind: its answer is computed, never typed.
        // Only ranges the educator narrowed are stored; the template's own need no copy.
        const ranges: Record<string, { min: number; max: number }> = {};
        if (canNarrow(f.templateId as TemplateId)) {
          for (const [name, full] of Object.entries(template.parameterRanges)) {
            const given = f.range?.[name];
            const min = given?.min === undefined ? full.min : Number(given.min);
            const max = given?.max === undefined ? full.max : Number(given.max);
            if (!Number.isFinite(min) || !Number.isFinite(max)) fail(`range.${name}`, "Enter both ends as numbers.");
            else if (min !== full.min || max !== full.max) ranges[name] = { min, max };
          }
        }
        candidate = {
          ...base,
          type: scenarioItemType(f.templateId as TemplateId),
          body: { kind: "scenario" },
          scenario: { templateId: f.templateId, previewSeeds: seeds, ...(Object.keys(ranges).length ? { ranges } : {}) },
        };
        break;
      }
    }
    const checked = itemContent.safeParse(candidate);
    if (checked.success && reported.size === 0) return checked.data;
    if (checked.success) return z.NEVER;
    const FIELD_OF: Record<string, string> = {
      "body.options": "options",
      "body.correct": "correct",
      "body.answer": "answer",
      "body.unit": "unit",
      "body.tolerance": "tolerance",
      "body.decimals": "decimals",
      "body.steps": "steps",
      "body.bench": "preset",
      "body.viewFromS": "viewFromS",
      "body.viewToS": "viewToS",
      "body.window": "windowToS",
      "body.window.fromS": "windowFromS",
      "body.window.toS": "windowToS",
      "scenario.templateId": "templateId",
      "scenario.previewSeeds": "previewSeeds",
      type: "kind",
    };
    for (const issue of checked.error.issues) {
      const path = issue.path.filter((p) => typeof p === "string").join(".");
      if (path.startsWith("scenario.ranges")) {
        fail(path === "scenario.ranges" ? "range" : `range.${path.slice("scenario.ranges.".length)}`, issue.message);
        continue;
      }
      const top = FIELD_OF[path] ?? FIELD_OF[issue.path.slice(0, 2).join(".")] ?? (path.split(".")[0] || "stem");
      fail(top === "body" ? "stem" : top, issue.message);
    }
    return z.NEVER;
  });

export type ItemFormValues = z.input<typeof itemFormSchema>;

/** The form's starting values for an existing version's content (ranges nested, as conform reads them). */
export function formValuesOf(c: ItemContent): Record<string, string | string[] | Record<string, { min: string; max: string }>> {
  const base = { stem: c.stem, topics: c.topics, rationale: c.rationale, reference: c.reference };
  const b = c.body;
  switch (b.kind) {
    case "single":
      return { ...base, kind: "single", options: b.options.join("\n"), correct: String(b.correct + 1) };
    case "multiple":
      return { ...base, kind: "multiple", options: b.options.join("\n"), correct: b.correct.map((n) => n + 1).join(", ") };
    case "numeric":
      return { ...base, kind: "numeric", answer: String(b.answer), unit: b.unit, tolerance: String(b.tolerance), decimals: String(b.decimals) };
    case "ordering":
      return { ...base, kind: "ordering", steps: b.steps.join("\n") };
    case "waveform-point": {
      const preset = WAVEFORM_PRESETS.find((p) => JSON.stringify(p.bench) === JSON.stringify(b.bench));
      return {
        ...base,
        kind: "waveform-point",
        preset: preset?.id ?? "",
        viewFromS: String(b.viewFromS),
        viewToS: String(b.viewToS),
        windowFromS: String(b.window.fromS),
        windowToS: String(b.window.toS),
      };
    }
    case "scenario":
      return {
        ...base,
        kind: "scenario",
        templateId: c.scenario?.templateId ?? "",
        previewSeeds: (c.scenario?.previewSeeds ?? []).join(", "),
        ...(c.scenario?.ranges ? { range: Object.fromEntries(Object.entries(c.scenario.ranges).map(([k, r]) => [k, { min: String(r.min), max: String(r.max) }])) } : {}),
      };
  }
}
