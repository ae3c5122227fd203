/**
 * The scenario file format (issue 3, item 5) as a zod 4 schema, with plausible ranges
 * (field-ranges.ts), the fields each mode needs, and cross-field checks. Every message
 * names the field by its path ("settings.tidalVolumeMl") and the allowed range.
 *
 * Pressures cmH2O, volumes mL, flows L/min, times s. Fields a mode does not use are ignored;
 * unknown fields are refused (a misspelt field would otherwise be silently ignored).
 */
import { z } from "zod";
import { DEFAULT_EFFORT, DEFAULT_LIMITS, DEFAULT_SETTINGS, DEFAULT_STEP_MS } from "./defaults";
import { EFFORT_RANGES, LIMITS_RANGES, PATIENT_RANGES, RUN_RANGES, SETTINGS_RANGES, describeRange, type FieldRange } from "./field-ranges";
import { createFlowProfile } from "./modes/volume-control";
import { MODES, type Mode, type Scenario } from "./types";

function ranged(range: FieldRange) {
  const kind = range.integer ? "a whole number" : "a number";
  const message = (iss: { input?: unknown }) => `must be ${kind} ${describeRange(range)} (got ${String(iss.input)})`;
  let schema = z
    .number({ error: (iss) => (iss.input === undefined ? `is required (${describeRange(range)})` : `must be ${kind} ${describeRange(range)} (got ${JSON.stringify(iss.input)})`) })
    .min(range.min, { error: message })
    .max(range.max, { error: message });
  if (range.integer) schema = schema.int({ error: message });
  return schema;
}

function oneOf<const T extends readonly [string, ...string[]]>(values: T) {
  return z.enum(values, { error: (iss) => `must be one of ${values.map((v) => `"${v}"`).join(", ")} (got ${JSON.stringify(iss.input)})` });
}

function rangedFields<R extends Record<string, FieldRange>>(ranges: R) {
  return Object.fromEntries(Object.entries(ranges).map(([key, range]) => [key, ranged(range).optional()])) as {
    [K in keyof R]: z.ZodOptional<ReturnType<typeof ranged>>;
  };
}

const settingsShape = {
  ...rangedFields(SETTINGS_RANGES),
  flowPattern: oneOf(["constant", "ramp"]).optional(),
  adaptiveStartup: oneOf(["test-breath", "set-pressure"]).optional(),
  triggerType: oneOf(["flow", "pressure"]).optional(),
};

const effortSchema = z.strictObject({
  kind: oneOf(["none", "steady", "erratic"]).optional(),
  ...rangedFields(EFFORT_RANGES),
  durationS: ranged(EFFORT_RANGES.durationS).nullable().optional(),
});

const limitsShape = rangedFields(LIMITS_RANGES);
const patientShape = rangedFields(PATIENT_RANGES);

/** An event's "set": any settings, limits or patient field. */
export const changeSetSchema = z.strictObject({ ...settingsShape, ...limitsShape, ...patientShape, effort: effortSchema.optional() });

const eventSchema = z
  .strictObject({
    atBreath: ranged(RUN_RANGES.atBreath).optional(),
    atTimeS: ranged(RUN_RANGES.atTimeS).optional(),
    set: changeSetSchema,
  })
  .superRefine((event, ctx) => {
    if ((event.atBreath === undefined) === (event.atTimeS === undefined)) {
      ctx.addIssue({ code: "custom", path: ["atBreath"], message: "give exactly one of atBreath or atTimeS" });
    }
  });

/** Fields each mode cannot do without (the rest have defaults, defaults.ts). */
export const REQUIRED_SETTINGS: Record<Mode, readonly (keyof typeof settingsShape)[]> = {
  "volume-control": ["tidalVolumeMl", "peakFlowLpm", "rateBpm", "peepCmH2O"],
  "pressure-control": ["inspiratoryPressureCmH2O", "inspiratoryTimeS", "rateBpm", "peepCmH2O"],
  "adaptive-pressure": ["tidalVolumeMl", "inspiratoryTimeS", "rateBpm", "peepCmH2O"],
  "pressure-support": ["supportPressureCmH2O", "peepCmH2O"],
};

const rawScenarioSchema = z.strictObject({
  mode: oneOf(MODES as unknown as readonly [Mode, ...Mode[]]),
  settings: z.strictObject(settingsShape),
  limits: z.strictObject(limitsShape).optional(),
  patient: z.strictObject({
    complianceMlPerCmH2O: ranged(PATIENT_RANGES.complianceMlPerCmH2O),
    resistanceCmH2OPerLps: ranged(PATIENT_RANGES.resistanceCmH2OPerLps),
    effort: effortSchema.optional(),
  }),
  events: z.array(eventSchema).optional(),
  breaths: ranged(RUN_RANGES.breaths).optional(),
  seed: ranged(RUN_RANGES.seed).optional(),
  stepMs: ranged(RUN_RANGES.stepMs).optional(),
});

type RawScenario = z.output<typeof rawScenarioSchema>;

function resolve(raw: RawScenario): Scenario {
  const settings = { ...DEFAULT_SETTINGS, ...raw.settings };
  const effort = { ...DEFAULT_EFFORT, ...raw.patient.effort };
  return {
    mode: raw.mode,
    settings,
    limits: { ...DEFAULT_LIMITS, ...raw.limits },
    patient: {
      complianceMlPerCmH2O: raw.patient.complianceMlPerCmH2O,
      resistanceCmH2OPerLps: raw.patient.resistanceCmH2OPerLps,
      effort,
    },
    events: (raw.events ?? []).map((e) => (e.atBreath !== undefined ? { atBreath: e.atBreath, set: e.set } : { atTimeS: e.atTimeS!, set: e.set })),
    breaths: raw.breaths ?? 20,
    seed: raw.seed ?? 1,
    stepMs: raw.stepMs ?? DEFAULT_STEP_MS,
  };
}

/** Cross-field checks that only make sense once each field is in range. */
function checkScenario(s: Scenario, raw: RawScenario, add: (path: (string | number)[], message: string) => void): void {
  for (const field of REQUIRED_SETTINGS[s.mode]) {
    if (raw.settings[field] === undefined) {
      const range: FieldRange | undefined = (SETTINGS_RANGES as Record<string, FieldRange>)[field];
      add(["settings", field], `is required in ${s.mode}${range ? ` (${describeRange(range)})` : ""}`);
    }
  }
  const { settings: st, limits } = s;
  const cycleS = 60 / st.rateBpm;
  const fmt = (x: number) => x.toFixed(2);
  if (s.mode === "volume-control") {
    const tiS = createFlowProfile(st.tidalVolumeMl, st.peakFlowLpm, st.flowPattern).deliveryS + st.pauseS;
    if (tiS >= cycleS) {
      add(["settings", "peakFlowLpm"], `too low: ${st.tidalVolumeMl} mL at ${st.peakFlowLpm} L/min (${st.flowPattern}) plus the pause takes ${fmt(tiS)} s, not shorter than the ${fmt(cycleS)} s breath cycle at ${st.rateBpm} breaths/min`);
    }
  }
  if ((s.mode === "pressure-control" || s.mode === "adaptive-pressure") && st.inspiratoryTimeS >= cycleS) {
    add(["settings", "inspiratoryTimeS"], `must be shorter than the ${fmt(cycleS)} s breath cycle at ${st.rateBpm} breaths/min (got ${st.inspiratoryTimeS})`);
  }
  if (s.mode === "pressure-control" && st.peepCmH2O + st.inspiratoryPressureCmH2O >= limits.highPressureCmH2O) {
    add(["settings", "inspiratoryPressureCmH2O"], `PEEP + inspiratory pressure (${st.peepCmH2O + st.inspiratoryPressureCmH2O}) must stay below the high-pressure limit (${limits.highPressureCmH2O} cmH2O)`);
  }
  if (s.mode === "pressure-support") {
    if (st.peepCmH2O + st.supportPressureCmH2O >= limits.highPressureCmH2O) {
      add(["settings", "supportPressureCmH2O"], `PEEP + support pressure (${st.peepCmH2O + st.supportPressureCmH2O}) must stay below the high-pressure limit (${limits.highPressureCmH2O} cmH2O)`);
    }
    if (s.patient.effort.kind === "none") add(["patient", "effort", "kind"], `pressure support is patient-triggered only: choose "steady" or "erratic" effort`);
  }
  if (s.mode === "adaptive-pressure" && limits.highPressureCmH2O - st.adaptiveMarginCmH2O - st.peepCmH2O <= 0) {
    add(["limits", "highPressureCmH2O"], `leaves no room for adaptive pressure: high-pressure limit − margin (${st.adaptiveMarginCmH2O}) − PEEP (${st.peepCmH2O}) must be above 0`);
  }
  if (limits.lowPressureCmH2O >= limits.highPressureCmH2O) {
    add(["limits", "lowPressureCmH2O"], `must be below the high-pressure limit (${limits.highPressureCmH2O} cmH2O)`);
  }
  const effortIn = raw.patient.effort;
  if (effortIn && effortIn.kind !== undefined && effortIn.kind !== "none") {
    if (effortIn.amplitudeCmH2O === undefined) add(["patient", "effort", "amplitudeCmH2O"], `is required when effort is ${effortIn.kind}`);
    if (effortIn.rateBpm === undefined) add(["patient", "effort", "rateBpm"], `is required when effort is ${effortIn.kind}`);
  }
  s.events.forEach((event, i) => {
    if (event.atBreath !== undefined && event.atBreath > s.breaths) {
      add(["events", i, "atBreath"], `must be between 1 and the number of breaths (${s.breaths}) (got ${event.atBreath})`);
    }
    // Switching effort on from none needs an amplitude, or the "effort" would be silent.
    const e = event.set.effort;
    if (e && (e.kind === "steady" || e.kind === "erratic") && e.amplitudeCmH2O === undefined && s.patient.effort.amplitudeCmH2O === 0) {
      add(["events", i, "set", "effort", "amplitudeCmH2O"], `is required when effort is switched to ${e.kind}`);
    }
  });
}

export const scenarioSchema = rawScenarioSchema.transform((raw, ctx) => {
  const scenario = resolve(raw);
  let failed = false;
  checkScenario(scenario, raw, (path, message) => {
    failed = true;
    ctx.addIssue({ code: "custom", path, message });
  });
  return failed ? z.NEVER : scenario;
});

/** What the page and the CLI accept: the file's JSON, before defaults. */
export type ScenarioInput = z.input<typeof scenarioSchema>;

export interface FieldError {
  /** Dotted path, e.g. "settings.tidalVolumeMl" or "events.0.set.complianceMlPerCmH2O". */
  field: string;
  message: string;
}

export type ValidationResult = { ok: true; scenario: Scenario } | { ok: false; errors: FieldError[] };

function toFieldErrors(error: z.ZodError): FieldError[] {
  const out: FieldError[] = [];
  for (const issue of error.issues) {
    const path = issue.path.map(String).join(".");
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) out.push({ field: path ? `${path}.${key}` : key, message: "is not a known field" });
    } else {
      out.push({ field: path || "(scenario)", message: issue.message });
    }
  }
  return out;
}

/** Field errors for a form or file; never throws. */
export function validateScenario(input: unknown): ValidationResult {
  const result = scenarioSchema.safeParse(input);
  return result.success ? { ok: true, scenario: result.data } : { ok: false, errors: toFieldErrors(result.error) };
}

export class ScenarioError extends Error {
  readonly errors: FieldError[];
  constructor(errors: FieldError[]) {
    super(`Invalid scenario:\n${errors.map((e) => `  ${e.field}: ${e.message}`).join("\n")}`);
    this.name = "ScenarioError";
    this.errors = errors;
  }
}

/** The resolved scenario, or a ScenarioError naming each bad field and its allowed range. */
export function parseScenario(input: unknown): Scenario {
  const result = validateScenario(input);
  if (!result.ok) throw new ScenarioError(result.errors);
  return result.scenario;
}
