/**
 * Demo scenario items (numbers drawn by the bench per attempt, answers computed by it) and
 * waveform-point items (the therapist clicks a moment on a bench waveform; the correct window
 * is worked out here from the simulated breaths, so it is always where the sign is).
 */
import { simulate, type ScenarioInput, type TemplateId } from "../../app/domain/bench";
import type { ItemContent } from "../../app/domain/bank/item-content";
import { scenarioItemType } from "../../app/domain/bank/present";
import { presetById } from "../../app/domain/bank/waveform-presets";
import type { DemoItem } from "./builders";
import { REF } from "./references";

type Topic = ItemContent["topics"][number];

function scenario(key: string, templateId: TemplateId, topics: Topic[], stem: string, rationale: string, reference: string): DemoItem {
  return {
    key,
    content: { type: scenarioItemType(templateId), stem, topics, body: { kind: "scenario" }, scenario: { templateId, previewSeeds: [1, 2, 3] }, rationale, reference },
  };
}

export const SCENARIO_ITEMS: DemoItem[] = [
  scenario("scn-adaptive-1", "adaptive-compliance-fall", ["modes", "lung-mechanics"], "{prompt}", "The controller steps toward the pressure that would deliver the set volume at the new compliance, no more than its step per breath, and never above its upper bound. The bench's own working for this seed is shown after grading.", REF.targeting2011),
  scenario(
    "scn-adaptive-2",
    "adaptive-compliance-fall",
    ["modes", "alarm-reasoning"],
    "Your patient is on adaptive pressure control with a set volume of {setTidalVolumeMl} mL and PEEP {peepCmH2O} cmH2O. Before the lungs stiffened the machine was using {pressureBeforeCmH2O} cmH2O above PEEP; the first stiff breath inspired only {vtiAfterFallMl} mL. The controller changes by at most {stepCmH2O} cmH2O a breath and stays {marginCmH2O} cmH2O under the {highPressureCmH2O} cmH2O limit. What pressure above PEEP will it use three breaths after the change?",
    "Each breath the pressure rises by the step (or less, when the step would overshoot or pass the upper bound of the high-pressure limit − margin). Three breaths after the fall it is at most three steps above where it was.",
    REF.adaptive2007,
  ),
  scenario("scn-cstat-1", "vc-static-compliance", ["lung-mechanics"], "{prompt}", "Static compliance = Vt / (Pplat − PEEP); peak pressure is not used because it includes the resistive pressure.", REF.hessKacmarek),
  scenario(
    "scn-cstat-2",
    "vc-static-compliance",
    ["lung-mechanics", "waveform-reading"],
    "On your morning check you set an inspiratory hold on a volume-controlled breath. The screen shows: tidal volume {tidalVolumeMl} mL, peak {pipCmH2O} cmH2O, plateau {pplatCmH2O} cmH2O, PEEP {peepCmH2O} cmH2O, flow {peakFlowLpm} L/min. What is the static compliance?",
    "Static compliance uses the plateau: Vt / (Pplat − PEEP).",
    REF.pilbeam,
  ),
  scenario(
    "scn-cstat-3",
    "vc-static-compliance",
    ["lung-mechanics"],
    "A new admission after abdominal surgery, volume control with a pause. Vt {tidalVolumeMl} mL, PIP {pipCmH2O} cmH2O, Pplat {pplatCmH2O} cmH2O, PEEP {peepCmH2O} cmH2O. Calculate the static compliance to one decimal.",
    "Vt / (Pplat − PEEP), to one decimal; the unit is mL/cmH2O.",
    REF.egan,
  ),
  scenario("scn-raw-1", "vc-airway-resistance", ["lung-mechanics"], "{prompt}", "Raw = (PIP − Pplat) / flow, with the flow converted from L/min to L/s without rounding.", REF.hessKacmarek),
  scenario(
    "scn-raw-2",
    "vc-airway-resistance",
    ["lung-mechanics", "alarm-reasoning"],
    "The peak pressure alarm has been sounding on and off. In volume control at a constant {peakFlowLpm} L/min with an end-inspiratory pause you read PIP {pipCmH2O} cmH2O and Pplat {pplatCmH2O} cmH2O (PEEP {peepCmH2O} cmH2O, Vt {tidalVolumeMl} mL). What is the airway resistance?",
    "The resistive pressure is PIP − Pplat; divide by the flow in L/s. A high value points to the airway (secretions, bronchospasm, a kinked tube), not the lung's stiffness.",
    REF.pilbeam,
  ),
  scenario("scn-alarm-1", "which-alarm", ["alarm-reasoning", "modes"], "{prompt}", "Each alarm answers a different question: high pressure (the pressure reached the limit), low pressure (the pressure stayed below its limit), low exhaled volume, and volume target not reached (an adaptive mode at its upper bound). The bench's reason for this seed is shown after grading.", REF.hessKacmarek),
  scenario(
    "scn-alarm-2",
    "which-alarm",
    ["alarm-reasoning", "patient-ventilator-asynchrony"],
    "Read the situation and the waveform. {prompt}",
    "Work out what changed (the lung, the patient's effort, or the settings) and which variable the mode controls; the alarm is the one whose condition that change meets.",
    REF.egan,
  ),
  scenario(
    "scn-alarm-3",
    "which-alarm",
    ["alarm-reasoning"],
    "Night shift: the ventilator alarms at breath {breath}. {prompt}",
    "In volume control a stiffer lung raises pressure (high pressure) and a hungry patient lowers it (low pressure); in pressure support less support means smaller volumes; adaptive pressure control at its bound cannot reach its volume.",
    REF.pilbeam,
  ),
  scenario(
    "scn-pc-volume-1",
    "pc-tidal-volume",
    ["lung-mechanics", "modes"],
    "{prompt}",
    "A passive lung fills exponentially toward C × ΔP with time constant τ = R × C: Vt = C × ΔP × (1 − e^(−Ti/τ)). The bench's working for this seed is shown after grading.",
    REF.timeConstants,
  ),
  scenario(
    "scn-pc-volume-2",
    "pc-tidal-volume",
    ["lung-mechanics", "modes"],
    "A sedated patient on pressure control: {pressureAbovePeepCmH2O} cmH2O above a PEEP of {peepCmH2O} cmH2O, inspiratory time {inspiratoryTimeS} s. The time constant is {timeConstantS} s and compliance {complianceMlPerCmH2O} mL/cmH2O. What tidal volume is delivered?",
    "With τ given, Vt = C × ΔP × (1 − e^(−Ti/τ)); when Ti is several time constants the lung nearly reaches C × ΔP, when it is short the volume falls well below it.",
    REF.hessKacmarek,
  ),
];

function waveform(key: string, topics: Topic[], presetId: string, stem: string, pick: (run: ReturnType<typeof simulate>) => { fromS: number; toS: number }, rationale: string, reference: string): DemoItem {
  const preset = presetById(presetId);
  if (!preset) throw new Error(`no waveform preset ${presetId}`);
  const run = simulate(preset.bench as ScenarioInput);
  const w = pick(run);
  const round = (x: number) => Number(x.toFixed(2));
  return {
    key,
    content: {
      type: "waveform-point",
      stem,
      topics,
      body: { kind: "waveform-point", bench: preset.bench as Record<string, unknown>, viewFromS: 0, viewToS: preset.viewToS, window: { fromS: round(w.fromS), toS: round(w.toS) } },
      scenario: null,
      rationale,
      reference,
    },
  };
}

export const WAVEFORM_ITEMS: DemoItem[] = [
  waveform(
    "wp-plateau",
    ["waveform-reading", "lung-mechanics"],
    "vc-pause",
    "Volume control with an end-inspiratory pause. Click the moment on the second breath where you would read the plateau pressure.",
    (run) => {
      const b = run.breaths[1];
      // The pause is the last 0.5 s of Ti: flow is zero and pressure has settled.
      return { fromS: b.startS + b.tiS - 0.5 + 0.1, toS: b.startS + b.tiS };
    },
    "The plateau is read during the pause, once flow is zero and pressure has settled — the end of the pause, just before the expiratory valve opens.",
    REF.hessKacmarek,
  ),
  waveform(
    "wp-scoop",
    ["waveform-reading", "patient-ventilator-asynchrony"],
    "vc-flow-starvation",
    "Volume control at a low set flow with a breathless patient. Click, on the third breath, where the pressure curve shows that the patient wants more flow than is set.",
    (run) => {
      const b = run.breaths[2];
      return { fromS: b.startS, toS: b.startS + b.tiS };
    },
    "The patient's effort pulls airway pressure down during the fixed-flow inspiration, scooping the pressure curve; the volume is still delivered.",
    REF.waveforms2006,
  ),
  waveform(
    "wp-trapped",
    ["waveform-reading", "lung-mechanics", "patient-ventilator-asynchrony"],
    "vc-trapped-gas",
    "Volume control in a patient with high airway resistance and a fast rate. Click, on the flow curve, the moment that shows gas is trapped at the end of the second breath.",
    (run) => {
      const next = run.breaths[2];
      return { fromS: next.startS - 0.4, toS: next.startS + 0.05 };
    },
    "Expiratory flow is still running (below zero) when the next breath starts: the lung has not emptied, and alveolar pressure at that moment is above the set PEEP.",
    REF.autoPeep1982,
  ),
  waveform(
    "wp-ps-cycle",
    ["waveform-reading", "cycle-variables"],
    "ps-cycle",
    "Pressure support. Click the moment on the second breath when the ventilator cycles to expiration.",
    (run) => {
      const b = run.breaths[1];
      return { fromS: b.startS + b.tiS - 0.12, toS: b.startS + b.tiS + 0.12 };
    },
    "Inspiration ends when the decaying inspiratory flow reaches the cycle threshold (25 % of peak flow here); pressure then falls to PEEP.",
    REF.pressureSupport2005,
  ),
  waveform(
    "wp-pc-time",
    ["waveform-reading", "cycle-variables", "modes"],
    "pc-passive",
    "Pressure control, passive patient. Click the moment on the second breath when the set inspiratory time ends.",
    (run) => {
      const b = run.breaths[1];
      return { fromS: b.startS + b.tiS - 0.1, toS: b.startS + b.tiS + 0.1 };
    },
    "Pressure control is time-cycled: the pressure is held until the set inspiratory time (1 s here) has elapsed, whatever the flow is doing.",
    REF.classification2007,
  ),
  waveform(
    "wp-double",
    ["waveform-reading", "patient-ventilator-asynchrony"],
    "vc-long-effort",
    "Volume control with a short set inspiration and a patient making long, strong efforts. Click the start of a breath that was double-triggered (stacked on the one before).",
    (run) => {
      // The first breath that starts within a second of the previous breath's start.
      const stacked = run.breaths.find((b, i) => i > 0 && b.startS - run.breaths[i - 1].startS < 1.0 && b.trigger === "patient")!;
      return { fromS: stacked.startS - 0.15, toS: stacked.startS + 0.15 };
    },
    "The effort outlasts the machine's inspiration, so the continuing effort triggers a second breath almost at once; the two volumes stack.",
    REF.asynchrony2006,
  ),
];
