/**
 * Invariants of the simulator: conservation (volume is the integral of flow), passive
 * steady state (what goes in comes out), trapped volume against the exponential-emptying
 * formula, the equation of motion as a property, and exact replay from a seed.
 */
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { volumeControlPressures } from "./calculations";
import { parseScenario, type ScenarioInput } from "./schema";
import { simulate, toBreathLine, type SimulationResult } from "./simulate";
import type { Scenario } from "./types";

const dir = join(process.cwd(), "seeds", "scenarios");
const seeds: [string, Scenario][] = readdirSync(dir)
  .filter((f) => f.endsWith(".json"))
  .map((f) => [f, parseScenario(JSON.parse(readFileSync(join(dir, f), "utf8")))]);

/** Largest gap, per breath, between the volume trace and the running integral of flow, as a share of that breath's Vti. */
function worstIntegralError(r: SimulationResult): number {
  const { timeS, flowLpm, volumeMl } = r.waveform;
  const dt = r.scenario.stepMs / 1000;
  let worst = 0;
  for (const b of r.breaths) {
    let integral = 0;
    for (let i = 0; i < timeS.length; i++) {
      if (timeS[i] < b.startS - 1e-9 || timeS[i] >= b.startS + b.durationS - 1e-9) continue;
      // volume[i] is the volume at the start of sample i; flow[i] covers [t_i, t_i + dt).
      worst = Math.max(worst, Math.abs(volumeMl[i] - integral) / b.vtiMl);
      integral += (flowLpm[i] / 60) * dt * 1000;
    }
  }
  return worst;
}

describe("simulator invariants", () => {
  it.each(seeds)("%s: volume equals the integral of flow within 1 % (mL from L/min, every sample)", (_name, s) => {
    expect(worstIntegralError(simulate(s))).toBeLessThan(0.01);
  });

  it.each(seeds)("%s: inspired volume equals the integral of inspiratory flow within 1 %", (_name, s) => {
    const r = simulate(s);
    const dt = s.stepMs / 1000;
    for (const b of r.breaths) {
      let inspired = 0;
      r.waveform.timeS.forEach((t, i) => {
        if (t >= b.startS - 1e-9 && t < b.startS + b.tiS - 1e-9 && r.waveform.flowLpm[i] > 0) inspired += (r.waveform.flowLpm[i] / 60) * dt * 1000;
      });
      expect(Math.abs(inspired - b.vtiMl) / b.vtiMl).toBeLessThan(0.01);
    }
  });

  const passiveModes: [string, ScenarioInput][] = [
    ["volume control", { mode: "volume-control", settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 15, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 } }],
    ["volume control, ramp + pause", { mode: "volume-control", settings: { tidalVolumeMl: 450, peakFlowLpm: 50, flowPattern: "ramp", pauseS: 0.3, rateBpm: 15, peepCmH2O: 8 }, patient: { complianceMlPerCmH2O: 35, resistanceCmH2OPerLps: 15 } }],
    ["pressure control", { mode: "pressure-control", settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 } }],
    ["adaptive pressure control", { mode: "adaptive-pressure", settings: { tidalVolumeMl: 500, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 } }],
    ["volume control with trapped gas (rate 30, τ 1 s)", { mode: "volume-control", settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 30, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 20 } }],
  ];

  it.each(passiveModes)("%s: passive steady state, exhaled volume equals inspired volume within 1 %", (_name, input) => {
    const r = simulate({ ...input, breaths: 30 });
    for (const b of r.breaths.slice(-5)) expect(Math.abs(b.vteMl - b.vtiMl) / b.vtiMl).toBeLessThan(0.01);
  });

  it("trapped gas: total PEEP matches exponential emptying, PEEP + Vt·x/(1 − x)/C with x = e^(−Te/τ)", () => {
    // Rate 30 → 2 s cycle, Ti = 0.5 s, Te = 1.5 s, τ = 20·0.05 = 1 s (Yartsev, "Time constants").
    // Steady state: the end-expiratory volume V satisfies V = (V + Vt)·x.
    const r = simulate({ ...passiveModes[4][1], breaths: 30 });
    const x = Math.exp(-1.5 / 1);
    const trappedMl = (500 * x) / (1 - x);
    const expected = 5 + trappedMl / 50;
    expect(expected).toBeCloseTo(7.87, 2);
    expect(Math.abs(r.breaths.at(-1)!.totalPeepCmH2O - expected)).toBeLessThan(0.05);
    expect(r.breaths.at(-1)!.pipCmH2O).toBeCloseTo(expected + 500 / 50 + 20, 1);
  });

  it("property: passive constant-flow volume control obeys PIP = PEEP + Vt/C + R·V̇ and Pplat = PEEP + Vt/C", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 200, max: 800 }),
        fc.integer({ min: 30, max: 90 }),
        fc.integer({ min: 20, max: 80 }),
        fc.integer({ min: 2, max: 20 }),
        fc.integer({ min: 0, max: 15 }),
        (vt, flow, c, res, peep) => {
          // Rate 6 leaves ≥ 8 s to exhale: ≥ 5 τ for τ up to 1.6 s, so nothing is trapped.
          const r = simulate({
            mode: "volume-control",
            settings: { tidalVolumeMl: vt, peakFlowLpm: flow, rateBpm: 6, peepCmH2O: peep, pauseS: 0.3 },
            limits: { highPressureCmH2O: 120 },
            patient: { complianceMlPerCmH2O: c, resistanceCmH2OPerLps: res },
            breaths: 2,
          });
          const expected = volumeControlPressures(peep, vt, c, res, flow);
          const b = r.breaths[1];
          return Math.abs(b.pipCmH2O - expected.pipCmH2O) < 0.05 && Math.abs((b.pplatCmH2O ?? 0) - expected.pplatCmH2O) < 0.05;
        },
      ),
      { numRuns: 60, seed: 11 },
    );
  });

  it("the same seed gives byte-identical output; another seed gives different erratic breathing", () => {
    const s = seeds.find(([n]) => n === "adaptive-erratic-effort.json")![1];
    const a = simulate(s);
    const b = simulate(s);
    for (const key of ["timeS", "pressureCmH2O", "flowLpm", "volumeMl"] as const) {
      expect(Buffer.from(b.waveform[key].buffer).equals(Buffer.from(a.waveform[key].buffer))).toBe(true);
    }
    const lines = (r: SimulationResult) => r.breaths.map((x) => JSON.stringify(toBreathLine(x))).join("\n");
    expect(lines(b)).toBe(lines(a));
    expect(JSON.stringify(b.breaths)).toBe(JSON.stringify(a.breaths));
    expect(lines(simulate({ ...s, seed: s.seed + 1 }))).not.toBe(lines(a));
  });

  it("a shorter step (1 ms) agrees with the default 5 ms step within 1 % on volumes and 0.1 cmH2O on pressures", () => {
    const s = seeds.find(([n]) => n === "vc-flow-starvation.json")![1];
    const coarse = simulate(s).breaths.at(-1)!;
    const fine = simulate({ ...s, stepMs: 1 }).breaths.at(-1)!;
    expect(Math.abs(fine.vteMl - coarse.vteMl) / coarse.vteMl).toBeLessThan(0.01);
    expect(Math.abs(fine.pipCmH2O - coarse.pipCmH2O)).toBeLessThan(0.1);
  });
});
