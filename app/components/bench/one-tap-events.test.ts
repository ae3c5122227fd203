import { describe, expect, it } from "vitest";
import { parseScenario } from "~/domain/bench/schema";
import { ONE_TAPS, type OneTapId } from "./one-tap-events";

const scenario = parseScenario({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 15, peepCmH2O: 5 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
});
const tap = (id: OneTapId) => ONE_TAPS.find((t) => t.id === id)!;

describe("one-tap events", () => {
  it("has the five events the issue names, plus a way back for effort", () => {
    expect(ONE_TAPS.map((t) => t.label)).toEqual([
      "Stiffen the lung",
      "Restore the lung",
      "Raise resistance",
      "Patient pulls harder",
      "Erratic breathing",
      "Patient settles",
    ]);
  });

  it("stiffens to half the set compliance and restores the set lung, the same however often pressed", () => {
    expect(tap("stiffen").changes(scenario)).toEqual({ complianceMlPerCmH2O: 25 });
    expect(tap("stiffen").detail(scenario)).toBe("Compliance to half: 25 mL/cmH2O");
    expect(tap("raise-resistance").changes(scenario)).toEqual({ resistanceCmH2OPerLps: 20 });
    expect(tap("restore").changes(scenario)).toEqual({ complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 });
  });

  it("stays inside the plausible ranges", () => {
    const tiny = { ...scenario, patient: { ...scenario.patient, complianceMlPerCmH2O: 1.5, resistanceCmH2OPerLps: 150 } };
    expect(tap("stiffen").changes(tiny)).toEqual({ complianceMlPerCmH2O: 1 });
    expect(tap("raise-resistance").changes(tiny)).toEqual({ resistanceCmH2OPerLps: 200 });
  });

  it("switches effort on and back to the settings", () => {
    expect(tap("pulls-harder").changes(scenario).effort).toMatchObject({ kind: "steady", amplitudeCmH2O: 12 });
    expect(tap("erratic").changes(scenario).effort).toMatchObject({ kind: "erratic" });
    expect(tap("settle").changes(scenario).effort).toMatchObject({ kind: "none" });
  });
});
