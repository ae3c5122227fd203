/**
 * "PIP and Pplat in volume control with an end-inspiratory pause": compute static compliance
 * Cstat = Vt/(Pplat − PEEP), or airway resistance Raw = (PIP − Pplat)/V̇ (constant flow).
 * Formulas: TESTING.md (Chatburn, Respir Care 2014; OpenAnesthesia, "Peak vs. plateau
 * airway pressure"). The answer uses the rounded readings the candidate sees.
 */
import { airwayResistanceCmH2OPerLps, staticComplianceMlPerCmH2O } from "../calculations";
import { simulate } from "../simulate";
import { drawFrom, shownValue, type ScenarioTemplate } from "./kit";

const SHOWN_BREATH = 3;

const ranges = {
  tidalVolumeMl: { min: 350, max: 600, step: 50, unit: "mL" },
  peakFlowLpm: { min: 40, max: 70, step: 5, unit: "L/min" },
  // τ ≤ 60 mL/cmH2O × 12 cmH2O/(L/s) = 0.72 s and a cycle ≥ 5 s leave ≥ 3.5 s (≈ 5 τ) to
  // exhale: no trapped gas, so total PEEP equals the set PEEP the stem shows.
  complianceMlPerCmH2O: { min: 30, max: 60, step: 5, unit: "mL/cmH2O" },
  resistanceCmH2OPerLps: { min: 5, max: 12, step: 1, unit: "cmH2O/(L/s)" },
  peepCmH2O: { min: 5, max: 12, step: 1, unit: "cmH2O" },
  rateBpm: { min: 8, max: 12, step: 2, unit: "breaths/min" },
  pauseS: { min: 0.3, max: 0.6, step: 0.1, unit: "s" },
};

export function volumeControlMechanics(asks: "static-compliance" | "airway-resistance"): ScenarioTemplate {
  const compliance = asks === "static-compliance";
  return {
    id: compliance ? "vc-static-compliance" : "vc-airway-resistance",
    title: compliance
      ? "Volume control with a pause: static compliance from PIP and Pplat"
      : "Volume control with a pause: airway resistance from PIP, Pplat and flow",
    topics: ["lung mechanics", "waveform reading"],
    parameterRanges: ranges,
    build(random, seed) {
      const p = Object.fromEntries(Object.entries(ranges).map(([k, r]) => [k, drawFrom(random, r)])) as Record<keyof typeof ranges, number>;
      const result = simulate({
        mode: "volume-control",
        settings: { tidalVolumeMl: p.tidalVolumeMl, peakFlowLpm: p.peakFlowLpm, flowPattern: "constant", rateBpm: p.rateBpm, peepCmH2O: p.peepCmH2O, pauseS: p.pauseS },
        limits: { highPressureCmH2O: 60 },
        patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
        breaths: SHOWN_BREATH,
        seed,
      });
      const b = result.breaths[SHOWN_BREATH - 1];
      const shown = {
        tidalVolumeMl: shownValue(b.vtiMl, 0),
        pipCmH2O: shownValue(b.pipCmH2O, 1),
        pplatCmH2O: shownValue(b.pplatCmH2O ?? Number.NaN, 1),
        peepCmH2O: p.peepCmH2O,
        peakFlowLpm: shownValue(b.peakFlowLpm, 0),
      };
      const stem =
        `Volume control, constant flow ${shown.peakFlowLpm} L/min, with an end-inspiratory pause. ` +
        `Readings: tidal volume ${shown.tidalVolumeMl} mL, PIP ${shown.pipCmH2O} cmH2O, Pplat ${shown.pplatCmH2O} cmH2O, PEEP ${shown.peepCmH2O} cmH2O. `;
      if (compliance) {
        const answer = shownValue(staticComplianceMlPerCmH2O(shown.tidalVolumeMl, shown.pplatCmH2O, shown.peepCmH2O), 1);
        return {
          scenario: result.scenario,
          result,
          visibleThroughBreath: SHOWN_BREATH,
          shown,
          question: { kind: "numeric", prompt: `${stem}What is the static compliance?`, unit: "mL/cmH2O", tolerance: 1 },
          answer,
          rationale: `Static compliance = Vt / (Pplat − PEEP) = ${shown.tidalVolumeMl} / (${shown.pplatCmH2O} − ${shown.peepCmH2O}) = ${answer} mL/cmH2O. PIP is not used: it includes the resistive pressure.`,
        };
      }
      const answer = shownValue(airwayResistanceCmH2OPerLps(shown.pipCmH2O, shown.pplatCmH2O, shown.peakFlowLpm), 1);
      return {
        scenario: result.scenario,
        result,
        visibleThroughBreath: SHOWN_BREATH,
        shown,
        question: { kind: "numeric", prompt: `${stem}What is the airway resistance?`, unit: "cmH2O/(L/s)", tolerance: 0.5 },
        answer,
        rationale: `Raw = (PIP − Pplat) / flow, with flow in L/s (${shown.peakFlowLpm} L/min ÷ 60, not rounded): (${shown.pipCmH2O} − ${shown.pplatCmH2O}) / ${shownValue(shown.peakFlowLpm / 60, 3)} = ${answer} cmH2O/(L/s).`,
      };
    },
  };
}
