/**
 * Volume control behaviours from PRODUCT.md ("The ventilation bench") and issue 3's
 * Acceptance — trade facts, common practice, no source — with the numbers the equation of
 * motion gives (Paw = PEEP + V/C + R·V̇; Chatburn, Respir Care 2014;59(11):1747–63).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseScenario, type ScenarioInput } from "./schema";
import { simulate, type SimulationResult } from "./simulate";

const passive = (over: Partial<ScenarioInput> = {}): ScenarioInput => ({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "constant", rateBpm: 12, peepCmH2O: 5 },
  limits: { highPressureCmH2O: 50 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
  breaths: 6,
  ...over,
});

const seedFile = (name: string) => parseScenario(JSON.parse(readFileSync(join(process.cwd(), "seeds", "scenarios", name), "utf8")));

/** Sample indexes of one breath's inspiration (from its start until the valve opens). */
function inspiration(result: SimulationResult, breath: number): number[] {
  const b = result.breaths[breath - 1];
  const out: number[] = [];
  result.waveform.timeS.forEach((t, i) => {
    if (t >= b.startS - 1e-9 && t < b.startS + b.tiS - 1e-9) out.push(i);
  });
  return out;
}

describe("volume control", () => {
  it("delivers the set volume and the volume ends inspiration: 500 mL at 60 L/min → Ti 0.5 s, cycle 'volume'", () => {
    const r = simulate(passive());
    for (const b of r.breaths) {
      expect(b.vtiMl).toBeCloseTo(500, 6);
      expect(b.cycle).toBe("volume");
      expect(b.tiS).toBeCloseTo(0.5, 9);
      expect(b.trigger).toBe("time");
      expect(b.inspiratoryPressureCmH2O).toBeNull();
    }
  });

  it("V11 in the simulator: PEEP 5, 500 mL, C 60, R 5, 1 L/s with a pause → PIP 18.33, Pplat 13.33", () => {
    // Parameters of the "Equation of Motion Simulator" teaching page, recomputed (TESTING.md V11).
    const r = simulate(passive({ settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 12, peepCmH2O: 5, pauseS: 0.5 }, patient: { complianceMlPerCmH2O: 60, resistanceCmH2OPerLps: 5 } }));
    const b = r.breaths[2];
    expect(Math.abs(b.pipCmH2O - 18.333)).toBeLessThan(0.01);
    expect(Math.abs((b.pplatCmH2O ?? 0) - 13.333)).toBeLessThan(0.01);
    expect(b.tiS).toBeCloseTo(1.0, 9);
  });

  it("compliance falls at breath 6 (50 → 25): PIP goes 25 → 35 on that very breath and back to 25 on the breath after recovery", () => {
    // PIP = PEEP + Vt/C + R·V̇ = 5 + 500/50 + 10·1 = 25, then 5 + 500/25 + 10 = 35.
    const r = simulate(passive({ breaths: 12, events: [{ atBreath: 6, set: { complianceMlPerCmH2O: 25 } }, { atBreath: 10, set: { complianceMlPerCmH2O: 50 } }] }));
    const pip = r.breaths.map((b) => b.pipCmH2O);
    expect(pip[4]).toBeCloseTo(25, 2);
    expect(pip[5]).toBeCloseTo(35, 2);
    expect(pip[8]).toBeCloseTo(35, 2);
    expect(pip[9]).toBeCloseTo(25, 2);
    expect(r.breaths.every((b) => Math.abs(b.vtiMl - 500) < 1e-6)).toBe(true);
  });

  it("the shipped compliance-fall scenario shows the same: Pplat 15 → 25 at breath 6, back at breath 11", () => {
    const r = simulate(seedFile("vc-compliance-fall.json"));
    expect(r.breaths[4].pplatCmH2O).toBeCloseTo(15, 1);
    expect(r.breaths[5].pplatCmH2O).toBeCloseTo(25, 1);
    expect(r.breaths[10].pplatCmH2O).toBeCloseTo(15, 1);
  });

  it("at the high-pressure limit (30) the breath ends at once: 300 of 500 mL delivered, valve opens, alarm recorded", () => {
    // C 20 after breath 4: Paw = 5 + V/20 + 10 reaches 30 when V = 300 mL, at 0.3 s into the breath.
    const r = simulate(passive({ limits: { highPressureCmH2O: 30 }, breaths: 5, events: [{ atBreath: 4, set: { complianceMlPerCmH2O: 20 } }] }));
    const b = r.breaths[3];
    expect(r.breaths[2].alarms).toEqual([]);
    expect(b.cycle).toBe("high-pressure");
    expect(b.vtiMl).toBeCloseTo(300, 0);
    expect(b.vtiMl).toBeLessThan(500);
    expect(b.pipCmH2O).toBeCloseTo(30, 6);
    expect(b.tiS).toBeCloseTo(0.3, 3);
    expect(b.alarms).toEqual(["high-pressure"]);
    const alarm = r.alarms.find((a) => a.breath === 4)!;
    expect(alarm.timeS).toBeCloseTo(b.startS + 0.3, 3);
    expect(alarm.reason).toMatch(/300 of 500 mL delivered/);
    // Expiratory valve open at once: the next sample is at PEEP with expiratory flow, and
    // what went in comes out.
    const i = inspiration(r, 4).at(-1)! + 1;
    expect(r.waveform.pressureCmH2O[i]).toBe(5);
    expect(r.waveform.flowLpm[i]).toBeLessThan(-50);
    expect(b.vteMl).toBeCloseTo(300, 0);
  });

  describe("flow starvation (seeds/scenarios/vc-flow-starvation.json)", () => {
    const r = simulate(seedFile("vc-flow-starvation.json"));
    const passiveBreath = r.breaths[2];
    const starved = r.breaths[7];

    it("the patient wants more than the set 40 L/min through inspiration", () => {
      // Demand flow = Pmus/R: a 12 cmH2O pull through 10 cmH2O/(L/s) is 72 L/min at its peak;
      // the half-sine effort lasts 1.2 s, so at the end of the 0.75 s inspiration it is
      // still 12·sin(π·0.75/1.2) = 11.1 cmH2O, i.e. 67 L/min.
      const pullAtEnd = 12 * Math.sin((Math.PI * 0.75) / 1.2);
      expect((pullAtEnd / 10) * 60).toBeGreaterThan(40);
      expect(starved.trigger).toBe("patient");
    });

    it("peak pressure falls from 21.67 to about 11.4 cmH2O", () => {
      // Passive: 5 + 500/50 + 10·(40/60) = 21.67.
      expect(passiveBreath.pipCmH2O).toBeCloseTo(21.667, 2);
      expect(starved.pipCmH2O).toBeLessThan(13);
      expect(starved.pipCmH2O).toBeGreaterThan(10);
    });

    it("the inspiratory pressure curve is concave (scooped): mid-inspiration lies far below the chord", () => {
      const sag = (breath: number) => {
        const idx = inspiration(r, breath);
        const p = r.waveform.pressureCmH2O;
        const first = p[idx[0]];
        const last = p[idx.at(-1)!];
        const mid = p[idx[Math.floor(idx.length / 2)]];
        return (first + last) / 2 - mid;
      };
      expect(Math.abs(sag(3))).toBeLessThan(0.2); // passive constant flow: a straight ramp
      expect(sag(8)).toBeGreaterThan(4); // starved: a scoop of more than 4 cmH2O
    });

    it("the low-pressure alarm (limit 15, above the scooped peak) fires while the delivered volume is still 500 mL", () => {
      expect(passiveBreath.alarms).toEqual([]);
      for (const b of r.breaths.slice(3)) {
        expect(b.alarms).toEqual(["low-pressure"]);
        expect(b.vtiMl).toBeCloseTo(500, 6);
        expect(b.vteMl).toBeGreaterThan(490);
      }
      expect(r.alarms.find((a) => a.breath === 8)?.reason).toMatch(/below the low-pressure limit \(15\.0 cmH2O\)/);
    });
  });

  it("a descending ramp gives a lower peak pressure than constant flow for the same volume: 20 vs 25 cmH2O", () => {
    // Constant: 5 + 500/50 + 10·1 = 25. Ramp to 50 %: the peak is at the end, 5 + 10 + 10·0.5 = 20;
    // Ti = 0.5 / (0.75 · 1) = 0.667 s (our ramp convention).
    const constant = simulate(passive({ breaths: 2 })).breaths[1];
    const ramp = simulate(passive({ breaths: 2, settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "ramp", rateBpm: 12, peepCmH2O: 5 } })).breaths[1];
    expect(constant.pipCmH2O).toBeCloseTo(25, 2);
    expect(ramp.pipCmH2O).toBeCloseTo(20, 2);
    expect(ramp.vtiMl).toBeCloseTo(constant.vtiMl, 6);
    expect(ramp.tiS).toBeCloseTo(0.6667, 3);
    expect(ramp.peakFlowLpm).toBeCloseTo(60, 6);
  });

  it("mean airway pressure is the time average of the pressure trace (trapezoid: PEEP + (R·V̇ + ½·Vt/C)·Ti/Ttot)", () => {
    // Pressure rises linearly from PEEP + R·V̇ to PEEP + R·V̇ + Vt/C during Ti, then PEEP:
    // 5 + (10 + 5)·0.5/5 = 6.5 cmH2O. With R → 0 this is V15's triangular 0.5 factor.
    expect(simulate(passive({ breaths: 3 })).breaths[2].mpawCmH2O).toBeCloseTo(6.5, 2);
  });
});
