/**
 * What the engine keeps about the breath in progress, how a breath is set up from the mode
 * and settings at its start, and the adaptive controller's memory between breaths.
 */
import { PRESSURE_SUPPORT_MAX_TI_S } from "./defaults";
import { adaptiveBounds, nextAdaptivePressure, startingPressure } from "./modes/adaptive-pressure";
import { createFlowProfile, type FlowProfile } from "./modes/volume-control";
import type { AlarmRecord, BreathCycle, BreathReading, BreathTrigger, Limits, Mode, Settings } from "./types";

export interface BreathState {
  breath: number;
  startK: number;
  trigger: BreathTrigger;
  /** "volume": flow-controlled (volume control, adaptive test breath); "pressure": pressure-controlled. */
  kind: "volume" | "pressure";
  testBreath: boolean;
  profile: FlowProfile | null;
  deliveryS: number;
  pauseSteps: number;
  pauseDone: number;
  /** Pressure above PEEP aimed for (pressure-controlled breaths). */
  targetCmH2O: number;
  /** Adaptive upper bound above PEEP at this breath (for the volume-not-reached alarm). */
  upperBoundCmH2O: number;
  tiSteps: number;
  cycle: BreathCycle;
  tiS: number;
  expStartK: number;
  pip: number;
  pplat: number | null;
  vtiL: number;
  vteL: number;
  peakFlowLps: number;
  sumPaw: number;
  alarms: AlarmRecord[];
}

export interface AdaptiveState {
  needsTestBreath: boolean;
  /** Pressure above PEEP for the next pressure breath (NaN until known). */
  pressureCmH2O: number;
}

export function createAdaptiveState(settings: Settings): AdaptiveState {
  const testBreath = settings.adaptiveStartup === "test-breath";
  return { needsTestBreath: testBreath, pressureCmH2O: testBreath ? Number.NaN : settings.inspiratoryPressureCmH2O };
}

function boundsFor(settings: Settings, limits: Limits) {
  return adaptiveBounds(limits.highPressureCmH2O, settings.adaptiveMarginCmH2O, settings.peepCmH2O, settings.adaptiveMinPressureCmH2O);
}

interface OpenArgs {
  mode: Mode;
  settings: Settings;
  limits: Limits;
  adaptive: AdaptiveState;
  breath: number;
  startK: number;
  dt: number;
  trigger: BreathTrigger;
}

export function openBreathState(a: OpenArgs): BreathState {
  const { mode, settings, dt } = a;
  const state: BreathState = {
    breath: a.breath,
    startK: a.startK,
    trigger: a.trigger,
    kind: "pressure",
    testBreath: false,
    profile: null,
    deliveryS: 0,
    pauseSteps: 0,
    pauseDone: 0,
    targetCmH2O: 0,
    upperBoundCmH2O: Number.POSITIVE_INFINITY,
    tiSteps: Math.max(1, Math.round(settings.inspiratoryTimeS / dt)),
    cycle: "time",
    tiS: 0,
    expStartK: a.startK,
    pip: Number.NEGATIVE_INFINITY,
    pplat: null,
    vtiL: 0,
    vteL: 0,
    peakFlowLps: 0,
    sumPaw: 0,
    alarms: [],
  };
  if (mode === "volume-control") {
    state.kind = "volume";
    state.profile = createFlowProfile(settings.tidalVolumeMl, settings.peakFlowLpm, settings.flowPattern);
    state.pauseSteps = Math.round(settings.pauseS / dt);
  } else if (mode === "adaptive-pressure" && a.adaptive.needsTestBreath) {
    // Test breath: constant flow delivering the set volume within the set inspiratory time,
    // leaving room for the short plateau that measures static compliance.
    const plateauS = Math.min(settings.adaptiveTestPlateauS, settings.inspiratoryTimeS / 2);
    const deliveryS = settings.inspiratoryTimeS - plateauS;
    state.kind = "volume";
    state.testBreath = true;
    state.profile = createFlowProfile(settings.tidalVolumeMl, (settings.tidalVolumeMl / 1000 / deliveryS) * 60, "constant");
    state.pauseSteps = Math.max(1, Math.round(plateauS / dt));
  } else if (mode === "adaptive-pressure") {
    const bounds = boundsFor(settings, a.limits);
    // Bounds may have moved since the last breath (a new limit, PEEP or margin).
    state.targetCmH2O = Math.min(bounds.maxCmH2O, Math.max(bounds.minCmH2O, a.adaptive.pressureCmH2O));
    state.upperBoundCmH2O = bounds.maxCmH2O;
  } else if (mode === "pressure-control") {
    state.targetCmH2O = settings.inspiratoryPressureCmH2O;
  } else {
    state.targetCmH2O = settings.supportPressureCmH2O;
    state.tiSteps = Math.round(PRESSURE_SUPPORT_MAX_TI_S / dt);
  }
  return state;
}

/** After an adaptive breath: the test breath sets the start pressure; later breaths step. */
export function updateAdaptiveAfterBreath(adaptive: AdaptiveState, b: BreathState, settings: Settings, limits: Limits): void {
  const bounds = boundsFor(settings, limits);
  const targetMl = settings.tidalVolumeMl;
  if (b.testBreath) {
    // Without a plateau (test breath cut by the high-pressure limit) the peak stands in for it.
    const plateau = (b.pplat ?? b.pip) - settings.peepCmH2O;
    adaptive.pressureCmH2O = startingPressure(targetMl, b.vtiL * 1000, plateau, bounds);
    adaptive.needsTestBreath = false;
    return;
  }
  adaptive.pressureCmH2O = nextAdaptivePressure(b.targetCmH2O, targetMl, b.vtiL * 1000, settings.adaptiveStepCmH2O, bounds);
}

/** The finished breath's reading; `endK` is the step at which the next breath begins. */
export function toReading(b: BreathState, end: { endK: number; dt: number; vteMl: number; totalPeepCmH2O: number }): BreathReading {
  const steps = end.endK - b.startK;
  return {
    breath: b.breath,
    startS: b.startK * end.dt,
    durationS: steps * end.dt,
    pipCmH2O: b.pip,
    pplatCmH2O: b.pplat,
    vtiMl: b.vtiL * 1000,
    vteMl: end.vteMl,
    peakFlowLpm: b.peakFlowLps * 60,
    tiS: b.tiS,
    // Every sample stands for one step, so the plain mean is the time average.
    mpawCmH2O: steps > 0 ? b.sumPaw / steps : b.pip,
    totalPeepCmH2O: end.totalPeepCmH2O,
    trigger: b.trigger,
    cycle: b.cycle,
    alarms: b.alarms.map((a) => a.kind),
    inspiratoryPressureCmH2O: b.kind === "pressure" ? b.targetCmH2O : null,
    testBreath: b.testBreath,
  };
}
