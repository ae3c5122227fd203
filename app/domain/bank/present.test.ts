import { describe, expect, it } from "vitest";
import { airwayResistanceCmH2OPerLps, generateScenarioItem, staticComplianceMlPerCmH2O, TEMPLATE_IDS } from "~/domain/bench";
import { itemContent, type ItemContent } from "./item-content";
import { fillStem, gradeResponse, placeholderNames, placeholdersIn, presentItem, scenarioItemType } from "./present";

const base = { topics: ["lung-mechanics"] as ItemContent["topics"], rationale: "Because.", reference: "Chatburn RL. Respir Care. 2014;59(11):1747–63." };

function scenarioItem(templateId: (typeof TEMPLATE_IDS)[number]): ItemContent {
  const names = placeholderNames(generateScenarioItem(templateId, 1));
  return itemContent.parse({
    ...base,
    type: scenarioItemType(templateId),
    stem: names.map((n) => `{${n}}`).join(" / "),
    body: { kind: "scenario" },
    scenario: { templateId, previewSeeds: [1, 2, 3] },
  });
}

describe("scenario items from every bench template", () => {
  it.each(TEMPLATE_IDS)("%s: the same seed gives the same stem, waveform and answer; placeholders are all filled", (id) => {
    const item = scenarioItem(id);
    for (const seed of [1, 7, 123, 4096]) {
      const a = presentItem(item, seed);
      const b = presentItem(item, seed);
      expect(b.presented.stem).toBe(a.presented.stem);
      expect(b.key).toEqual(a.key);
      expect(Array.from(b.generated!.visible.waveform.flowLpm)).toEqual(Array.from(a.generated!.visible.waveform.flowLpm));
      expect(placeholdersIn(a.presented.stem)).toEqual([]);
    }
    // Different seeds draw different numbers (otherwise the preview side by side would be pointless).
    const stems = new Set([1, 2, 3, 4, 5, 6].map((s) => presentItem(item, s).presented.stem));
    expect(stems.size).toBeGreaterThan(1);
  });

  it("static compliance and resistance keys agree with the bench's calculation functions for the numbers shown", () => {
    // Formulas: Cstat = Vt/(Pplat − PEEP); Raw = (PIP − Pplat)/V̇ (shared/TESTING.md; Chatburn, Respir Care 2014).
    for (const seed of [1, 2, 3, 50, 99]) {
      const c = presentItem(scenarioItem("vc-static-compliance"), seed);
      const s = c.generated!.shown;
      expect(c.key.kind === "numeric" && c.key.answer).toBeCloseTo(staticComplianceMlPerCmH2O(s.tidalVolumeMl, s.pplatCmH2O, s.peepCmH2O), 1);
      const r = presentItem(scenarioItem("vc-airway-resistance"), seed);
      const t = r.generated!.shown;
      expect(r.key.kind === "numeric" && r.key.answer).toBeCloseTo(airwayResistanceCmH2OPerLps(t.pipCmH2O, t.pplatCmH2O, t.peakFlowLpm), 1);
    }
  });

  it("adaptive compliance fall: the key is the pressure the bench aimed for three breaths after the fall", () => {
    for (const seed of [1, 2, 3]) {
      const p = presentItem(scenarioItem("adaptive-compliance-fall"), seed);
      expect(p.key.kind === "numeric" && p.key.answer).toBeCloseTo(p.generated!.result.breaths[8].inspiratoryPressureCmH2O!, 1);
    }
  });

  it("which alarm: the keyed option is the one alarm the bench raised on the asked breath", () => {
    for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
      const p = presentItem(scenarioItem("which-alarm"), seed);
      expect(p.presented.kind).toBe("single");
      if (p.presented.kind !== "single" || p.key.kind !== "single") continue;
      const raised = p.generated!.result.breaths.at(-1)!.alarms;
      const labels: Record<string, string> = { "high-pressure": "High pressure", "low-pressure": "Low pressure", "low-exhaled-volume": "Low exhaled tidal volume", "volume-not-reached": "Volume target not reached" };
      expect(p.key.text).toBe(labels[raised[0]]);
    }
  });

  it("an unknown placeholder stays visible, so the educator sees the typo in the preview", () => {
    expect(fillStem("Vt {tidalVolumeMl} mL, {nosuch}", generateScenarioItem("vc-static-compliance", 1))).toMatch(/^Vt \d+ mL, \{nosuch\}$/);
  });
});

describe("grading", () => {
  const single: ItemContent = itemContent.parse({ ...base, type: "single", stem: "Q", body: { kind: "single", options: ["a", "b", "c"], correct: 1 }, scenario: null });
  const multiple: ItemContent = itemContent.parse({ ...base, type: "multiple", stem: "Q", body: { kind: "multiple", options: ["a", "b", "c", "d"], correct: [0, 2] }, scenario: null });
  const numeric: ItemContent = itemContent.parse({ ...base, type: "numeric", stem: "Q", body: { kind: "numeric", answer: 33.3, unit: "mL/cmH2O", tolerance: 0.1, decimals: 1 }, scenario: null });
  const ordering: ItemContent = itemContent.parse({ ...base, type: "ordering", stem: "Q", body: { kind: "ordering", steps: ["one", "two", "three", "four"] }, scenario: null });

  it("single best answer and multiple response are all or nothing; options are shuffled the same way per seed", () => {
    const p = presentItem(single, 5);
    expect(p.presented).toEqual(presentItem(single, 5).presented);
    expect(gradeResponse(p.key, { kind: "single", choice: 1 })).toBe(true);
    expect(gradeResponse(p.key, { kind: "single", choice: 0 })).toBe(false);
    const m = presentItem(multiple, 5).key;
    expect(gradeResponse(m, { kind: "multiple", choices: [2, 0] })).toBe(true);
    expect(gradeResponse(m, { kind: "multiple", choices: [0] })).toBe(false);
    expect(gradeResponse(m, { kind: "multiple", choices: [0, 1, 2] })).toBe(false);
  });

  it("numeric answers are correct within the tolerance, inclusive", () => {
    const k = presentItem(numeric, 1).key;
    expect(gradeResponse(k, { kind: "numeric", value: 33.4 })).toBe(true);
    expect(gradeResponse(k, { kind: "numeric", value: 33.2 })).toBe(true);
    expect(gradeResponse(k, { kind: "numeric", value: 33.5 })).toBe(false);
    expect(gradeResponse(k, { kind: "numeric", value: Number.NaN })).toBe(false);
  });

  it("ordering is never shown already in order, and only the full correct order scores", () => {
    for (let seed = 0; seed < 30; seed++) {
      const p = presentItem(ordering, seed);
      if (p.presented.kind !== "ordering") throw new Error("kind");
      expect(p.presented.steps.map((s) => s.id)).not.toEqual([0, 1, 2, 3]);
    }
    const k = presentItem(ordering, 1).key;
    expect(gradeResponse(k, { kind: "ordering", order: [0, 1, 2, 3] })).toBe(true);
    expect(gradeResponse(k, { kind: "ordering", order: [1, 0, 2, 3] })).toBe(false);
  });

  it("a waveform point is correct inside the marked window, edges included", () => {
    const wp = itemContent.parse({
      ...base,
      type: "waveform-point",
      stem: "Q",
      body: { kind: "waveform-point", bench: { mode: "pressure-control", settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 40, resistanceCmH2OPerLps: 10 }, breaths: 3 }, viewFromS: 0, viewToS: 12, window: { fromS: 4.9, toS: 5.1 } },
      scenario: null,
    });
    const p = presentItem(wp, 1);
    expect(p.presented.kind === "waveform-point" && p.presented.waveform.timeS.length).toBeGreaterThan(100);
    expect(gradeResponse(p.key, { kind: "waveform-point", timeS: 4.9 })).toBe(true);
    expect(gradeResponse(p.key, { kind: "waveform-point", timeS: 5.05 })).toBe(true);
    expect(gradeResponse(p.key, { kind: "waveform-point", timeS: 5.2 })).toBe(false);
  });
});

describe("item content rules", () => {
  it("refuses a key outside the options, a window outside the view, and a scenario body without a template", () => {
    const bad = itemContent.safeParse({ ...base, type: "single", stem: "Q", body: { kind: "single", options: ["a", "b"], correct: 2 }, scenario: null });
    expect(bad.success).toBe(false);
    const noTemplate = itemContent.safeParse({ ...base, type: "numeric", stem: "Q", body: { kind: "scenario" }, scenario: null });
    expect(noTemplate.success).toBe(false);
    const wrongType = itemContent.safeParse({ ...base, type: "numeric", stem: "Q", body: { kind: "ordering", steps: ["a", "b", "c"] }, scenario: null });
    expect(wrongType.success).toBe(false);
  });
});

describe("educator-set parameter ranges", () => {
  const narrowed = (ranges: Record<string, { min: number; max: number }>) =>
    itemContent.parse({ ...base, type: "numeric", stem: "{prompt}", body: { kind: "scenario" }, scenario: { templateId: "vc-static-compliance", previewSeeds: [1], ranges } });

  it("every draw falls inside the narrowed ranges, and the same seed still gives the same item", () => {
    const item = narrowed({ tidalVolumeMl: { min: 450, max: 500 }, peepCmH2O: { min: 5, max: 8 } });
    for (const seed of [1, 2, 3, 4, 5, 6, 7, 8, 9, 10]) {
      const a = presentItem(item, seed);
      expect(a.generated!.scenario.settings.tidalVolumeMl).toBeGreaterThanOrEqual(450);
      expect(a.generated!.scenario.settings.tidalVolumeMl).toBeLessThanOrEqual(500);
      expect(a.generated!.scenario.settings.peepCmH2O).toBeLessThanOrEqual(8);
      expect(presentItem(item, seed).presented.stem).toBe(a.presented.stem);
    }
  });

  it("adaptive compliance fall: the fall percentage is read back and respected", () => {
    const item = itemContent.parse({ ...base, type: "numeric", stem: "{prompt}", body: { kind: "scenario" }, scenario: { templateId: "adaptive-compliance-fall", previewSeeds: [1], ranges: { fallPercent: { min: 50, max: 60 } } } });
    for (const seed of [1, 2, 3, 4, 5]) {
      const g = presentItem(item, seed).generated!;
      const fallen = g.scenario.events[0].set.complianceMlPerCmH2O!;
      expect(fallen / g.scenario.patient.complianceMlPerCmH2O).toBeGreaterThanOrEqual(0.5 - 0.02);
    }
  });

  it("refuses ranges off the template's grid, outside it, or so narrow that few draws fit", () => {
    expect(() => narrowed({ tidalVolumeMl: { min: 420, max: 500 } })).toThrow(/steps of 50/);
    expect(() => narrowed({ tidalVolumeMl: { min: 300, max: 500 } })).toThrow(/Stay within 350–600/);
    expect(() => narrowed({ tidalVolumeMl: { min: 450, max: 450 }, peepCmH2O: { min: 5, max: 5 }, rateBpm: { min: 8, max: 8 } })).toThrow(/keep only/);
  });
});
