/**
 * An exam's blueprint: how many items of each topic, an optional difficulty mix, and items that
 * are always asked. Stored as JSON on exam_versions.blueprint; one zod schema checks it wherever
 * it comes from (the edit form, the seed, an import).
 */
import { z } from "zod";
import { TOPIC_SLUGS } from "~/domain/bank/item-content";

export const DIFFICULTY_BANDS = ["easy", "medium", "hard"] as const;
export type DifficultyBand = (typeof DIFFICULTY_BANDS)[number];

/**
 * An item's band from its classical difficulty p (the share who answered it right), once enough
 * people have answered it: p ≥ 0.80 easy, p < 0.50 hard, otherwise medium. The cut points are the
 * usual teaching bands (common practice, no source); an item with fewer than MIN_RESPONSES_FOR_BAND
 * answers has no band yet and is drawn as medium.
 */
export const MIN_RESPONSES_FOR_BAND = 20;
export function bandFor(p: number | null, responses: number): DifficultyBand | null {
  if (p === null || responses < MIN_RESPONSES_FOR_BAND) return null;
  if (p >= 0.8) return "easy";
  if (p < 0.5) return "hard";
  return "medium";
}

const count = z.number({ error: "Enter a number of items." }).int("Use a whole number of items.").min(0, "A topic cannot have fewer than 0 items.").max(100, "At most 100 items per topic.");

export const blueprintSchema = z
  .strictObject({
    /** Topic slug → number of items drawn from it. */
    topics: z.partialRecord(z.enum(TOPIC_SLUGS, { error: "Unknown topic." }), count),
    /** Share of each band in percent (adds up to 100); absent = no mix, any band. */
    difficulty: z
      .strictObject({ easy: z.number().min(0).max(100), medium: z.number().min(0).max(100), hard: z.number().min(0).max(100) })
      .refine((d) => Math.abs(d.easy + d.medium + d.hard - 100) < 1e-9, "The difficulty mix must add up to 100 %.")
      .optional(),
    /** Item ids always asked; each fills one place of its first topic in the blueprint with room. */
    fixed: z.array(z.string().min(1)).max(50, "At most 50 fixed items.").optional(),
  })
  .superRefine((b, ctx) => {
    const total = Object.values(b.topics).reduce((s, n) => s + (n ?? 0), 0);
    if (total === 0) ctx.addIssue({ code: "custom", path: ["topics"], message: "Give at least one topic at least one item." });
    if (total > 200) ctx.addIssue({ code: "custom", path: ["topics"], message: "An exam holds at most 200 items." });
    if (b.fixed && new Set(b.fixed).size !== b.fixed.length) ctx.addIssue({ code: "custom", path: ["fixed"], message: "A fixed item is listed twice." });
  });
export type Blueprint = z.infer<typeof blueprintSchema>;

export function blueprintTotal(b: Blueprint): number {
  return Object.values(b.topics).reduce<number>((s, n) => s + (n ?? 0), 0);
}
