/**
 * The Clearance board's address: the unit and the skill shown live in the search params, so a
 * filtered board works without JavaScript, can be bookmarked at the nurses' station and printed.
 */
import { z } from "zod";

const id = z.string().trim().max(100);

export const ClearanceSearchSchema = z.object({
  unit: id.catch(""),
  skill: id.catch(""),
});

export type ClearanceSearch = z.infer<typeof ClearanceSearchSchema>;

export function parseClearanceSearch(params: URLSearchParams): ClearanceSearch {
  return ClearanceSearchSchema.parse({ unit: params.get("unit") ?? undefined, skill: params.get("skill") ?? undefined });
}

/**
 * Why a filter cannot be shown, in words; null when it can. A unit outside the viewer's units
 * (another unit's id typed by hand, or another organisation's) and an unknown skill are named as
 * such rather than silently widened to "all".
 */
export function filterProblem(search: ClearanceSearch, unitIds: readonly string[], skillIds: readonly string[]): string | null {
  if (search.unit && !unitIds.includes(search.unit)) return "That unit is not one whose board you can see. Choose one of your units below.";
  if (search.skill && !skillIds.includes(search.skill)) return "That skill is not one of your organisation's published checklists. Choose a skill below.";
  return null;
}
