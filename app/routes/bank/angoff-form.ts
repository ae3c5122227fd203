/**
 * The Angoff rating form (issue 6, item 3): one schema shared by conform in the browser and the
 * cut-score action. Each field `rating.<itemId>` is a percent from 0 to 100 — the judge's
 * estimate of the chance that a minimally competent therapist answers that item correctly —
 * or blank for "not rated". The schema turns percents into estimates from 0 to 1, as stored.
 */
import { z } from "zod";

export const ANGOFF_ROUNDS = ["1", "2"] as const;
export type AngoffRound = 1 | 2;

export const RATE_INTENT = "rate";
export const ADOPT_INTENT = "adopt";

/** A percent as typed: "85", "85.5", "85,5" or "85 %". Returns null for blank, NaN for anything else. */
export function readPercent(raw: string | undefined): number | null {
  const text = (raw ?? "").trim().replace(/\s*%$/, "").replace(",", ".");
  if (text === "") return null;
  if (!/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(text)) return Number.NaN;
  return Number(text);
}

export type RatingSubmission = { round: AngoffRound; ratings: Record<string, number | null> };

export const ratingFormSchema = z
  .object({
    intent: z.string().optional(),
    round: z.enum(ANGOFF_ROUNDS, { error: "Choose round 1 or round 2." }),
    /** `rating.<itemId>`: percent or blank. */
    rating: z.record(z.string(), z.string().optional()).optional(),
  })
  .transform((f, ctx): RatingSubmission => {
    const ratings: Record<string, number | null> = {};
    for (const [itemId, raw] of Object.entries(f.rating ?? {})) {
      const percent = readPercent(raw);
      if (percent === null) {
        ratings[itemId] = null;
      } else if (Number.isNaN(percent)) {
        ctx.addIssue({ code: "custom", path: ["rating", itemId], message: `"${(raw ?? "").trim().slice(0, 20)}" is not a number. Enter a percent from 0 to 100, or leave it blank.` });
      } else if (percent < 0 || percent > 100) {
        ctx.addIssue({ code: "custom", path: ["rating", itemId], message: `${percent} % is outside 0 to 100 %: a chance is at most 100 % and at least 0 %.` });
      } else {
        // Stored as a chance from 0 to 1 (angoff_ratings.rating).
        ratings[itemId] = percent / 100;
      }
    }
    return { round: Number(f.round) as AngoffRound, ratings };
  });

/** The adopted pass mark: the panel's cut percent rounded half up to one decimal (the pass mark field's precision). */
export function adoptedPercent(cutPercent: number): number {
  return Math.round(cutPercent * 10) / 10;
}
