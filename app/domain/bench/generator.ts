/**
 * Scenario generator for the question bank. Given a template id and a seed it draws the
 * parameters (within the template's ranges), runs the bench and derives the question and its
 * correct answer from the simulated readings — the same seed gives the same parameters,
 * waveforms, readings and answer every time, so an attempt stores only (template, seed).
 *
 * The answer is always computed from what the candidate is shown (rounded readings), never
 * from hidden model values, so a careful candidate can reach it exactly.
 */
import { createRandom } from "./prng";
import type { SimulationResult } from "./simulate";
import type { BreathReading, Scenario, Waveform } from "./types";
import { adaptiveComplianceFall } from "./templates/adaptive-compliance-fall";
import type { Question, ScenarioTemplate } from "./templates/kit";
import { pressureControlVolume } from "./templates/pressure-control-volume";
import { volumeControlMechanics } from "./templates/volume-control-mechanics";
import { whichAlarm } from "./templates/which-alarm";

export { ALARM_LABELS, drawFrom, shownValue } from "./templates/kit";
export type { ParameterRange, Question, ScenarioTemplate, TemplateOutput } from "./templates/kit";

export interface GeneratedItem {
  templateId: TemplateId;
  seed: number;
  /** The drawn parameters, as a resolved scenario (replayable with simulate()). */
  scenario: Scenario;
  /** The whole run (for grading, review and replay). */
  result: SimulationResult;
  /** What the candidate may see: waveforms and readings up to and including this breath. */
  visibleThroughBreath: number;
  visible: { waveform: Waveform; breaths: BreathReading[] };
  /** Named numbers shown in the stem, already rounded as displayed. */
  shown: Record<string, number>;
  question: Question;
  /** A number for numeric items, an option id for single-best-answer items. */
  answer: number | string;
  rationale: string;
}

export const SCENARIO_TEMPLATES = {
  "adaptive-compliance-fall": adaptiveComplianceFall,
  "vc-static-compliance": volumeControlMechanics("static-compliance"),
  "vc-airway-resistance": volumeControlMechanics("airway-resistance"),
  "which-alarm": whichAlarm,
  "pc-tidal-volume": pressureControlVolume,
} satisfies Record<string, ScenarioTemplate>;

export type TemplateId = keyof typeof SCENARIO_TEMPLATES;
export const TEMPLATE_IDS = Object.keys(SCENARIO_TEMPLATES) as TemplateId[];

function sliceVisible(result: SimulationResult, throughBreath: number): GeneratedItem["visible"] {
  const breaths = result.breaths.filter((b) => b.breath <= throughBreath);
  const last = breaths[breaths.length - 1];
  const endS = last ? last.startS + last.durationS : 0;
  const w = result.waveform;
  let n = 0;
  while (n < w.timeS.length && w.timeS[n] < endS - 1e-9) n++;
  return {
    breaths,
    waveform: {
      timeS: w.timeS.slice(0, n),
      pressureCmH2O: w.pressureCmH2O.slice(0, n),
      flowLpm: w.flowLpm.slice(0, n),
      volumeMl: w.volumeMl.slice(0, n),
    },
  };
}

/** Same (templateId, seed) → same item, in the browser and on the server. */
export function generateScenarioItem(templateId: TemplateId, seed: number): GeneratedItem {
  const template: ScenarioTemplate | undefined = SCENARIO_TEMPLATES[templateId];
  if (!template) throw new RangeError(`unknown scenario template "${String(templateId)}"; known: ${TEMPLATE_IDS.join(", ")}`);
  const out = template.build(createRandom(seed), seed);
  return {
    templateId,
    seed,
    ...out,
    visible: sliceVisible(out.result, out.visibleThroughBreath),
  };
}
