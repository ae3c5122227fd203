import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DEFAULT_SETTINGS } from "./defaults";
import { ScenarioError, parseScenario, validateScenario } from "./schema";
import { simulate } from "./simulate";

const vc = {
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 12, peepCmH2O: 5 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
};

function errorsOf(input: unknown): Record<string, string> {
  const result = validateScenario(input);
  if (result.ok) throw new Error("expected the scenario to be refused");
  return Object.fromEntries(result.errors.map((e) => [e.field, e.message]));
}

const scenarioDir = join(process.cwd(), "seeds", "scenarios");

describe("scenario validation", () => {
  it.each(readdirSync(scenarioDir).filter((f) => f.endsWith(".json")))("shipped example %s is valid", (file) => {
    const result = validateScenario(JSON.parse(readFileSync(join(scenarioDir, file), "utf8")));
    expect(result.ok ? [] : result.errors).toEqual([]);
  });

  it("refuses a negative compliance, naming the field and the allowed range", () => {
    const errors = errorsOf({ ...vc, patient: { ...vc.patient, complianceMlPerCmH2O: -10 } });
    expect(errors["patient.complianceMlPerCmH2O"]).toBe("must be a number between 1 and 200 mL/cmH2O (got -10)");
  });

  it("refuses a rate of 0", () => {
    expect(errorsOf({ ...vc, settings: { ...vc.settings, rateBpm: 0 } })["settings.rateBpm"]).toBe("must be a number between 4 and 80 breaths/min (got 0)");
  });

  it("refuses a tidal volume of 5 L", () => {
    expect(errorsOf({ ...vc, settings: { ...vc.settings, tidalVolumeMl: 5000 } })["settings.tidalVolumeMl"]).toBe(
      "must be a number between 20 and 2000 mL (got 5000)",
    );
  });

  it("refuses a misspelt field instead of silently ignoring it", () => {
    expect(errorsOf({ ...vc, settings: { ...vc.settings, tidalVolume: 500 } })["settings.tidalVolume"]).toBe("is not a known field");
  });

  it("names a field the mode needs when it is missing", () => {
    const { peakFlowLpm: _omit, ...settings } = vc.settings;
    expect(errorsOf({ ...vc, settings })["settings.peakFlowLpm"]).toBe("is required in volume-control (between 5 and 150 L/min)");
  });

  it("refuses pressure support without patient effort: it is patient-triggered only", () => {
    const errors = errorsOf({ mode: "pressure-support", settings: { supportPressureCmH2O: 10, peepCmH2O: 5 }, patient: vc.patient });
    expect(errors["patient.effort.kind"]).toMatch(/patient-triggered only/);
  });

  it("refuses settings whose inspiration does not fit the breath cycle", () => {
    // 500 mL at 10 L/min takes 3 s; at 30 breaths/min the cycle is 2 s.
    const errors = errorsOf({ ...vc, settings: { ...vc.settings, peakFlowLpm: 10, rateBpm: 30 } });
    expect(errors["settings.peakFlowLpm"]).toMatch(/takes 3\.00 s, not shorter than the 2\.00 s breath cycle/);
    const pc = { mode: "pressure-control", settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 2.5, rateBpm: 30, peepCmH2O: 5 }, patient: vc.patient };
    expect(errorsOf(pc)["settings.inspiratoryTimeS"]).toMatch(/shorter than the 2\.00 s breath cycle/);
  });

  it("refuses a pressure-control pressure at or above the high-pressure limit", () => {
    const pc = {
      mode: "pressure-control",
      settings: { inspiratoryPressureCmH2O: 40, inspiratoryTimeS: 1, rateBpm: 12, peepCmH2O: 5 },
      limits: { highPressureCmH2O: 40 },
      patient: vc.patient,
    };
    expect(errorsOf(pc)["settings.inspiratoryPressureCmH2O"]).toMatch(/\(45\) must stay below the high-pressure limit \(40 cmH2O\)/);
  });

  it("checks events: exactly one of atBreath/atTimeS, within the run, with valid fields", () => {
    const errors = errorsOf({
      ...vc,
      breaths: 10,
      events: [
        { atBreath: 2, atTimeS: 3, set: { complianceMlPerCmH2O: 25 } },
        { atBreath: 11, set: { complianceMlPerCmH2O: 25 } },
        { atBreath: 3, set: { resistanceCmH2OPerLps: 0 } },
      ],
    });
    expect(errors["events.0.atBreath"]).toBe("give exactly one of atBreath or atTimeS");
    expect(errors["events.2.set.resistanceCmH2OPerLps"]).toBe("must be a number between 1 and 200 cmH2O/(L/s) (got 0)");
    // Cross-field checks run once each field is in range.
    const late = errorsOf({ ...vc, breaths: 10, events: [{ atBreath: 11, set: { complianceMlPerCmH2O: 25 } }] });
    expect(late["events.0.atBreath"]).toBe("must be between 1 and the number of breaths (10) (got 11)");
  });

  it("requires an amplitude when an event switches effort on from none", () => {
    const errors = errorsOf({ ...vc, events: [{ atBreath: 3, set: { effort: { kind: "erratic", rateBpm: 20 } } }] });
    expect(errors["events.0.set.effort.amplitudeCmH2O"]).toBe("is required when effort is switched to erratic");
  });

  it("requires amplitude and rate when effort is switched on", () => {
    const errors = errorsOf({ ...vc, patient: { ...vc.patient, effort: { kind: "steady" } } });
    expect(errors["patient.effort.amplitudeCmH2O"]).toBe("is required when effort is steady");
    expect(errors["patient.effort.rateBpm"]).toBe("is required when effort is steady");
  });

  it("fills defaults for what the file leaves out (adaptive step 3, margin 5, 20 breaths, seed 1, 5 ms)", () => {
    const s = parseScenario(vc);
    expect(s.settings.adaptiveStepCmH2O).toBe(3);
    expect(s.settings.adaptiveMarginCmH2O).toBe(5);
    expect(s.settings.flowPattern).toBe(DEFAULT_SETTINGS.flowPattern);
    expect(s.limits.highPressureCmH2O).toBe(40);
    expect([s.breaths, s.seed, s.stepMs]).toEqual([20, 1, 5]);
    expect(s.patient.effort.kind).toBe("none");
  });

  it("parseScenario and simulate throw a ScenarioError that lists each bad field", () => {
    const bad = { ...vc, settings: { ...vc.settings, rateBpm: 0 }, patient: { ...vc.patient, complianceMlPerCmH2O: -1 } };
    expect(() => parseScenario(bad)).toThrow(ScenarioError);
    expect(() => simulate(bad as never)).toThrow(/settings\.rateBpm: must be a number between 4 and 80[\s\S]*patient\.complianceMlPerCmH2O/);
  });

  it("a resolved scenario parses to itself (the page can re-validate what it built)", () => {
    const s = parseScenario(vc);
    expect(parseScenario(s)).toEqual(s);
  });
});
