import { describe, expect, it } from "vitest";
import { airwayResistanceCmH2OPerLps, staticComplianceMlPerCmH2O } from "./calculations";
import { generateScenarioItem, SCENARIO_TEMPLATES, TEMPLATE_IDS, type TemplateId } from "./generator";
import { parseScenario } from "./schema";
import { simulate } from "./simulate";

const SEEDS = Array.from({ length: 40 }, (_, i) => i * 7919 + 1);

describe("scenario generator", () => {
  it.each(TEMPLATE_IDS)("%s: the same seed gives the same parameters, waveforms, readings and answer", (id) => {
    const a = generateScenarioItem(id, 12345);
    const b = generateScenarioItem(id, 12345);
    expect(b.scenario).toEqual(a.scenario);
    expect(b.result.breaths).toEqual(a.result.breaths);
    expect(Buffer.from(b.result.waveform.pressureCmH2O.buffer).equals(Buffer.from(a.result.waveform.pressureCmH2O.buffer))).toBe(true);
    expect(b.question).toEqual(a.question);
    expect(b.answer).toEqual(a.answer);
    // Replaying the stored parameters reproduces the run (what grading and review rely on).
    expect(simulate(a.scenario).breaths).toEqual(a.result.breaths);
  });

  it.each(TEMPLATE_IDS)("%s: different seeds give different items, all inside the template's ranges and valid", (id) => {
    const prompts = new Set(SEEDS.map((s) => generateScenarioItem(id, s).question.prompt));
    expect(prompts.size).toBeGreaterThan(SEEDS.length / 2);
    for (const seed of SEEDS.slice(0, 10)) {
      const item = generateScenarioItem(id, seed);
      expect(() => parseScenario(item.scenario)).not.toThrow();
      expect(item.result.breaths).toHaveLength(item.scenario.breaths);
    }
  });

  it.each(TEMPLATE_IDS)("%s: the candidate sees nothing after the visible breath", (id) => {
    const item = generateScenarioItem(id, 99);
    expect(item.visible.breaths.at(-1)!.breath).toBe(item.visibleThroughBreath);
    const last = item.visible.breaths.at(-1)!;
    expect(item.visible.waveform.timeS.at(-1)!).toBeLessThan(last.startS + last.durationS);
    expect(item.visible.waveform.timeS.length).toBe(item.visible.waveform.pressureCmH2O.length);
  });

  it("static compliance: the answer follows from the shown numbers and is close to the patient's true compliance", () => {
    for (const seed of SEEDS) {
      const item = generateScenarioItem("vc-static-compliance", seed);
      const { tidalVolumeMl, pplatCmH2O, peepCmH2O } = item.shown;
      expect(item.answer).toBeCloseTo(staticComplianceMlPerCmH2O(tidalVolumeMl, pplatCmH2O, peepCmH2O), 1);
      // No trapped gas: the set PEEP shown is the total PEEP (else the key would be wrong).
      expect(item.result.breaths.at(-1)!.totalPeepCmH2O - peepCmH2O).toBeLessThan(0.1);
      // Rounding Pplat to 0.1 cmH2O moves the answer by well under the 1 mL/cmH2O tolerance.
      expect(Math.abs((item.answer as number) - item.scenario.patient.complianceMlPerCmH2O)).toBeLessThan(1);
    }
  });

  it("airway resistance: the answer follows from the shown numbers and is close to the patient's true resistance", () => {
    for (const seed of SEEDS) {
      const item = generateScenarioItem("vc-airway-resistance", seed);
      const { pipCmH2O, pplatCmH2O, peakFlowLpm } = item.shown;
      expect(item.answer).toBeCloseTo(airwayResistanceCmH2OPerLps(pipCmH2O, pplatCmH2O, peakFlowLpm), 1);
      expect(Math.abs((item.answer as number) - item.scenario.patient.resistanceCmH2OPerLps)).toBeLessThan(0.5);
    }
  });

  it("adaptive compliance fall: the answer is the pressure aimed for three breaths after the fall, ≤ 3 cmH2O a breath", () => {
    for (const seed of SEEDS) {
      const item = generateScenarioItem("adaptive-compliance-fall", seed);
      const p = item.result.breaths.map((b) => b.inspiratoryPressureCmH2O ?? 0);
      expect(item.answer).toBeCloseTo(p[8], 1);
      expect((item.answer as number) - item.shown.pressureBeforeCmH2O).toBeLessThanOrEqual(9 + 0.11); // both sides shown to 0.1
      expect(item.answer as number).toBeGreaterThan(item.shown.pressureBeforeCmH2O);
      expect(item.visible.breaths).toHaveLength(6);
    }
  });

  it("which alarm: every situation occurs, and the keyed answer is the one alarm the breath raised", () => {
    const seen = new Set<string>();
    for (let seed = 0; seed < 200; seed++) {
      const item = generateScenarioItem("which-alarm", seed);
      const last = item.result.breaths.at(-1)!;
      expect(last.alarms).toEqual([item.answer]);
      if (item.question.kind === "single-best-answer") expect(item.question.options.map((o) => o.id)).toContain(item.answer);
      seen.add(item.answer as string);
    }
    expect([...seen].sort()).toEqual(["high-pressure", "low-exhaled-volume", "low-pressure", "volume-not-reached"]);
  });

  it("lists its templates with parameter ranges, and refuses an unknown template", () => {
    for (const id of TEMPLATE_IDS) {
      const t = SCENARIO_TEMPLATES[id];
      expect(t.id).toBe(id);
      for (const range of Object.values(t.parameterRanges)) expect(range.min).toBeLessThanOrEqual(range.max);
    }
    expect(() => generateScenarioItem("no-such-template" as TemplateId, 1)).toThrow(/unknown scenario template/);
  });
});
