/**
 * The bench engine: a single-compartment lung driven by the equation of motion
 *
 *     Paw + Pmus = PEEP + V/C + R·V̇        (Chatburn, Respir Care 2014;59(11):1747–63)
 *
 * stepped at a fixed step (scenario.stepMs ≤ 10 ms). V is the lung volume above the
 * end-expiratory volume at set PEEP, so alveolar pressure is PEEP + V/C; a positive V at the
 * end of expiration is trapped volume (total PEEP above set PEEP).
 *
 * Within one step Paw (or the set flow) and Pmus are held constant, so pressure-controlled
 * phases and expiration use the exact exponential solution V → Veq + (V − Veq)·e^(−dt/RC),
 * stable for any step; flow-controlled phases integrate the linear set flow exactly.
 *
 * Settings changes take effect at the next breath; patient changes at once.
 */
import { APNOEA_S, PRESSURE_SUPPORT_MAX_TI_S, TRIGGER_LOCKOUT_S } from "./defaults";
import { createEffortSource } from "./patient";
import { type BreathState, createAdaptiveState, openBreathState, toReading, updateAdaptiveAfterBreath } from "./breath";
import { highPressureAlarm, lowExhaledVolumeAlarm, lowPressureAlarm, volumeNotReachedAlarm } from "./alarms";
import { flowAt, volumeBetween } from "./modes/volume-control";
import { applyChangeSet } from "./change-set";
import type { Bench, BreathCycle, BreathReading, BreathStep, BreathTrigger, ChangeSet, Limits, Patient, Scenario, Settings } from "./types";
import { WaveformBuffer } from "./waveform";

const WAITING = 0;
const INSPIRATION = 1;
const PAUSE = 2;
const EXPIRATION = 3;

export function createBench(scenario: Scenario): Bench {
  const dt = scenario.stepMs / 1000;
  const { mode } = scenario;
  const mandatory = mode !== "pressure-support";
  const settings: Settings = { ...scenario.settings };
  const limits: Limits = { ...scenario.limits };
  const patient: Patient = { ...scenario.patient, effort: { ...scenario.patient.effort } };
  const effort = createEffortSource(patient.effort, scenario.seed);
  const adaptive = createAdaptiveState(settings);

  const breathEvents = new Map<number, ChangeSet[]>();
  const timeEvents: { k: number; set: ChangeSet }[] = [];
  for (const event of scenario.events) {
    if (event.atBreath !== undefined) breathEvents.set(event.atBreath, [...(breathEvents.get(event.atBreath) ?? []), event.set]);
    else timeEvents.push({ k: Math.ceil(event.atTimeS / dt - 1e-9), set: event.set });
  }
  timeEvents.sort((a, b) => a.k - b.k);
  let nextTimeEvent = 0;

  const cycleGuessS = 60 / (mandatory ? settings.rateBpm : patient.effort.rateBpm || 12);
  const buffer = new WaveformBuffer((scenario.breaths * cycleGuessS * 1.2) / dt + 256);

  let k = 0;
  let volumeL = 0;
  let complianceL = 0;
  let resistance = 0;
  let decay = 0;
  const refreshMechanics = () => {
    complianceL = patient.complianceMlPerCmH2O / 1000;
    resistance = patient.resistanceCmH2OPerLps;
    decay = Math.exp(-dt / (resistance * complianceL));
  };
  refreshMechanics();

  let phase = WAITING;
  let waitStartK = 0;
  let nextMandatoryK = 0;
  let pendingTrigger: BreathTrigger | null = null;
  let breathNo = 0;
  let cur: BreathState | null = null;
  let displayBaseL = 0;

  const change = (set: ChangeSet) => {
    if (applyChangeSet(settings, limits, patient, set)) effort.update(patient.effort, k * dt);
    refreshMechanics();
  };

  const record = (paw: number, dv: number) => {
    buffer.push(k * dt, paw, (dv / dt) * 60, (volumeL - displayBaseL) * 1000);
  };

  function openBreath(trigger: BreathTrigger): void {
    breathNo += 1;
    for (const set of breathEvents.get(breathNo) ?? []) change(set);
    cur = openBreathState({ mode, settings, limits, adaptive, breath: breathNo, startK: k, dt, trigger });
    displayBaseL = volumeL;
    nextMandatoryK = k + Math.max(1, Math.round(60 / settings.rateBpm / dt));
    phase = INSPIRATION;
  }

  function endInspiration(b: BreathState, cycle: BreathCycle, tiS: number): void {
    b.cycle = cycle;
    b.tiS = tiS;
    b.expStartK = k;
    phase = EXPIRATION;
    const at = b.startK * dt + tiS;
    const low = lowPressureAlarm(b.breath, at, b.pip, limits.lowPressureCmH2O);
    if (low) b.alarms.push(low);
    if (mode === "adaptive-pressure" && !b.testBreath) {
      const miss = volumeNotReachedAlarm(b.breath, at, b.vtiL * 1000, settings.tidalVolumeMl, b.targetCmH2O, b.upperBoundCmH2O);
      if (miss) b.alarms.push(miss);
    }
  }

  function closeBreath(b: BreathState): BreathReading {
    const vteMl = b.vteL * 1000;
    const low = lowExhaledVolumeAlarm(b.breath, k * dt, vteMl, limits.lowExhaledVolumeMl);
    if (low) b.alarms.push(low);
    if (mode === "adaptive-pressure") updateAdaptiveAfterBreath(adaptive, b, settings, limits);
    cur = null;
    return toReading(b, {
      endK: k,
      dt,
      vteMl,
      totalPeepCmH2O: settings.peepCmH2O + volumeL / complianceL,
    });
  }

  /** One step of expiration (or of waiting for the first breath). Returns a trigger instead
   *  of stepping when a breath starts at this instant. */
  function expirationStep(b: BreathState | null): BreathTrigger | null {
    if (mandatory && k >= nextMandatoryK) return "time";
    const pmus = effort.pmusAt((k + 0.5) * dt);
    const peep = settings.peepCmH2O;
    const canTrigger = b === null || (k - b.expStartK) * dt >= TRIGGER_LOCKOUT_S - 1e-9;
    const drive = pmus - volumeL / complianceL;
    let paw = peep;
    let dv = 0;
    if (settings.triggerType === "pressure" && drive > 0) {
      // Closed circuit: the patient's pull lowers airway pressure instead of drawing flow.
      paw = peep - drive;
      if (canTrigger && drive >= settings.triggerPressureCmH2O) return "patient";
    } else {
      const eq = complianceL * pmus;
      dv = eq + (volumeL - eq) * decay - volumeL;
      if (canTrigger && (dv / dt) * 60 >= settings.triggerFlowLpm) return "patient";
    }
    record(paw, dv);
    if (b) {
      b.sumPaw += paw;
      if (dv < 0) b.vteL -= dv;
    }
    volumeL += dv;
    k += 1;
    return null;
  }

  function volumeStep(b: BreathState): void {
    const profile = b.profile!;
    const pmus = effort.pmusAt((k + 0.5) * dt);
    const peep = settings.peepCmH2O;
    const hpl = limits.highPressureCmH2O;
    const from = (k - b.startK) * dt;
    let to = from + dt;
    let dv = volumeBetween(profile, from, to);
    const remaining = profile.volumeL - b.vtiL;
    let done = false;
    if (dv >= remaining - 1e-12) {
      // Last step: deliver only what is left (linear interpolation of the step's share).
      to = from + (dt * remaining) / dv;
      dv = remaining;
      done = true;
    }
    const q0 = flowAt(profile, from);
    const paw0 = peep + volumeL / complianceL + resistance * q0 - pmus;
    const paw1 = peep + (volumeL + dv) / complianceL + resistance * flowAt(profile, to) - pmus;
    let cutAt = -1;
    if (paw0 >= hpl) {
      dv = 0;
      cutAt = from;
      b.pip = Math.max(b.pip, paw0);
    } else if (paw1 >= hpl) {
      const share = (hpl - paw0) / (paw1 - paw0);
      dv *= share;
      cutAt = from + share * (to - from);
      b.pip = Math.max(b.pip, hpl);
    } else {
      b.pip = Math.max(b.pip, paw0, paw1);
    }
    record(paw0, dv);
    b.sumPaw += paw0;
    if (dv > 0) b.peakFlowLps = Math.max(b.peakFlowLps, q0);
    b.vtiL += dv;
    volumeL += dv;
    k += 1;
    if (cutAt >= 0) {
      b.alarms.push(highPressureAlarm(b.breath, b.startK * dt + cutAt, hpl, b.vtiL * 1000, profile.volumeL * 1000));
      endInspiration(b, "high-pressure", cutAt);
    } else if (done) {
      b.deliveryS = to;
      if (b.pauseSteps > 0) phase = PAUSE;
      else endInspiration(b, "volume", to);
    }
  }

  function pauseStep(b: BreathState): void {
    const pmus = effort.pmusAt((k + 0.5) * dt);
    // Both valves closed: no flow, airway pressure equals alveolar pressure less the pull.
    const paw = settings.peepCmH2O + volumeL / complianceL - pmus;
    record(paw, 0);
    b.sumPaw += paw;
    b.pip = Math.max(b.pip, paw);
    k += 1;
    b.pauseDone += 1;
    if (b.pauseDone >= b.pauseSteps) {
      b.pplat = paw;
      endInspiration(b, "volume", b.deliveryS + b.pauseSteps * dt);
    }
  }

  function pressureStep(b: BreathState): void {
    const pmus = effort.pmusAt((k + 0.5) * dt);
    const paw = settings.peepCmH2O + b.targetCmH2O;
    if (paw >= limits.highPressureCmH2O) {
      record(paw, 0);
      b.sumPaw += paw;
      b.pip = Math.max(b.pip, paw);
      k += 1;
      b.alarms.push(highPressureAlarm(b.breath, (k - 1) * dt, limits.highPressureCmH2O, b.vtiL * 1000, null));
      endInspiration(b, "high-pressure", (k - 1 - b.startK) * dt);
      return;
    }
    const eq = complianceL * (b.targetCmH2O + pmus);
    const next = eq + (volumeL - eq) * decay;
    const dv = next - volumeL;
    record(paw, dv);
    b.sumPaw += paw;
    b.pip = Math.max(b.pip, paw);
    const flow = dv / dt;
    if (dv > 0) b.vtiL += dv;
    b.peakFlowLps = Math.max(b.peakFlowLps, flow);
    volumeL = next;
    k += 1;
    const elapsedS = (k - b.startK) * dt;
    if (mode === "pressure-support") {
      if (flow <= (settings.cyclePercent / 100) * b.peakFlowLps) endInspiration(b, "flow", elapsedS);
      else if (elapsedS >= PRESSURE_SUPPORT_MAX_TI_S - 1e-9) endInspiration(b, "time", elapsedS);
    } else if (k - b.startK >= b.tiSteps) {
      endInspiration(b, "time", elapsedS);
    }
  }

  function nextBreath(): BreathStep {
    const from = buffer.length;
    if (pendingTrigger) {
      openBreath(pendingTrigger);
      pendingTrigger = null;
    }
    for (;;) {
      while (nextTimeEvent < timeEvents.length && timeEvents[nextTimeEvent].k <= k) change(timeEvents[nextTimeEvent++].set);
      const b = cur;
      if (phase === INSPIRATION) {
        if (b!.kind === "volume") volumeStep(b!);
        else pressureStep(b!);
      } else if (phase === PAUSE) {
        pauseStep(b!);
      } else {
        const trigger = expirationStep(b);
        if (trigger && b) {
          pendingTrigger = trigger;
          return finish(b);
        }
        if (trigger) {
          openBreath(trigger);
        } else if (b && (k - b.expStartK) * dt >= APNOEA_S) {
          phase = WAITING;
          waitStartK = k;
          return finish(b);
        } else if (!b && (k - waitStartK) * dt >= APNOEA_S) {
          return { reading: null, samples: buffer.slice(from), alarms: [] };
        }
      }
    }
    function finish(b: BreathState): BreathStep {
      const reading = closeBreath(b);
      return { reading, samples: buffer.slice(from), alarms: b.alarms };
    }
  }

  return {
    nextBreath,
    apply: change,
    state: () => ({
      timeS: k * dt,
      breath: cur ? breathNo : breathNo + 1,
      settings: { ...settings },
      limits: { ...limits },
      patient: { ...patient, effort: { ...patient.effort } },
    }),
    waveform: () => buffer.slice(),
  };
}
