/**
 * Runs a whole scenario: validates it, steps the engine breath by breath and gathers the
 * waveforms, readings and alarms. Pure and deterministic: the same scenario (and seed)
 * gives byte-identical output in the browser and on the server.
 */
import { createBench } from "./engine";
import { parseScenario, type ScenarioInput } from "./schema";
import type { AlarmRecord, BreathReading, Scenario, Waveform } from "./types";

export interface SimulationResult {
  scenario: Scenario;
  waveform: Waveform;
  breaths: BreathReading[];
  alarms: AlarmRecord[];
  /** "apnoea" when no breath was triggered for APNOEA_S and the run stopped early. */
  stoppedEarly: "apnoea" | null;
}

/** Validates (throws ScenarioError with field messages) and runs `scenario.breaths` breaths. */
export function simulate(input: ScenarioInput | Scenario): SimulationResult {
  const scenario = parseScenario(input);
  const bench = createBench(scenario);
  const breaths: BreathReading[] = [];
  const alarms: AlarmRecord[] = [];
  let stoppedEarly: SimulationResult["stoppedEarly"] = null;
  while (breaths.length < scenario.breaths) {
    const step = bench.nextBreath();
    if (!step.reading) {
      stoppedEarly = "apnoea";
      break;
    }
    breaths.push(step.reading);
    alarms.push(...step.alarms);
  }
  return { scenario, waveform: bench.waveform(), breaths, alarms, stoppedEarly };
}

/** The per-breath line of `npm run sim` (issue 3, item 5): exactly these keys, rounded for reading. */
export interface BreathLine {
  breath: number;
  pipCmH2O: number;
  pplatCmH2O: number | null;
  vtiMl: number;
  vteMl: number;
  peakFlowLpm: number;
  tiS: number;
  mpawCmH2O: number;
  inspiratoryPressureCmH2O: number | null;
  alarms: string[];
}

const round = (x: number, places: number) => {
  const f = 10 ** places;
  const r = Math.round(x * f) / f;
  return Object.is(r, -0) ? 0 : r;
};

export function toBreathLine(r: BreathReading): BreathLine {
  return {
    breath: r.breath,
    pipCmH2O: round(r.pipCmH2O, 2),
    pplatCmH2O: r.pplatCmH2O === null ? null : round(r.pplatCmH2O, 2),
    vtiMl: round(r.vtiMl, 1),
    vteMl: round(r.vteMl, 1),
    peakFlowLpm: round(r.peakFlowLpm, 1),
    tiS: round(r.tiS, 3),
    mpawCmH2O: round(r.mpawCmH2O, 2),
    inspiratoryPressureCmH2O: r.inspiratoryPressureCmH2O === null ? null : round(r.inspiratoryPressureCmH2O, 2),
    alarms: [...r.alarms],
  };
}
