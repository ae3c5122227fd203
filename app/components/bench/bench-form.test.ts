import { describe, expect, it } from "vitest";
import { parseScenario } from "~/domain/bench/schema";
import { changesBetween, checkDraft, draftFromScenario, sameDraft, visibleNumberFields, withChanges, type BenchDraft } from "./bench-form";

const base = parseScenario({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 15, peepCmH2O: 5 },
  limits: { highPressureCmH2O: 40, lowPressureCmH2O: 10, lowExhaledVolumeMl: 300 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
});
const draft = draftFromScenario(base);
const edit = (d: BenchDraft, values: Record<string, string>, extra: Partial<BenchDraft> = {}): BenchDraft => ({ ...d, ...extra, values: { ...d.values, ...values } });
const seed = { seed: 1 };

describe("the settings draft", () => {
  it("shows only the fields each mode uses (plus limits and patient)", () => {
    const labels = (mode: BenchDraft["mode"]) => visibleNumberFields({ mode, effortKind: "none" }).map((f) => f.path);
    expect(labels("volume-control")).toContain("settings.peakFlowLpm");
    expect(labels("volume-control")).not.toContain("settings.inspiratoryTimeS");
    expect(labels("pressure-control")).toEqual(expect.arrayContaining(["settings.inspiratoryPressureCmH2O", "settings.inspiratoryTimeS"]));
    expect(labels("pressure-control")).not.toContain("settings.tidalVolumeMl");
    expect(labels("pressure-support")).not.toContain("settings.rateBpm");
    expect(visibleNumberFields({ mode: "volume-control", effortKind: "steady" }).map((f) => f.path)).toContain("patient.effort.amplitudeCmH2O");
  });

  it("round-trips: the draft of a scenario checks back to the same scenario", () => {
    const check = checkDraft(draft, seed);
    expect(check.ok).toBe(true);
    if (check.ok) expect(changesBetween(base, check.scenario)).toEqual({});
  });
});

describe("refusing implausible settings with the field and its range (issue 3, bad input)", () => {
  it.each([
    ["settings.tidalVolumeMl", "5000", "Tidal volume must be a number between 20 and 2000 mL (got 5000)"],
    ["settings.rateBpm", "0", "Rate must be a number between 4 and 80 breaths/min (got 0)"],
    ["patient.complianceMlPerCmH2O", "-20", "Compliance must be a number between 1 and 200 mL/cmH2O (got -20)"],
    ["settings.peepCmH2O", "", "PEEP must be a number between 0 and 30 cmH2O"],
    ["limits.highPressureCmH2O", "forty", 'High-pressure limit must be a number between 10 and 120 cmH2O (got "forty")'],
  ])("%s = %j", (path, typed, message) => {
    const check = checkDraft(edit(draft, { [path]: typed }), seed);
    expect(check.ok).toBe(false);
    if (!check.ok) {
      expect(check.fieldErrors[path]).toEqual([message]);
      expect(Object.keys(check.fieldErrors)).toEqual([path]);
    }
  });

  it("reports cross-field refusals on the field to change", () => {
    // 500 mL at 5 L/min takes 6 s, longer than the 4 s cycle at 15/min.
    const slow = checkDraft(edit(draft, { "settings.peakFlowLpm": "5" }), seed);
    expect(slow.ok).toBe(false);
    if (!slow.ok) expect(slow.fieldErrors["settings.peakFlowLpm"]?.[0]).toMatch(/^Peak flow too low: 500 mL at 5 L\/min/);
    const passive = checkDraft({ ...draft, mode: "pressure-support" }, seed);
    expect(passive.ok).toBe(false);
    if (!passive.ok) expect(passive.fieldErrors["patient.effort.kind"]?.[0]).toMatch(/^Patient effort: pressure support is patient-triggered only/);
  });

  it("ignores a bad value in a field the chosen mode does not use", () => {
    const check = checkDraft(edit(draft, { "settings.inspiratoryTimeS": "99" }), seed);
    expect(check.ok).toBe(true);
  });
});

describe("applying a valid draft", () => {
  it("sends only what changed to the running simulator, and keeps an exercise's timeline", () => {
    const withEvents = { ...base, events: [{ atBreath: 6, set: { complianceMlPerCmH2O: 25 } }] };
    const check = checkDraft(edit(draft, { "settings.tidalVolumeMl": "450", "patient.resistanceCmH2OPerLps": "20" }), seed);
    expect(check.ok).toBe(true);
    if (!check.ok) return;
    const changes = changesBetween(withEvents, check.scenario);
    expect(changes).toEqual({ tidalVolumeMl: 450, resistanceCmH2OPerLps: 20 });
    const next = withChanges(withEvents, changes!);
    expect(next.events).toEqual(withEvents.events);
    expect(next.settings.tidalVolumeMl).toBe(450);
    expect(next.patient.resistanceCmH2OPerLps).toBe(20);
  });

  it("asks for a new run when the mode changes", () => {
    const check = checkDraft({ ...draft, mode: "pressure-control" }, seed);
    expect(check.ok).toBe(true);
    if (check.ok) expect(changesBetween(base, check.scenario)).toBeNull();
  });

  it("sends effort as a whole when it is switched on", () => {
    const check = checkDraft(edit(draft, { "patient.effort.amplitudeCmH2O": "6", "patient.effort.rateBpm": "20" }, { effortKind: "steady" }), seed);
    expect(check.ok).toBe(true);
    if (check.ok) expect(changesBetween(base, check.scenario)).toEqual({ effort: { kind: "steady", amplitudeCmH2O: 6, rateBpm: 20 } });
  });

  it("tells typed-but-unapplied edits from applied ones", () => {
    expect(sameDraft(draft, edit(draft, { "settings.tidalVolumeMl": " 500 " }))).toBe(true);
    expect(sameDraft(draft, edit(draft, { "settings.tidalVolumeMl": "450" }))).toBe(false);
    expect(sameDraft(draft, { ...draft, mode: "pressure-control" })).toBe(false);
  });
});
