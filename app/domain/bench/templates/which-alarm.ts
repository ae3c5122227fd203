/**
 * "Which alarm does this breath raise?" One of four situations is drawn per seed; the answer
 * is read from the simulated breath (exactly one alarm fires on it, checked here):
 *
 * - high pressure: compliance falls in volume control and the pressure reaches the limit;
 * - low pressure: flow starvation in volume control — the patient pulls the pressure below
 *   a low-pressure limit set between the scooped and the passive peak;
 * - low exhaled volume: pressure support turned down under a weak patient;
 * - volume not reached: adaptive pressure control at its upper bound after a large fall in
 *   compliance.
 */
import { simulate, type SimulationResult } from "../simulate";
import type { AlarmKind } from "../types";
import { ALARM_LABELS, drawFrom, type ParameterRange, type ScenarioTemplate } from "./kit";
import type { Random } from "../prng";

const CHANGE_BREATH = 4;
const BREATHS = 10;

const r = (min: number, max: number, step: number, unit: string): ParameterRange => ({ min, max, step, unit });

const ranges = {
  tidalVolumeMl: r(450, 550, 50, "mL"),
  complianceMlPerCmH2O: r(40, 55, 5, "mL/cmH2O"),
  resistanceCmH2OPerLps: r(6, 12, 1, "cmH2O/(L/s)"),
  stiffComplianceMlPerCmH2O: r(12, 14, 1, "mL/cmH2O (after the fall)"),
  highPressureCmH2O: r(35, 40, 5, "cmH2O"),
  effortAmplitudeCmH2O: r(10, 14, 1, "cmH2O"),
  effortRateBpm: r(18, 24, 2, "breaths/min"),
  supportPressureCmH2O: r(8, 12, 1, "cmH2O"),
};

type Drawn = Record<keyof typeof ranges, number>;

interface Situation {
  expected: AlarmKind;
  story: (p: Drawn) => string;
  run: (p: Drawn, seed: number) => SimulationResult;
}

const SITUATIONS: Situation[] = [
  {
    expected: "high-pressure",
    story: (p) => `Volume control, ${p.tidalVolumeMl} mL at constant flow, high-pressure limit ${p.highPressureCmH2O} cmH2O. At breath ${CHANGE_BREATH} compliance falls from ${p.complianceMlPerCmH2O} to ${p.stiffComplianceMlPerCmH2O} mL/cmH2O.`,
    run: (p, seed) =>
      simulate({
        mode: "volume-control",
        settings: { tidalVolumeMl: p.tidalVolumeMl, peakFlowLpm: 60, rateBpm: 14, peepCmH2O: 5 },
        limits: { highPressureCmH2O: p.highPressureCmH2O },
        patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
        events: [{ atBreath: CHANGE_BREATH, set: { complianceMlPerCmH2O: p.stiffComplianceMlPerCmH2O } }],
        breaths: BREATHS,
        seed,
      }),
  },
  {
    expected: "low-pressure",
    story: (p) => `Volume control, ${p.tidalVolumeMl} mL at a constant 40 L/min. From breath ${CHANGE_BREATH} the patient breathes at ${p.effortRateBpm} breaths/min and pulls hard (muscle pressure up to ${p.effortAmplitudeCmH2O} cmH2O) through every inspiration.`,
    run: (p, seed) => {
      const base = {
        mode: "volume-control" as const,
        settings: { tidalVolumeMl: p.tidalVolumeMl, peakFlowLpm: 40, rateBpm: 12, peepCmH2O: 5 },
        patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
        events: [{ atBreath: CHANGE_BREATH, set: { effort: { kind: "steady" as const, amplitudeCmH2O: p.effortAmplitudeCmH2O, rateBpm: p.effortRateBpm, onsetS: 0, durationS: 1.2 } } }],
        breaths: BREATHS,
        seed,
      };
      // Set the low-pressure limit halfway between the scooped and the passive peak.
      const probe = simulate(base);
      const passive = probe.breaths[0].pipCmH2O;
      const scooped = probe.breaths[BREATHS - 1].pipCmH2O;
      return simulate({ ...base, limits: { highPressureCmH2O: 40, lowPressureCmH2O: Math.round((passive + scooped) / 2) } });
    },
  },
  {
    expected: "low-exhaled-volume",
    story: (p) => `Pressure support ${p.supportPressureCmH2O} cmH2O over PEEP 5 cmH2O, a patient breathing gently at ${p.effortRateBpm} breaths/min. At breath ${CHANGE_BREATH} the support is turned down to 2 cmH2O.`,
    run: (p, seed) => {
      const base = {
        mode: "pressure-support" as const,
        settings: { supportPressureCmH2O: p.supportPressureCmH2O, peepCmH2O: 5 },
        patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps, effort: { kind: "steady" as const, amplitudeCmH2O: 4, rateBpm: p.effortRateBpm } },
        events: [{ atBreath: CHANGE_BREATH, set: { supportPressureCmH2O: 2 } }],
        breaths: BREATHS,
        seed,
      };
      // Set the low exhaled volume limit halfway between the volumes before and after.
      const probe = simulate(base);
      const limit = Math.round((probe.breaths[CHANGE_BREATH - 2].vteMl + probe.breaths[BREATHS - 1].vteMl) / 20) * 10;
      return simulate({ ...base, limits: { lowExhaledVolumeMl: limit } });
    },
  },
  {
    expected: "volume-not-reached",
    story: (p) => `Adaptive pressure control, set volume ${p.tidalVolumeMl} mL, high-pressure limit ${p.highPressureCmH2O - 5} cmH2O. At breath ${CHANGE_BREATH} compliance falls from ${p.complianceMlPerCmH2O} to ${p.stiffComplianceMlPerCmH2O} mL/cmH2O.`,
    run: (p, seed) =>
      simulate({
        mode: "adaptive-pressure",
        settings: { tidalVolumeMl: p.tidalVolumeMl, inspiratoryTimeS: 1, rateBpm: 14, peepCmH2O: 5 },
        limits: { highPressureCmH2O: p.highPressureCmH2O - 5 },
        patient: { complianceMlPerCmH2O: p.complianceMlPerCmH2O, resistanceCmH2OPerLps: p.resistanceCmH2OPerLps },
        events: [{ atBreath: CHANGE_BREATH, set: { complianceMlPerCmH2O: p.stiffComplianceMlPerCmH2O } }],
        breaths: BREATHS,
        seed,
      }),
  },
];

function drawAll(random: Random): Drawn {
  return Object.fromEntries(Object.entries(ranges).map(([k, range]) => [k, drawFrom(random, range)])) as Drawn;
}

export const whichAlarm: ScenarioTemplate = {
  id: "which-alarm",
  title: "Which alarm does this breath raise?",
  topics: ["alarm reasoning", "modes", "patient–ventilator asynchrony"],
  parameterRanges: ranges,
  build(random, seed) {
    const situation = random.pick(SITUATIONS);
    const p = drawAll(random);
    const result = situation.run(p, seed);
    const last = result.breaths[result.breaths.length - 1];
    if (last.alarms.length !== 1 || last.alarms[0] !== situation.expected) {
      // A template bug, not a candidate's problem: refuse to produce an ambiguous item.
      throw new Error(`which-alarm seed ${seed}: expected only ${situation.expected} on breath ${last.breath}, the bench raised [${last.alarms.join(", ")}]`);
    }
    const options = (Object.keys(ALARM_LABELS) as AlarmKind[]).map((id) => ({ id, text: ALARM_LABELS[id] }));
    const record = result.alarms.filter((a) => a.breath === last.breath)[0];
    return {
      scenario: result.scenario,
      result,
      visibleThroughBreath: last.breath,
      shown: { breath: last.breath },
      question: { kind: "single-best-answer", prompt: `${situation.story(p)} Which alarm does breath ${last.breath} raise?`, options },
      answer: last.alarms[0],
      rationale: record.reason,
    };
  },
};
