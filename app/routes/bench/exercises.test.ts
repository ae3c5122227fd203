/**
 * Every guided exercise is a valid scenario, and every number its answer states is what the
 * simulator produces — so the teaching text cannot drift from the model. Expected values are
 * worked from the equation of motion, Paw + Pmus = PEEP + V/C + R·V̇ (Chatburn RL, El-Khatib M,
 * Mireles-Cabodevila E, Respir Care 2014;59(11):1747–63) and pressure-controlled filling,
 * Vt = C·ΔP·(1 − e^(−Ti/τ)) (Yartsev A, Deranged Physiology, "Time constants"), where they can be;
 * numbers that come only from the model (a patient's effort, the adaptive steps) are checked
 * against the simulator with the tolerance the text's rounding allows.
 */
import { describe, expect, it } from "vitest";
import { pressureControlTidalVolumeMl, volumeControlPressures } from "~/domain/bench/calculations";
import { validateScenario } from "~/domain/bench/schema";
import { simulate } from "~/domain/bench/simulate";
import type { BreathReading } from "~/domain/bench/types";
import { EXERCISES, FREE_PLAY, findExercise } from "./exercises";

function run(id: string, breaths = 24, settings: Record<string, unknown> = {}) {
  const exercise = findExercise(id);
  if (!exercise) throw new Error(`no exercise ${id}`);
  const scenario = { ...exercise.scenario, settings: { ...exercise.scenario.settings, ...settings }, breaths };
  const result = simulate(scenario);
  return { exercise, at: (n: number): BreathReading => result.breaths[n - 1] };
}

describe("guided exercises", () => {
  it("there are at least five, with unique ids, each a valid scenario ending in a question with an answer", () => {
    expect(EXERCISES.length).toBeGreaterThanOrEqual(5);
    expect(new Set(EXERCISES.map((e) => e.id)).size).toBe(EXERCISES.length);
    for (const e of EXERCISES) {
      expect(validateScenario(e.scenario), e.id).toMatchObject({ ok: true });
      expect(e.scenario.mode).toBe(e.mode);
      expect(e.question.endsWith("?"), e.id).toBe(true);
      expect(e.answer.length).toBeGreaterThan(40);
      expect(e.rationale.length).toBeGreaterThan(80);
      // Events start after the three breaths the page shows at once, so the learner sees them happen.
      for (const ev of e.scenario.events ?? []) expect(ev.atBreath ?? 99, e.id).toBeGreaterThan(3);
    }
    expect(validateScenario(FREE_PLAY)).toMatchObject({ ok: true });
  });

  it("vc-stiff-lung: PIP 25 → 35 and Pplat 15 → 25 at breath 6, gap 10, back at breath 11", () => {
    const { at, exercise } = run("vc-stiff-lung", 12);
    const normal = volumeControlPressures(5, 500, 50, 10, 60);
    const stiff = volumeControlPressures(5, 500, 25, 10, 60);
    expect([normal.pipCmH2O, normal.pplatCmH2O, stiff.pipCmH2O, stiff.pplatCmH2O]).toEqual([25, 15, 35, 25]);
    expect(at(5).pipCmH2O).toBeCloseTo(25, 1);
    expect(at(5).pplatCmH2O!).toBeCloseTo(15, 1);
    expect(at(6).pipCmH2O).toBeCloseTo(35, 1);
    expect(at(6).pplatCmH2O!).toBeCloseTo(25, 1);
    expect(at(6).pipCmH2O - at(6).pplatCmH2O!).toBeCloseTo(10, 1);
    expect(at(11).pipCmH2O).toBeCloseTo(25, 1);
    expect(exercise.answer).toContain("PIP from 25 to 35 and Pplat from 15 to 25");
  });

  it("vc-flow-starvation: PIP about 21.7 → 11.4, VTi still 500, low-pressure alarm from breath 4", () => {
    const { at } = run("vc-flow-starvation", 8);
    // Passive: 5 + 500/50 + 10 × (40/60) = 21.67 cmH2O.
    expect(at(3).pipCmH2O).toBeCloseTo(volumeControlPressures(5, 500, 50, 10, 40).pipCmH2O, 1);
    expect(at(3).pipCmH2O).toBeCloseTo(21.7, 1);
    for (const n of [4, 5, 6]) {
      expect(at(n).vtiMl).toBeCloseTo(500, 0);
      expect(at(n).alarms).toContain("low-pressure");
    }
    expect(Math.abs(at(6).pipCmH2O - 11.4)).toBeLessThan(0.1);
  });

  it("vc-high-pressure-limit: about 300 mL in 0.3 s, cut by the 30 cmH2O limit", () => {
    const { at } = run("vc-high-pressure-limit", 6);
    // 5 + V/20 + 10 × 1 = 30 → V = 300 mL; at 1 L/s that is 0.3 s.
    expect(at(4).vtiMl).toBeCloseTo(300, 0);
    expect(at(4).tiS).toBeCloseTo(0.3, 2);
    expect(at(4).cycle).toBe("high-pressure");
    expect(at(4).alarms).toContain("high-pressure");
  });

  it("vc-ramp-versus-constant: ramp PIP 20 / Ti 0.87 s, constant PIP 25 / Ti 0.70 s, Pplat 15 both", () => {
    const { at } = run("vc-ramp-versus-constant", 5);
    // Ramp ends at 50 % of 1 L/s: PIP = 15 + 10 × 0.5 = 20; Ti = 0.5/(0.75 × 1) + 0.2 = 0.867 s.
    expect(at(3).pipCmH2O).toBeCloseTo(20, 1);
    expect(at(3).pplatCmH2O!).toBeCloseTo(15, 1);
    expect(at(3).tiS).toBeCloseTo(0.5 / 0.75 + 0.2, 2);
    expect(at(4).pipCmH2O).toBeCloseTo(25, 1);
    expect(at(4).pplatCmH2O!).toBeCloseTo(15, 1);
    expect(at(4).tiS).toBeCloseTo(0.7, 2);
  });

  it("pc-resistance-rises: VTi about 647 → 339 mL at PIP 20, low exhaled volume alarm, total PEEP about 5.0 → 6.1", () => {
    const { at } = run("pc-resistance-rises", 10);
    // Passive first breath from rest: 50 × 15 × (1 − e^(−1/0.5)) = 648.5 mL (V17).
    expect(at(1).vtiMl).toBeCloseTo(pressureControlTidalVolumeMl(50, 15, 1, 10), -1);
    expect(Math.abs(at(4).vtiMl - 647)).toBeLessThan(1);
    expect(Math.abs(at(8).vtiMl - 339)).toBeLessThan(1);
    expect(at(8).pipCmH2O).toBeCloseTo(20, 6);
    expect(at(8).alarms).toContain("low-exhaled-volume");
    expect(at(4).totalPeepCmH2O).toBeCloseTo(5.0, 1);
    expect(at(8).totalPeepCmH2O).toBeCloseTo(6.1, 1);
    // From rest, the slow lung would take 50 × 15 × (1 − e^(−1/1.5)) = 365 mL; trapped volume
    // makes the steady state smaller still.
    expect(at(8).vtiMl).toBeLessThan(pressureControlTidalVolumeMl(50, 15, 1, 30));
  });

  it("apc-chases-volume: 283 mL at breath 6, steps of 3 (11.6, 14.6, 17.6), about 20.4 and 500 mL from breath 9, about 881 mL at breath 16", () => {
    const { at } = run("apc-chases-volume", 20);
    expect(Math.abs(at(6).vtiMl - 283)).toBeLessThan(1);
    expect([6, 7, 8].map((n) => at(n).inspiratoryPressureCmH2O!.toFixed(1))).toEqual(["11.6", "14.6", "17.6"]);
    expect(at(9).inspiratoryPressureCmH2O!).toBeCloseTo(20.4, 1);
    expect(at(9).vtiMl).toBeCloseTo(500, 0);
    expect(Math.abs(at(16).vtiMl - 881)).toBeLessThan(1);
    expect(at(19).inspiratoryPressureCmH2O!).toBeCloseTo(11.6, 1);
    for (let n = 3; n <= 20; n++) {
      expect(Math.abs(at(n).inspiratoryPressureCmH2O! - at(n - 1).inspiratoryPressureCmH2O!)).toBeLessThanOrEqual(3 + 1e-9);
    }
    // The rationale's estimate: 50 × 11.6 × (1 − e^(−2)) ≈ 500 mL.
    expect(pressureControlTidalVolumeMl(50, 11.6, 1, 10)).toBeCloseTo(500, -1);
  });

  it("ps-cycle-threshold: peak about 62 L/min, cycles near 15.5 L/min, Ti 0.81 / VTi 563 at 25 %, 0.61 / 489 at 50 %", () => {
    const at25 = run("ps-cycle-threshold", 4).at(3);
    expect(Math.abs(at25.peakFlowLpm - 62)).toBeLessThan(0.5);
    expect(at25.cycle).toBe("flow");
    expect(at25.trigger).toBe("patient");
    expect(Math.abs(at25.tiS - 0.81)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(at25.vtiMl - 563)).toBeLessThan(2);
    const at50 = run("ps-cycle-threshold", 4, { cyclePercent: 50 }).at(3);
    expect(Math.abs(at50.tiS - 0.61)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(at50.vtiMl - 489)).toBeLessThan(2);
  });
});
