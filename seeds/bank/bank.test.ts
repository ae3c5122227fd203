/**
 * The demo bank: at least 60 original items (10+ scenario, 5+ waveform point), each valid,
 * with a rationale and a reference, no manufacturer, device or proprietary mode names, every
 * calculation key agreeing with the bench's calculation functions, and a CSV and JSON round
 * trip that changes nothing.
 */
import { describe, expect, it } from "vitest";
import {
  airwayResistanceCmH2OPerLps,
  alveolarVentilationLpm,
  breathTiming,
  drivingPressureCmH2O,
  dynamicComplianceMlPerCmH2O,
  elastanceCmH2OPerMl,
  fractionExchanged,
  inspiratoryTimeS,
  meanAirwayPressureCmH2O,
  minuteVentilationLpm,
  pressureControlTidalVolumeMl,
  resistanceFromPressureCmH2OPerLps,
  simulate,
  staticComplianceMlPerCmH2O,
  timeConstantS,
  volumeControlPressures,
  type ScenarioInput,
} from "~/domain/bench";
import { exportCsv, exportJson, parseCsvImport, parseJsonImport } from "~/domain/bank/interchange";
import { contentErrors, TOPIC_SLUGS } from "~/domain/bank/item-content";
import { presentItem } from "~/domain/bank/present";
import { DEMO_BANK } from "./index";

/**
 * Brand-like patterns (a generic list written for this test, no brands looked up): trademark
 * and registration signs, company suffixes, CamelCase product words, letter-number model codes,
 * and acronyms with a "+" (a common way proprietary modes are styled).
 */
const BRAND_LIKE: { name: string; pattern: RegExp }[] = [
  { name: "trademark or registered sign", pattern: /[™®©℠]|\(tm\)|\(r\)/i },
  { name: "company suffix", pattern: /\b(inc|ltd|llc|gmbh|corp|corporation|plc|ag|s\.a\.)\b\.?/i },
  { name: "CamelCase product word", pattern: /\b[A-Z][a-z]+[A-Z][a-zA-Z]*\b/ },
  { name: "letter-number model code", pattern: /\b[A-Z]{1,3}-?\d{2,4}[A-Z]?\b/ },
  { name: "acronym styled with a plus", pattern: /\b[A-Z]{2,}\+/ },
  { name: "maker words", pattern: /\b(manufacturer|brand|model number|proprietary)\b/i },
];

/** Units and standards the items may use that look like codes (ISO 19223, cmH2O …). */
const ALLOWED = [/ISO 19223/g, /cmH2O/g, /\bPMC\d+/g];

function textOf(c: (typeof DEMO_BANK)[number]["content"]): string {
  // References are scanned for trademark signs only: they rightly name publishers (the test below).
  const parts = [c.stem, c.rationale];
  const b = c.body;
  if (b.kind === "single" || b.kind === "multiple") parts.push(...b.options);
  if (b.kind === "ordering") parts.push(...b.steps);
  if (b.kind === "numeric") parts.push(b.unit);
  return ALLOWED.reduce((s, re) => s.replace(re, ""), parts.join("\n"));
}

describe("demo bank", () => {
  it("has at least 60 items, 10 scenario items and 5 waveform-point items, with unique keys and stems", () => {
    expect(DEMO_BANK.length).toBeGreaterThanOrEqual(60);
    expect(DEMO_BANK.filter((d) => d.content.body.kind === "scenario").length).toBeGreaterThanOrEqual(10);
    expect(DEMO_BANK.filter((d) => d.content.type === "waveform-point").length).toBeGreaterThanOrEqual(5);
    expect(new Set(DEMO_BANK.map((d) => d.key)).size).toBe(DEMO_BANK.length);
    // Scenario items may share the stem "{prompt}" across templates, never within one.
    expect(new Set(DEMO_BANK.map((d) => `${d.content.scenario?.templateId ?? ""}|${d.content.stem}`)).size).toBe(DEMO_BANK.length);
  });

  it("covers every topic and all five item types", () => {
    for (const t of TOPIC_SLUGS) expect(DEMO_BANK.some((d) => d.content.topics.includes(t)), t).toBe(true);
    for (const type of ["single", "multiple", "numeric", "waveform-point", "ordering"]) expect(DEMO_BANK.some((d) => d.content.type === type), type).toBe(true);
  });

  it.each(DEMO_BANK.map((d) => [d.key, d] as const))("%s is a valid item with a rationale and a published reference", (_key, d) => {
    expect(contentErrors(d.content)).toEqual([]);
    expect(d.content.rationale.length).toBeGreaterThan(40);
    // A reference names its authors or body and a year (a textbook, guideline, standard or paper).
    expect(d.content.reference).toMatch(/(19|20)\d\d|Deranged Physiology/);
  });

  it("names no manufacturer, device or proprietary mode", () => {
    const found: string[] = [];
    for (const d of DEMO_BANK) {
      const text = textOf(d.content);
      for (const b of BRAND_LIKE) {
        const m = text.match(b.pattern);
        if (m) found.push(`${d.key}: ${b.name} "${m[0]}"`);
      }
      if (BRAND_LIKE[0].pattern.test(d.content.reference)) found.push(`${d.key}: trademark sign in the reference`);
    }
    expect(found).toEqual([]);
  });

  it("the brand-like check itself catches what it should", () => {
    const hits = (s: string) => BRAND_LIKE.some((b) => b.pattern.test(s));
    expect(hits("the SuperVent™ mode")).toBe(true);
    expect(hits("AutoMode breathing")).toBe(true);
    expect(hits("a model XV-300 ventilator")).toBe(true);
    expect(hits("Acme Ltd")).toBe(true);
    expect(hits("Volume control with a pause, PEEP 5 cmH2O".replace(/cmH2O/g, ""))).toBe(false);
  });

  it("every scenario item draws the same stem, waveform and answer for the same seed, with no unfilled placeholder", () => {
    for (const d of DEMO_BANK.filter((x) => x.content.body.kind === "scenario")) {
      for (const seed of [1, 2, 3, 41, 977]) {
        const a = presentItem(d.content, seed);
        const b = presentItem(d.content, seed);
        expect(b.presented.stem).toBe(a.presented.stem);
        expect(b.key).toEqual(a.key);
        expect(Array.from(b.generated!.visible.waveform.pressureCmH2O)).toEqual(Array.from(a.generated!.visible.waveform.pressureCmH2O));
        expect(a.presented.stem, d.key).not.toMatch(/\{[A-Za-z]+\}/);
      }
    }
  });

  it("every waveform-point item's window lies inside its view and the bench run reaches the view's end", () => {
    for (const d of DEMO_BANK) {
      const b = d.content.body;
      if (b.kind !== "waveform-point") continue;
      const run = simulate(b.bench as ScenarioInput);
      const last = run.breaths.at(-1)!;
      expect(last.startS + last.durationS, d.key).toBeGreaterThanOrEqual(b.viewToS - 0.01);
      expect(b.window.toS - b.window.fromS, d.key).toBeGreaterThan(0.05);
    }
  });
});

describe("demo calculation keys agree with the bench's calculation functions", () => {
  const key = (k: string) => {
    const d = DEMO_BANK.find((x) => x.key === k)!;
    if (d.content.body.kind !== "numeric") throw new Error(`${k} is not numeric`);
    return d.content.body;
  };
  const agrees = (k: string, computed: number) => {
    const b = key(k);
    expect(Math.abs(computed - b.answer), `${k}: bench gives ${computed}, key ${b.answer}`).toBeLessThanOrEqual(Math.max(b.tolerance, 0.5 * 10 ** -b.decimals) + 1e-9);
  };

  // Source of each check value: shared/TESTING.md, "Ventilation: published check values" (V-number).
  it("compliance, driving pressure, elastance (V9, V10)", () => {
    agrees("calc-cstat-1", staticComplianceMlPerCmH2O(500, 20, 5)); // V10: 33.3
    agrees("calc-cstat-2", staticComplianceMlPerCmH2O(360, 28, 8)); // V9: 18
    agrees("calc-driving-1", drivingPressureCmH2O(28, 8)); // V9: 20
    agrees("calc-driving-2", 420 / 30); // ΔP = Vt / Crs (driving-pressure review, PMC7449829)
    agrees("calc-elastance", elastanceCmH2OPerMl(staticComplianceMlPerCmH2O(500, 20, 5))); // V10: 0.030
    agrees("calc-cdyn", dynamicComplianceMlPerCmH2O(450, 30, 5));
  });

  it("resistance and time constants (V7, V8, V12, V13)", () => {
    agrees("calc-raw-1", airwayResistanceCmH2OPerLps(20, 15, 40)); // V8: 7.5
    agrees("calc-raw-2", resistanceFromPressureCmH2OPerLps(4.5, 20)); // V7: 13.5
    agrees("calc-tau-1", timeConstantS(5, 60)); // V12: 0.30
    agrees("calc-tau-percent", fractionExchanged(3) * 100); // V13: 95.02 %
    agrees("calc-tau-expiry", 3 * timeConstantS(20, 50));
  });

  it("timing, ventilation and mean airway pressure (V3, V4, V5, V6, V14, V15)", () => {
    agrees("calc-ti", inspiratoryTimeS(500, 60)); // V3: 0.5
    agrees("calc-te", breathTiming(12, 1).expiratoryTimeS); // V4: 4
    agrees("calc-ve", minuteVentilationLpm(500, 15)); // V5: 7.5
    agrees("calc-va", alveolarVentilationLpm(500, 150, 12)); // V6: 4.2
    agrees("calc-mawp-pc", meanAirwayPressureCmH2O(25, 5, 1, 20, "rectangular")); // V14: 11.67
    agrees("calc-mawp-vc", meanAirwayPressureCmH2O(25, 5, 1, 20, "triangular")); // V15: 8.33
  });

  it("equation of motion and pressure-control filling (V11, V17)", () => {
    agrees("calc-pip-eom", volumeControlPressures(5, 500, 60, 5, 60).pipCmH2O); // V11: 18.33
    agrees("calc-pc-volume", pressureControlTidalVolumeMl(50, 15, 1, 10)); // V17
  });
});

describe("import and export of the demo bank", () => {
  const contents = DEMO_BANK.map((d) => d.content);

  it("JSON: export → import gives the same items, and exporting them again gives the same file", () => {
    const file = exportJson(contents);
    const parsed = parseJsonImport(file);
    expect(parsed.fileError).toBeNull();
    expect(parsed.errors).toEqual([]);
    const back = parsed.rows.map((r) => r.content!);
    expect(exportJson(back)).toBe(file);
    expect(back).toHaveLength(contents.length);
  });

  it("CSV (through papaparse): export → import gives the same items, and exporting them again gives the same file", () => {
    const file = exportCsv(contents);
    const parsed = parseCsvImport(file);
    expect(parsed.fileError).toBeNull();
    expect(parsed.errors).toEqual([]);
    const back = parsed.rows.map((r) => r.content!);
    expect(exportCsv(back)).toBe(file);
    expect(exportJson(back)).toBe(exportJson(contents));
  });
});
