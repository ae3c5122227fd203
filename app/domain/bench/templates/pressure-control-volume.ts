/**
 * "Pressure control, passive patient: what tidal volume does the breath deliver?" The answer
 * is the exponential filling of one compartment, Vt = C·ΔP·(1 − e^(−Ti/τ)), τ = R·C (Yartsev A,
 * Deranged Physiology, "Time constants"; shared/TESTING.md V17), computed from the numbers the
 * stem shows; the bench's own simulated volume is kept for review and checked against it in
 * the tests. Added for the question bank (issue 4); the simulator is unchanged.
 */
import { pressureControlTidalVolumeMl, timeConstantS } from "../calculations";
import { simulate } from "../simulate";
import { drawFrom, shownValue, type ScenarioTemplate } from "./kit";

const SHOWN_BREATH = 2;

const ranges = {
  pressureAbovePeepCmH2O: { min: 10, max: 20, step: 1, unit: "cmH2O" },
  inspiratoryTimeS: { min: 0.6, max: 1.2, step: 0.1, unit: "s" },
  complianceMlPerCmH2O: { min: 25, max: 60, step: 5, unit: "mL/cmH2O" },
  resistanceCmH2OPerLps: { min: 5, max: 20, step: 1, unit: "cmH2O/(L/s)" },
  peepCmH2O: { min: 5, max: 10, step: 1, unit: "cmH2O" },
  // A cycle of at least 5 s leaves ≥ 3.8 s to exhale, over 3 τ at the largest τ (1.2 s): the
  // lung starts each breath near its relaxed volume, as the formula assumes.
  rateBpm: { min: 8, max: 12, step: 2, unit: "breaths/min" },
};

export const pressureControlVolume: ScenarioTemplate = {
  id: "pc-tidal-volume",
  title: "Pressure control, passive patient: tidal volume from pressure, time, compliance and resistance",
  topics: ["lung mechanics", "modes"],
  parameterRanges: ranges,
  build(random, seed) {
    const p = Object.fromEntries(Object.entries(ranges).map(([k, r]) => [k, drawFrom(random, r)])) as Record<keyof typeof ranges, number>;
    const result = simulate({
      mode: "pressure-control",
      settings: { inspiratoryPressureCmH2O: p.pressureAbovePeepCmH2O, inspiratoryTimeS: p.inspiratoryTimeS, rateBpm: p.rateBpm, peepCmH2O: p.peepCmH2O },
      limits: { highPressureCmH2O: 60 },
      patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
      breaths: SHOWN_BREATH,
      seed,
    });
    const shown = { ...p, timeConstantS: shownValue(timeConstantS(p.resistanceCmH2OPerLps, p.complianceMlPerCmH2O), 2) };
    const answer = shownValue(pressureControlTidalVolumeMl(p.complianceMlPerCmH2O, p.pressureAbovePeepCmH2O, p.inspiratoryTimeS, p.resistanceCmH2OPerLps), 0);
    return {
      scenario: result.scenario,
      result,
      visibleThroughBreath: SHOWN_BREATH,
      shown,
      question: {
        kind: "numeric",
        prompt:
          `Pressure control, passive patient: ${p.pressureAbovePeepCmH2O} cmH2O above PEEP ${p.peepCmH2O} cmH2O for ${p.inspiratoryTimeS} s. ` +
          `Compliance ${p.complianceMlPerCmH2O} mL/cmH2O, resistance ${p.resistanceCmH2OPerLps} cmH2O/(L/s). What tidal volume does each breath deliver?`,
        unit: "mL",
        // Generous enough for e^(−Ti/τ) worked by hand, and above the bench's own breath, which
        // differs from the closed form by at most about 9 mL over the ranges (tested).
        tolerance: 15,
      },
      answer,
      rationale:
        `τ = R × C = ${p.resistanceCmH2OPerLps} × ${p.complianceMlPerCmH2O / 1000} = ${shown.timeConstantS} s; ` +
        `Vt = C × ΔP × (1 − e^(−Ti/τ)) = ${p.complianceMlPerCmH2O} × ${p.pressureAbovePeepCmH2O} × (1 − e^(−${p.inspiratoryTimeS}/${shown.timeConstantS})) = ${answer} mL.`,
    };
  },
};
