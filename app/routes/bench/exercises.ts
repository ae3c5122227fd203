/**
 * Guided exercises of the Bench page, written for Tidemark. Each is a short scenario loaded into
 * the bench with one click, things to watch, a question, and an answer whose rationale works
 * from the equation of motion, Paw + Pmus = PEEP + V/C + R·V̇ (Chatburn RL, El-Khatib M,
 * Mireles-Cabodevila E, "A taxonomy for mechanical ventilation: 10 fundamental maxims",
 * Respir Care 2014;59(11):1747–63). Pressure-controlled filling follows
 * Vt = C·ΔP·(1 − e^(−Ti/τ)), τ = R·C (Yartsev A, Deranged Physiology, "Time constants").
 *
 * Every number an answer states is checked against the simulator in exercises.test.ts, so the
 * text cannot drift from the model. Patients and numbers are invented teaching cases.
 */
import type { Exercise } from "~/components/bench/exercise";
import type { ScenarioInput } from "~/domain/bench/schema";

export type { Exercise };

/** What the bench shows when no exercise is loaded: a passive adult lung in volume control
 *  (adult teaching values, common practice, no source). */
export const FREE_PLAY: ScenarioInput = {
  mode: "volume-control",
  settings: {
    tidalVolumeMl: 500,
    peakFlowLpm: 60,
    flowPattern: "constant",
    rateBpm: 15,
    peepCmH2O: 5,
    pauseS: 0,
    inspiratoryPressureCmH2O: 15,
    inspiratoryTimeS: 1,
    supportPressureCmH2O: 10,
    cyclePercent: 25,
  },
  limits: { highPressureCmH2O: 40, lowPressureCmH2O: 10, lowExhaledVolumeMl: 300 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
  breaths: 20,
  seed: 1,
};

export const EXERCISES: readonly Exercise[] = [
  {
    id: "vc-stiff-lung",
    title: "Volume control: the lung stiffens",
    mode: "volume-control",
    summary: "Compliance halves for five breaths. Which pressures move, and by how much?",
    steps: [
      "Read PIP and Pplat on breaths 1 to 5: a 0.3 s pause after each breath shows the plateau.",
      "At breath 6 the lung's compliance falls from 50 to 25 mL/cmH2O. Watch the pressure panel.",
      "At breath 11 the lung recovers. Open the readings table under the plot to compare breaths.",
    ],
    question: "By how much do PIP and Pplat rise at breath 6, and what happens to the gap between them?",
    answer:
      "Both rise by 10 cmH2O on the very first stiff breath: PIP from 25 to 35 and Pplat from 15 to 25 cmH2O. The gap PIP − Pplat stays 10 cmH2O. Both fall back at breath 11.",
    rationale:
      "The machine fixes the volume (500 mL) and the flow (60 L/min = 1 L/s). With no flow during the pause, Pplat = PEEP + Vt/C = 5 + 500/50 = 15 cmH2O; at the end of delivery PIP adds the resistive pressure R·V̇ = 10 × 1 = 10, so 25. Halving C doubles the elastic term to 500/25 = 20, lifting both pressures by 10, while R·V̇ is unchanged. A plateau that rises with the peak, gap unchanged, points to the lung or chest wall rather than the airway.",
    scenario: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "constant", rateBpm: 14, peepCmH2O: 5, pauseS: 0.3 },
      limits: { highPressureCmH2O: 45, lowPressureCmH2O: 10, lowExhaledVolumeMl: 300 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [
        { atBreath: 6, set: { complianceMlPerCmH2O: 25 } },
        { atBreath: 11, set: { complianceMlPerCmH2O: 50 } },
      ],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "vc-flow-starvation",
    title: "Volume control: a patient who wants more flow",
    mode: "volume-control",
    summary: "The patient starts pulling against a set flow of 40 L/min.",
    steps: [
      "Breaths 1 to 3 are passive: note PIP and the straight rise of the pressure trace.",
      "From breath 4 the patient makes strong, regular efforts (12 cmH2O, 20 a minute).",
      "Watch the shape of the pressure trace during inspiration, PIP, VTi and the alarm banner.",
    ],
    question: "Why does the peak pressure fall and the low-pressure alarm sound while the inspired volume stays at 500 mL?",
    answer:
      "PIP falls from about 21.7 to about 11.4 cmH2O and the pressure trace sags in the middle of inspiration (a scooped, concave curve). VTi stays 500 mL, yet the low-pressure alarm (limit 15 cmH2O) sounds on every breath: the alarm watches pressure, not volume.",
    rationale:
      "In volume control the machine sets V̇ and V, so the right side of Paw + Pmus = PEEP + V/C + R·V̇ does not change when the patient pulls. Whatever muscle pressure the patient adds must come off the airway pressure: Paw = PEEP + V/C + R·V̇ − Pmus. The scoop is the patient's effort drawn on the pressure panel. A higher set flow, or a pressure-targeted mode in which flow can follow demand, relieves it.",
    scenario: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 500, peakFlowLpm: 40, flowPattern: "constant", rateBpm: 12, peepCmH2O: 5 },
      limits: { highPressureCmH2O: 40, lowPressureCmH2O: 15, lowExhaledVolumeMl: 300 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [{ atBreath: 4, set: { effort: { kind: "steady", amplitudeCmH2O: 12, rateBpm: 20, onsetS: 0, durationS: 1.2 } } }],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "vc-high-pressure-limit",
    title: "Volume control: the high-pressure limit ends the breath",
    mode: "volume-control",
    summary: "Compliance falls to 20 mL/cmH2O with the high-pressure limit at 30 cmH2O.",
    steps: [
      "Breaths 1 to 3 deliver 500 mL with a PIP of 25 cmH2O.",
      "At breath 4 compliance falls from 50 to 20 mL/cmH2O. Watch the flow and volume panels.",
    ],
    question: "From breath 4, how much of the 500 mL set volume does the patient receive, and why?",
    answer:
      "About 300 mL. Inspiration stops after 0.3 s, when airway pressure reaches the 30 cmH2O limit; the high-pressure alarm sounds on every breath and the rest of the set volume is never delivered.",
    rationale:
      "With C = 20 the equation of motion predicts PIP = PEEP + Vt/C + R·V̇ = 5 + 500/20 + 10 × 1 = 40 cmH2O, above the limit. Pressure reaches 30 when 5 + V/20 + 10 = 30, that is at V = 300 mL; at that instant the machine ends inspiration and opens the expiratory valve. Raising the limit treats the number, not the patient: find why compliance fell.",
    scenario: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "constant", rateBpm: 12, peepCmH2O: 5 },
      limits: { highPressureCmH2O: 30, lowPressureCmH2O: 0, lowExhaledVolumeMl: 0 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [{ atBreath: 4, set: { complianceMlPerCmH2O: 20 } }],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "vc-ramp-versus-constant",
    title: "Volume control: descending ramp against constant flow",
    mode: "volume-control",
    summary: "Same volume and peak flow, two flow patterns. Which gives the lower peak pressure?",
    steps: [
      "Breaths 1 to 3 use a descending ramp from 60 L/min (our ramp ends at half the peak flow), with a 0.2 s pause.",
      "From breath 4 the flow is constant at 60 L/min. Compare PIP, Pplat and Ti.",
    ],
    question: "Why is PIP lower with the ramp while Pplat is the same, and what does the ramp cost?",
    answer:
      "Ramp: PIP 20, Pplat 15 cmH2O, Ti 0.87 s. Constant flow: PIP 25, Pplat 15 cmH2O, Ti 0.70 s. The ramp lowers the peak by 5 cmH2O but takes longer to deliver the same 500 mL.",
    rationale:
      "Pplat = PEEP + Vt/C = 5 + 500/50 = 15 whatever the pattern, because there is no flow in the pause. The peak comes at the end of delivery, where the ramp's flow has fallen to 30 L/min (0.5 L/s): PIP = 15 + 10 × 0.5 = 20, against 15 + 10 × 1 = 25 with constant flow. Mean ramp flow is 75 % of peak, so delivery takes 0.5 L ÷ 0.75 L/s = 0.67 s instead of 0.5 s (each plus the 0.2 s pause).",
    scenario: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "ramp", rateBpm: 12, peepCmH2O: 5, pauseS: 0.2 },
      limits: { highPressureCmH2O: 40, lowPressureCmH2O: 10, lowExhaledVolumeMl: 300 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [{ atBreath: 4, set: { flowPattern: "constant" } }],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "pc-resistance-rises",
    title: "Pressure control: resistance rises",
    mode: "pressure-control",
    summary: "Airway resistance triples for four breaths at the same set pressure.",
    steps: [
      "Breaths 1 to 4: 15 cmH2O above PEEP for 1 s. Note VTi, peak flow and total PEEP.",
      "At breath 5 resistance rises from 10 to 30 cmH2O/(L/s); at breath 9 it falls back.",
      "Watch the flow panel: does expiratory flow reach zero before the next breath?",
    ],
    question: "PIP does not change. Why does the volume fall, and what does total PEEP tell you?",
    answer:
      "VTi falls from about 647 to about 339 mL with PIP still 20 cmH2O, and the low exhaled volume alarm (400 mL) sounds. Total PEEP rises from about 5.0 to about 6.1 cmH2O: expiration no longer finishes before the next breath.",
    rationale:
      "In pressure control the machine holds Paw, so the volume follows Vt = C·ΔP·(1 − e^(−Ti/τ)). With τ = R·C = 10 × 0.05 = 0.5 s, a 1 s Ti is two time constants: 50 × 15 × 0.86 ≈ 650 mL. At R = 30, τ = 1.5 s and 1 s is only two-thirds of a time constant, so the lung fills to about half as much. Expiration (3 s = 2τ) is also incomplete: trapped volume raises alveolar pressure at end-expiration, which is what total PEEP measures.",
    scenario: {
      mode: "pressure-control",
      settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5 },
      limits: { highPressureCmH2O: 35, lowPressureCmH2O: 10, lowExhaledVolumeMl: 400 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [
        { atBreath: 5, set: { resistanceCmH2OPerLps: 30 } },
        { atBreath: 9, set: { resistanceCmH2OPerLps: 10 } },
      ],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "apc-chases-volume",
    title: "Adaptive pressure control chases a volume",
    mode: "adaptive-pressure",
    summary: "Compliance halves and then recovers while the machine aims for 500 mL.",
    steps: [
      "Breath 1 is the test breath (volume-controlled, with a short plateau). Then watch the inspiratory pressure aimed for settle.",
      "At breath 6 compliance falls from 50 to 25 mL/cmH2O. Follow VTi and the pressure aimed for, breath by breath.",
      "At breath 16 the lung recovers. Watch the volume of that breath.",
    ],
    question: "How does the pressure respond to the stiff lung, and what volume does the first breath after recovery receive?",
    answer:
      "At breath 6 VTi drops to about 283 mL. The pressure aimed for then climbs by at most 3 cmH2O a breath (11.6, 14.6, 17.6) and settles near 20.4 cmH2O above PEEP, with 500 mL again from breath 9. At breath 16 the recovered lung gets about 881 mL at that pressure; the pressure then steps back down, 3 cmH2O a breath, to about 11.6.",
    rationale:
      "Each breath is pressure-controlled, so Vt = C·ΔP·(1 − e^(−Ti/τ)). With C 50, R 10 and Ti 1 s (τ 0.5 s), ΔP ≈ 11.6 gives 50 × 11.6 × 0.86 ≈ 500 mL. With C 25 (τ 0.25 s) the same ΔP gives about 25 × 11.6 × 0.98 ≈ 285 mL, so the controller raises ΔP toward the roughly 20 cmH2O the stiff lung needs, limited to 3 cmH2O a step. It learns only after each breath: the breath at which compliance recovers still gets the pressure set for the stiff lung, hence the large volume.",
    scenario: {
      mode: "adaptive-pressure",
      settings: { tidalVolumeMl: 500, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5, adaptiveStepCmH2O: 3, adaptiveMarginCmH2O: 5 },
      limits: { highPressureCmH2O: 40, lowPressureCmH2O: 0, lowExhaledVolumeMl: 300 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "none" } },
      events: [
        { atBreath: 6, set: { complianceMlPerCmH2O: 25 } },
        { atBreath: 16, set: { complianceMlPerCmH2O: 50 } },
      ],
      breaths: 30,
      seed: 1,
    },
  },
  {
    id: "ps-cycle-threshold",
    title: "Pressure support: when does the breath end?",
    mode: "pressure-support",
    summary: "A patient breathing 18 a minute on 10 cmH2O of support. Move the cycle threshold.",
    steps: [
      "Read peak flow, Ti and VTi with the cycle threshold at 25 % of peak flow.",
      "Pause if you like, set Cycle threshold to 50 and choose Apply settings. Compare the next breaths.",
    ],
    question: "At what flow does inspiration end at 25 %, and what happens to Ti and VTi at 50 %?",
    answer:
      "Peak flow is about 62 L/min, so at 25 % inspiration ends when flow falls to about 15.5 L/min: Ti about 0.81 s, VTi about 563 mL. At 50 % it ends at about 31 L/min: Ti about 0.61 s and VTi about 489 mL.",
    rationale:
      "During a supported breath Paw is held at PEEP + 10, so V̇ = (10 + Pmus − V/C)/R: flow peaks early and then falls as the lung fills, with τ = R·C = 0.5 s. The machine cycles when flow reaches the set share of that peak; a higher share ends the breath earlier on the falling flow, so Ti and the volume fall. The patient triggers every breath; with no effort there would be no breath at all.",
    scenario: {
      mode: "pressure-support",
      settings: { supportPressureCmH2O: 10, peepCmH2O: 5, cyclePercent: 25 },
      limits: { highPressureCmH2O: 35, lowPressureCmH2O: 0, lowExhaledVolumeMl: 300 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10, effort: { kind: "steady", amplitudeCmH2O: 5, rateBpm: 18 } },
      breaths: 30,
      seed: 1,
    },
  },
];

export function findExercise(id: string | null | undefined): Exercise | null {
  return EXERCISES.find((e) => e.id === id) ?? null;
}
