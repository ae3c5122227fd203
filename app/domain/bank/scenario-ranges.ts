/**
 * Educator-set parameter ranges for scenario items. The bench templates draw every parameter
 * from their own ranges; an educator may narrow them (say, only adult volumes of 450–550 mL).
 * The simulator and templates stay untouched: for an attempt's seed we try a fixed, derived
 * sequence of template seeds and take the first whose drawn parameters all fall inside the
 * educator's ranges. The sequence depends only on the seed, so the same (item version, seed)
 * always gives the same item, and replay is exact.
 *
 * Narrowing is refused when fewer than 1 in MIN_ACCEPTANCE draws would fit: with MAX_TRIES
 * tries the chance of finding none is then below (1 − 1/20)^400 ≈ 1e-9.
 */
import { generateScenarioItem, mixSeed, SCENARIO_TEMPLATES, type GeneratedItem, type ParameterRange, type TemplateId } from "~/domain/bench";

export type RangeOverride = Record<string, { min: number; max: number }>;

export const MAX_TRIES = 400;
export const MIN_ACCEPTANCE = 1 / 20;

type Reader = (g: GeneratedItem) => Record<string, number>;

const fromScenario: Reader = (g) => ({ ...g.scenario.settings, ...g.scenario.patient, ...g.scenario.limits }) as unknown as Record<string, number>;

/** How to read each template's drawn parameters back from the item it built. */
const READERS: Partial<Record<TemplateId, Reader>> = {
  "vc-static-compliance": fromScenario,
  "vc-airway-resistance": fromScenario,
  "pc-tidal-volume": (g) => ({ ...fromScenario(g), pressureAbovePeepCmH2O: g.scenario.settings.inspiratoryPressureCmH2O }),
  "adaptive-compliance-fall": (g) => {
    const base = fromScenario(g);
    const fallen = g.scenario.events[0]?.set.complianceMlPerCmH2O ?? base.complianceMlPerCmH2O;
    const range = SCENARIO_TEMPLATES["adaptive-compliance-fall"].parameterRanges.fallPercent;
    // The template rounds C × fall% to whole mL/cmH2O; the grid steps are far enough apart to invert.
    let fallPercent = Number.NaN;
    for (let f = range.min; f <= range.max + 1e-9; f += range.step) if (Math.round((base.complianceMlPerCmH2O * f) / 100) === fallen) fallPercent = f;
    return { ...base, fallPercent };
  },
};

/** Whether the educator may narrow this template's ranges (its parameters can be read back). */
export function canNarrow(templateId: TemplateId): boolean {
  return READERS[templateId] !== undefined;
}

function gridCount(min: number, max: number, step: number): number {
  return Math.floor((max - min) / step + 1e-9) + 1;
}

/** Problems with an override, by parameter name ("" for the whole set). */
export function rangeProblems(templateId: TemplateId, ranges: RangeOverride): Record<string, string> {
  const problems: Record<string, string> = {};
  const template = SCENARIO_TEMPLATES[templateId];
  if (!canNarrow(templateId) && Object.keys(ranges).length > 0) problems[""] = "This template's ranges cannot be narrowed.";
  let acceptance = 1;
  for (const [name, r] of Object.entries(ranges)) {
    const full: ParameterRange | undefined = template.parameterRanges[name];
    if (!full) {
      problems[name] = `The template has no parameter ${name}.`;
      continue;
    }
    const onGrid = (x: number) => Math.abs((x - full.min) / full.step - Math.round((x - full.min) / full.step)) < 1e-6;
    if (!(r.min <= r.max)) problems[name] = "The lowest value must not be above the highest.";
    else if (r.min < full.min - 1e-9 || r.max > full.max + 1e-9) problems[name] = `Stay within ${full.min}–${full.max} ${full.unit}.`;
    else if (!onGrid(r.min) || !onGrid(r.max)) problems[name] = `Use steps of ${full.step} ${full.unit} from ${full.min}.`;
    else acceptance *= gridCount(r.min, r.max, full.step) / gridCount(full.min, full.max, full.step);
  }
  if (Object.keys(problems).length === 0 && acceptance < MIN_ACCEPTANCE) {
    problems[""] = `These ranges keep only ${(acceptance * 100).toFixed(1)} % of the template's draws; widen them to keep at least ${MIN_ACCEPTANCE * 100} %.`;
  }
  return problems;
}

function fits(values: Record<string, number>, ranges: RangeOverride): boolean {
  return Object.entries(ranges).every(([k, r]) => values[k] >= r.min - 1e-9 && values[k] <= r.max + 1e-9);
}

/** The item for an attempt's seed, inside the educator's ranges when there are any. */
export function drawScenario(templateId: TemplateId, seed: number, ranges: RangeOverride | undefined): GeneratedItem {
  const read = READERS[templateId];
  if (!ranges || Object.keys(ranges).length === 0 || !read) return generateScenarioItem(templateId, seed);
  for (let k = 0; k < MAX_TRIES; k++) {
    // Try 0 is the seed itself; later tries walk a mixed sequence derived from it.
    const candidate = generateScenarioItem(templateId, k === 0 ? seed : mixSeed((seed >>> 0) + k * 0x9e3779b1));
    if (fits(read(candidate), ranges)) return candidate;
  }
  throw new Error(`No draw of ${templateId} within the set ranges after ${MAX_TRIES} tries for seed ${seed}`);
}
