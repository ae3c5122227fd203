/**
 * The Clearance board's derivation: what one person may do today on a unit, per skill (a
 * checklist) — independent, supervised or not cleared — with the reason in words.
 * Pure: no React, database or clock. The caller loads the person's records and passes `today`
 * (the organisation's calendar date); the requirement statuses come from the same status
 * engine as My plan and the Team matrix (`buildPlan`), so the board never disagrees with them.
 *
 * Rules (PRODUCT.md "Clearance"; where the brief is silent, what a department would expect —
 * common practice, no source):
 * 1. The latest signed check-off of the skill decides the starting point:
 *    - signed competent → independent, as long as the checklist requirement that applies on this
 *      unit is Current, Due soon or Waived; when that requirement is Lapsed (or Not started again:
 *      the record ran out and fresh work was assigned), the person keeps what the requirement's
 *      "a lapse leaves" says (supervised or not cleared). With no requirement renewing the skill
 *      on this unit, a competent check-off stands on its own (it does not expire).
 *    - signed "needs practice" (after any competent one) → supervised: the preceptor judged that
 *      the person must practise, which a department lets happen only under supervision, until a
 *      new check-off is signed.
 * 2. Without a competent check-off: a check-off under way (in progress, with its observer) or an
 *    active orientation plan that includes the skill → supervised (the orientee works beside
 *    their preceptor); a check-off only requested, or nothing → not cleared. A waiver excuses a
 *    renewal, never a first check-off, so a waived requirement without any competent check-off
 *    still leaves the person not cleared.
 * 3. A requirement with no skill of its own (a credential — licence, board credential, life
 *    support — or an exam) caps every skill on the units it applies to at what its lapse leaves
 *    when it is Lapsed; a credential with no card on file (Not started) caps the same way. Waived
 *    and Due soon do not cap.
 * 4. The most restrictive of these wins; the reason shown is the one that decided the level,
 *    followed by any other restriction.
 */
import { type IsoDate } from "~/domain/status/calendar-date";
import type { Status, StatusOptions } from "~/domain/status";
import { buildPlan, requirementApplies, validThroughAfter, type PlanInput, type PlanRequirement, type PlanRow } from "~/domain/status/plan";

export const CLEARANCE_LEVELS = ["independent", "supervised", "not-cleared"] as const;
export type ClearanceLevel = (typeof CLEARANCE_LEVELS)[number];
export type LapseLeaves = Exclude<ClearanceLevel, "independent">;

export const LEVEL_WORDS: Record<ClearanceLevel, string> = {
  independent: "Independent",
  supervised: "Supervised",
  "not-cleared": "Not cleared",
};

/** Higher is more freedom; the board keeps the lowest that any rule allows. */
const RANK: Record<ClearanceLevel, number> = { independent: 2, supervised: 1, "not-cleared": 0 };

export function mostRestrictive(a: ClearanceLevel, b: ClearanceLevel): ClearanceLevel {
  return RANK[a] <= RANK[b] ? a : b;
}

export type ClearanceRequirement = PlanRequirement & { lapseLeaves: LapseLeaves };

export type SkillCheckoff = {
  checklistId: string;
  status: "requested" | "in-progress" | "signed" | "acknowledged" | "cancelled";
  outcome: "competent" | "needs-practice" | null;
  /** The signing instant (ms since the epoch), to order records signed on the same day. */
  signedAt: number | null;
  /** The signing's calendar date in the organisation's time zone. */
  signedOn: IsoDate | null;
  practiceBy: IsoDate | null;
};

export type Skill = { checklistId: string; name: string };

export type ClearancePersonInput = {
  /** The person's records as My plan reads them; requirements carry what a lapse leaves. */
  plan: Omit<PlanInput, "requirements"> & { requirements: readonly ClearanceRequirement[] };
  /** Every check-off of this person, of any checklist, in any state. */
  checkoffs: readonly SkillCheckoff[];
  /** Active orientation plans: their last day and the checklists they include. */
  orientations: readonly { endsOn: IsoDate; checklistIds: readonly string[] }[];
};

export type ClearanceCell = {
  unitId: string;
  checklistId: string;
  level: ClearanceLevel;
  /** The reason that decided the level, then any other restriction, in words. */
  reason: string;
  /** The requirement that decided the level, when one did. */
  requirementId: string | null;
};

const isSigned = (c: SkillCheckoff) => (c.status === "signed" || c.status === "acknowledged") && c.outcome !== null && c.signedAt !== null;
const latest = (list: readonly SkillCheckoff[]) => list.reduce<SkillCheckoff | undefined>((best, c) => (!best || c.signedAt! > best.signedAt! ? c : best), undefined);

/** A requirement applies on a unit when it applies to the person and names this unit or none. */
function appliesOn(requirement: ClearanceRequirement, unitId: string): boolean {
  return requirement.unitId === null || requirement.unitId === unitId;
}

const HELD_OK: readonly Status[] = ["current", "due-soon", "waived"];

function leavesWords(level: LapseLeaves): string {
  return `the requirement leaves ${LEVEL_WORDS[level].toLowerCase()}`;
}

type Restriction = { level: ClearanceLevel; reason: string; requirementId: string | null };

/** What the skill's own records allow on one unit (rules 1 and 2). */
function skillLevel(
  skill: Skill,
  unitId: string,
  input: ClearancePersonInput,
  skillRequirements: readonly ClearanceRequirement[],
  rows: ReadonlyMap<string, PlanRow>,
  today: IsoDate,
): Restriction {
  const mine = input.checkoffs.filter((c) => c.checklistId === skill.checklistId);
  const signed = mine.filter(isSigned);
  const lastCompetent = latest(signed.filter((c) => c.outcome === "competent"));
  const lastPractice = latest(signed.filter((c) => c.outcome === "needs-practice"));
  if (lastPractice && (!lastCompetent || lastPractice.signedAt! > lastCompetent.signedAt!)) {
    const by = lastPractice.practiceBy ? (lastPractice.practiceBy < today ? `; practise-by date ${lastPractice.practiceBy} has passed` : `; practise by ${lastPractice.practiceBy}`) : "";
    return { level: "supervised", reason: `check-off signed ${lastPractice.signedOn} judged needs practice${by} — supervised until a new check-off is signed`, requirementId: null };
  }
  if (lastCompetent) {
    const signedOn = lastCompetent.signedOn!;
    let worst: Restriction | null = null;
    for (const req of skillRequirements) {
      const row = rows.get(req.id);
      if (!row || HELD_OK.includes(row.result.status)) continue;
      const validThrough = validThroughAfter(signedOn, req.recurrence);
      const when = validThrough ? ` ${validThrough}` : "";
      const candidate: Restriction = { level: req.lapseLeaves, reason: `${req.name} lapsed${when} (check-off signed ${signedOn}) — ${leavesWords(req.lapseLeaves)}`, requirementId: req.id };
      if (!worst || RANK[candidate.level] < RANK[worst.level]) worst = candidate;
    }
    if (worst) return worst;
    const held = skillRequirements.map((r) => ({ r, row: rows.get(r.id) })).find((x) => x.row);
    if (held?.row) {
      const { status, date, waivedThrough } = held.row.result;
      const state = status === "waived" ? `waived through ${waivedThrough}` : status === "due-soon" ? `due soon, valid through ${date}` : date ? `current through ${date}` : "current";
      return { level: "independent", reason: `check-off signed competent ${signedOn}; ${held.r.name} ${state}`, requirementId: held.r.id };
    }
    return { level: "independent", reason: `check-off signed competent ${signedOn}; no requirement renews this skill here`, requirementId: null };
  }
  if (mine.some((c) => c.status === "in-progress")) {
    return { level: "supervised", reason: "check-off under way with an observer — supervised until it is signed competent", requirementId: null };
  }
  const orientation = input.orientations.filter((o) => o.endsOn >= today && o.checklistIds.includes(skill.checklistId)).sort((a, b) => (a.endsOn < b.endsOn ? 1 : -1))[0];
  if (orientation) {
    return { level: "supervised", reason: `in orientation through ${orientation.endsOn}; not yet checked off — supervised by a preceptor`, requirementId: null };
  }
  if (mine.some((c) => c.status === "requested")) {
    return { level: "not-cleared", reason: "check-off requested, not yet observed", requirementId: null };
  }
  return { level: "not-cleared", reason: "no competent check-off on record", requirementId: null };
}

/** Rule 3: credentials and exams that cap every skill on the unit. */
function caps(unitId: string, requirements: readonly ClearanceRequirement[], rows: ReadonlyMap<string, PlanRow>): Restriction[] {
  const out: Restriction[] = [];
  for (const req of requirements) {
    if (req.kind === "checklist" || !appliesOn(req, unitId)) continue;
    const row = rows.get(req.id);
    if (!row) continue;
    const { status, date } = row.result;
    if (status === "lapsed") {
      out.push({ level: req.lapseLeaves, reason: `${req.name} lapsed${date ? ` ${date}` : ""} — ${leavesWords(req.lapseLeaves)}`, requirementId: req.id });
    } else if (status === "not-started" && req.kind === "credential") {
      out.push({ level: req.lapseLeaves, reason: `${req.name}: no card on file — ${leavesWords(req.lapseLeaves)}`, requirementId: req.id });
    }
  }
  return out;
}

/**
 * One person's clearance on each of `unitIds` × `skills`, on `options.today`. Units the person
 * does not work on are the caller's business (the board lists a unit's own people).
 */
export function deriveClearances(input: ClearancePersonInput, unitIds: readonly string[], skills: readonly Skill[], options: StatusOptions): ClearanceCell[] {
  const planRows = buildPlan(input.plan, options, { requirementsOnly: true });
  const rows = new Map<string, PlanRow>();
  for (const row of planRows) if (row.requirementId) rows.set(row.requirementId, row);
  const applying = input.plan.requirements.filter((r) => requirementApplies(r, input.plan.person));
  const cells: ClearanceCell[] = [];
  for (const unitId of unitIds) {
    const onUnit = applying.filter((r) => appliesOn(r, unitId));
    const capList = caps(unitId, onUnit, rows);
    for (const skill of skills) {
      const skillRequirements = onUnit.filter((r) => r.kind === "checklist" && r.checklistId === skill.checklistId);
      const base = skillLevel(skill, unitId, input, skillRequirements, rows, options.today);
      const all = [base, ...capList];
      // Stable: the skill's own reason wins a tie, then the caps in requirement order.
      let decided = all[0];
      for (const r of all) if (RANK[r.level] < RANK[decided.level]) decided = r;
      const others = all.filter((r) => r !== decided && RANK[r.level] < RANK.independent);
      const reason = [decided.reason, ...others.map((r) => `also: ${r.reason}`)].join("; ");
      cells.push({ unitId, checklistId: skill.checklistId, level: decided.level, reason: capitalise(reason), requirementId: decided.requirementId });
    }
  }
  return cells;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

export type LevelCounts = Record<ClearanceLevel, number>;

/** How many cells stand at each level (the board's summary line). */
export function countLevels(cells: Iterable<{ level: ClearanceLevel }>): LevelCounts {
  const counts: LevelCounts = { independent: 0, supervised: 0, "not-cleared": 0 };
  for (const c of cells) counts[c.level] += 1;
  return counts;
}
