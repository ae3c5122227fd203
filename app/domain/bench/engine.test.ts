/**
 * The breath-by-breath API the Bench page drives (createBench), triggering, and events on
 * the timeline.
 */
import { describe, expect, it } from "vitest";
import { createBench } from "./engine";
import { parseScenario } from "./schema";
import { simulate } from "./simulate";
import { concatWaveforms } from "./waveform";

const vc = parseScenario({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 12, peepCmH2O: 5 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
  breaths: 6,
});

describe("bench engine", () => {
  it("sweeping breath by breath gives exactly what simulate() gives", () => {
    const bench = createBench(vc);
    const steps = Array.from({ length: 6 }, () => bench.nextBreath());
    const whole = simulate(vc);
    expect(steps.map((s) => s.reading)).toEqual(whole.breaths);
    const swept = concatWaveforms(steps.map((s) => s.samples));
    // The last breath's samples end where the next breath would begin, as in simulate().
    expect(Array.from(swept.pressureCmH2O)).toEqual(Array.from(whole.waveform.pressureCmH2O));
    expect(steps[1].samples.timeS[0]).toBeCloseTo(5, 9);
  });

  it("a one-tap 'stiffen the lung' between breaths shows on the next breath: PIP 25 → 35", () => {
    const bench = createBench(vc);
    bench.nextBreath();
    bench.apply({ complianceMlPerCmH2O: 25 });
    expect(bench.state().patient.complianceMlPerCmH2O).toBe(25);
    expect(bench.nextBreath().reading!.pipCmH2O).toBeCloseTo(35, 2);
    bench.apply({ complianceMlPerCmH2O: 50 });
    expect(bench.nextBreath().reading!.pipCmH2O).toBeCloseTo(25, 2);
  });

  it("a setting changed between breaths applies from the next breath (rate 12 → 20: cycle 5 s → 3 s)", () => {
    const bench = createBench(vc);
    bench.nextBreath();
    bench.apply({ rateBpm: 20 });
    expect(bench.nextBreath().reading!.durationS).toBeCloseTo(3, 9);
  });

  it("an event at a time acts mid-breath: compliance halves 0.25 s into breath 3's inspiration", () => {
    const r = simulate({ ...vc, events: [{ atTimeS: 10.25, set: { complianceMlPerCmH2O: 25 } }] });
    // The whole lung stiffens at once: the elastic pressure V/C uses the new compliance for
    // the 250 mL already in, so the breath ends at 5 + 500/25 + 10·1 = 35 cmH2O.
    expect(r.breaths[1].pipCmH2O).toBeCloseTo(25, 2);
    expect(r.breaths[2].pipCmH2O).toBeCloseTo(35, 2);
    const at = r.waveform.timeS.findIndex((t) => t >= 10.25 - 1e-9);
    // The pressure jumps by 250 mL × (1/25 − 1/50) = 5 cmH2O at the change, plus the usual
    // 5 mL/50 = 0.1 cmH2O of one step.
    expect(r.waveform.pressureCmH2O[at] - r.waveform.pressureCmH2O[at - 1]).toBeCloseTo(5.1, 2);
  });

  it("patient trigger by flow: a patient breathing at 20/min sets the rhythm over a set rate of 12/min", () => {
    const r = simulate({
      ...vc,
      patient: { ...vc.patient, effort: { kind: "steady", amplitudeCmH2O: 4, rateBpm: 20, onsetS: 0.5, durationS: 1, variability: 0.5 } },
      breaths: 8,
    });
    const later = r.breaths.slice(2);
    expect(later.every((b) => b.trigger === "patient")).toBe(true);
    for (const b of later.slice(1)) expect(b.durationS).toBeCloseTo(3, 1);
  });

  it("patient trigger by pressure: the airway pressure dips 2 cmH2O below PEEP before the breath starts", () => {
    const r = simulate({
      mode: "pressure-control",
      settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 1, rateBpm: 10, peepCmH2O: 5, triggerType: "pressure", triggerPressureCmH2O: 2 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "steady", amplitudeCmH2O: 4, rateBpm: 15 } },
      breaths: 5,
    });
    const b = r.breaths[3];
    expect(b.trigger).toBe("patient");
    const before = r.waveform.timeS.findIndex((t) => t >= b.startS - 1e-9) - 1;
    expect(r.waveform.pressureCmH2O[before]).toBeLessThan(5 - 1.5);
    expect(r.waveform.pressureCmH2O[before]).toBeGreaterThan(5 - 2);
  });

  it("a passive patient gets time-triggered breaths exactly 60/rate apart", () => {
    const r = simulate(vc);
    expect(r.breaths.map((b) => b.trigger)).toEqual(Array(6).fill("time"));
    expect(r.breaths.map((b) => b.startS)).toEqual([0, 5, 10, 15, 20, 25]);
  });

  it("each alarm records its breath, time and reason", () => {
    const r = simulate({ ...vc, limits: { highPressureCmH2O: 40, lowExhaledVolumeMl: 600 }, breaths: 2 });
    expect(r.alarms).toHaveLength(2);
    expect(r.alarms[0]).toMatchObject({ kind: "low-exhaled-volume", breath: 1, timeS: 5 });
    expect(r.alarms[0].reason).toMatch(/Exhaled volume 500 mL is below the low exhaled volume limit \(600 mL\)/);
  });
});
