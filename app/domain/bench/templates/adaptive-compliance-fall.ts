/**
 * "Compliance falls during adaptive pressure control; what pressure does the machine aim for
 * three breaths later?" Tests the adaptive controller's rule: at most one step (3 cmH2O by
 * default) per breath toward the set volume, never above the high-pressure limit − margin.
 */
import { simulate } from "../simulate";
import { drawFrom, shownValue, type ScenarioTemplate } from "./kit";

const FALL_BREATH = 6;
const ASK_BREATH = FALL_BREATH + 3;

const ranges = {
  tidalVolumeMl: { min: 400, max: 600, step: 50, unit: "mL" },
  complianceMlPerCmH2O: { min: 40, max: 60, step: 5, unit: "mL/cmH2O" },
  fallPercent: { min: 40, max: 60, step: 5, unit: "% of the starting compliance" },
  resistanceCmH2OPerLps: { min: 5, max: 15, step: 1, unit: "cmH2O/(L/s)" },
  peepCmH2O: { min: 5, max: 10, step: 1, unit: "cmH2O" },
  inspiratoryTimeS: { min: 0.8, max: 1.2, step: 0.1, unit: "s" },
  rateBpm: { min: 12, max: 20, step: 2, unit: "breaths/min" },
  highPressureCmH2O: { min: 40, max: 50, step: 5, unit: "cmH2O" },
};

export const adaptiveComplianceFall: ScenarioTemplate = {
  id: "adaptive-compliance-fall",
  title: "Adaptive pressure control: inspiratory pressure three breaths after compliance falls",
  topics: ["modes", "lung mechanics"],
  parameterRanges: ranges,
  build(random, seed) {
    const p = Object.fromEntries(Object.entries(ranges).map(([k, r]) => [k, drawFrom(random, r)])) as Record<keyof typeof ranges, number>;
    const fallenCompliance = Math.round((p.complianceMlPerCmH2O * p.fallPercent) / 100);
    const result = simulate({
      mode: "adaptive-pressure",
      settings: { tidalVolumeMl: p.tidalVolumeMl, inspiratoryTimeS: p.inspiratoryTimeS, rateBpm: p.rateBpm, peepCmH2O: p.peepCmH2O },
      limits: { highPressureCmH2O: p.highPressureCmH2O },
      patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
      events: [{ atBreath: FALL_BREATH, set: { complianceMlPerCmH2O: fallenCompliance } }],
      breaths: ASK_BREATH,
      seed,
    });
    const st = result.scenario.settings;
    const before = result.breaths[FALL_BREATH - 2];
    const fallen = result.breaths[FALL_BREATH - 1];
    const asked = result.breaths[ASK_BREATH - 1];
    const upper = p.highPressureCmH2O - st.adaptiveMarginCmH2O - p.peepCmH2O;
    const shown = {
      setTidalVolumeMl: p.tidalVolumeMl,
      pressureBeforeCmH2O: shownValue(before.inspiratoryPressureCmH2O ?? 0, 1),
      vtiAfterFallMl: shownValue(fallen.vtiMl, 0),
      stepCmH2O: st.adaptiveStepCmH2O,
      highPressureCmH2O: p.highPressureCmH2O,
      marginCmH2O: st.adaptiveMarginCmH2O,
      peepCmH2O: p.peepCmH2O,
    };
    const answer = shownValue(asked.inspiratoryPressureCmH2O ?? 0, 1);
    const path = result.breaths
      .slice(FALL_BREATH - 1, ASK_BREATH)
      .map((b) => `breath ${b.breath}: ${shownValue(b.inspiratoryPressureCmH2O ?? 0, 1)}`)
      .join(", ");
    return {
      scenario: result.scenario,
      result,
      visibleThroughBreath: FALL_BREATH,
      shown,
      question: {
        kind: "numeric",
        prompt:
          `Adaptive pressure control, set tidal volume ${shown.setTidalVolumeMl} mL, PEEP ${shown.peepCmH2O} cmH2O, high-pressure limit ${shown.highPressureCmH2O} cmH2O. ` +
          `The machine aimed for ${shown.pressureBeforeCmH2O} cmH2O above PEEP before compliance fell at breath ${FALL_BREATH}; that breath inspired ${shown.vtiAfterFallMl} mL. ` +
          `It changes the pressure by at most ${shown.stepCmH2O} cmH2O per breath and stays at least ${shown.marginCmH2O} cmH2O under the high-pressure limit. ` +
          `What inspiratory pressure above PEEP does it aim for at breath ${ASK_BREATH}?`,
        unit: "cmH2O",
        tolerance: 1,
      },
      answer,
      rationale:
        `The controller moves toward the pressure that would deliver the set volume at the new compliance, at most ${shown.stepCmH2O} cmH2O per breath, ` +
        `upper bound ${shownValue(upper, 1)} cmH2O above PEEP (high-pressure limit − margin − PEEP). Pressures aimed for: ${path}.`,
    };
  },
};
