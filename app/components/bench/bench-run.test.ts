import { describe, expect, it } from "vitest";
import { volumeControlPressures } from "~/domain/bench/calculations";
import { parseScenario } from "~/domain/bench/schema";
import { BenchRun } from "./bench-run";

// Passive volume control, constant flow: PIP = PEEP + Vt/C + R·V̇ (equation of motion; Chatburn
// RL et al., Respir Care 2014;59(11):1747–63). 5 + 500/50 + 10 × 1 L/s = 25 cmH2O; with C 25, 35.
const scenario = parseScenario({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 15, peepCmH2O: 5 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
  breaths: 20,
});

describe("a Bench run", () => {
  it("starts with three finished breaths so the first frame (server-rendered) has readings", () => {
    const run = new BenchRun(scenario);
    const view = run.view();
    expect(view.breaths.map((b) => b.breath)).toEqual([1, 2, 3]);
    expect(run.cursorS).toBeCloseTo(12, 9); // three 4 s breaths at 15/min
    expect(view.latest?.reading.pipCmH2O).toBeCloseTo(25, 1);
    expect([view.startS, view.endS]).toEqual([0, 15]);
  });

  it("gives the same first frame every time (server and browser render the same markup)", () => {
    const a = new BenchRun(scenario).view();
    const b = new BenchRun(scenario).view();
    expect(Array.from(a.waveform.pressureCmH2O)).toEqual(Array.from(b.waveform.pressureCmH2O));
  });

  it("sweeps: the trace grows with the cursor and a breath's readings appear only once it has ended", () => {
    const run = new BenchRun(scenario);
    run.advance(1);
    const view = run.view();
    expect(view.latest?.reading.breath).toBe(3);
    const t = view.waveform.timeS;
    expect(t[t.length - 1]).toBeLessThanOrEqual(13 + 1e-9);
    expect(t[t.length - 1]).toBeGreaterThan(12.9);
    run.advance(3);
    expect(run.view().latest?.reading.breath).toBe(4);
  });

  it("rolls the window: it always spans the last 15 s, ending at the cursor", () => {
    const run = new BenchRun(scenario);
    run.advance(20);
    const view = run.view();
    expect(view.endS).toBeCloseTo(32, 9);
    expect(view.startS).toBeCloseTo(17, 9);
    expect(view.waveform.timeS[0]).toBeLessThanOrEqual(17);
    expect(view.breaths[0].startS + view.breaths[0].durationS).toBeGreaterThan(17);
  });

  it("applies a stiffer lung from the next breath: PIP rises as the equation of motion says, and falls back", () => {
    const run = new BenchRun(scenario);
    run.advance(1.5); // in the middle of breath 4, already computed with the normal lung
    expect(run.nextBreathNumber()).toBe(5);
    run.apply({ complianceMlPerCmH2O: 25 });
    run.stepBreath(); // finish breath 4
    expect(run.latest()?.reading.breath).toBe(4);
    expect(run.latest()?.reading.pipCmH2O).toBeCloseTo(volumeControlPressures(5, 500, 50, 10, 60).pipCmH2O, 1);
    run.stepBreath(); // breath 5, stiff
    expect(run.latest()?.reading.breath).toBe(5);
    expect(run.latest()?.reading.pipCmH2O).toBeCloseTo(volumeControlPressures(5, 500, 25, 10, 60).pipCmH2O, 1);
    expect(run.patient().complianceMlPerCmH2O).toBe(25);
    run.apply({ complianceMlPerCmH2O: 50 });
    run.stepBreath();
    expect(run.latest()?.reading.pipCmH2O).toBeCloseTo(25, 1);
  });

  it("stops at apnoea when nothing triggers a breath in pressure support", () => {
    const ps = parseScenario({
      mode: "pressure-support",
      settings: { supportPressureCmH2O: 10, peepCmH2O: 5 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "steady", amplitudeCmH2O: 5, rateBpm: 18 } },
    });
    const run = new BenchRun(ps);
    expect(run.stopped).toBeNull();
    run.apply({ effort: { kind: "none" } });
    run.advance(60);
    expect(run.stopped).toBe("apnoea");
    const cursor = run.cursorS;
    run.advance(5);
    run.stepBreath();
    expect(run.cursorS).toBe(cursor);
  });

  it("keeps bounded history however long it runs", () => {
    const run = new BenchRun(scenario);
    for (let i = 0; i < 300; i++) run.advance(1);
    expect(run.finished().length).toBeLessThanOrEqual(Math.ceil((2 * run.windowS) / 4) + 3);
  });
});
