/**
 * The Bench page's settings form without React: which fields each mode uses, their labels and
 * allowed ranges (field-ranges.ts), the draft the person is typing, and its check through the
 * simulator's own validateScenario — so the page refuses exactly what the module refuses, with a
 * message that names the field and its range. Nothing is applied while any field is invalid.
 */
import { DEFAULT_EFFORT } from "~/domain/bench/defaults";
import { EFFORT_RANGES, LIMITS_RANGES, PATIENT_RANGES, SETTINGS_RANGES, describeRange, type FieldRange } from "~/domain/bench/field-ranges";
import { validateScenario, type ScenarioInput } from "~/domain/bench/schema";
import type { ChangeSet, EffortKind, FlowPattern, Limits, Mode, Scenario, Settings } from "~/domain/bench/types";

/** Vendor-neutral names (Chatburn's taxonomy; ISO 19223 vocabulary). */
export const MODE_LABELS: Record<Mode, string> = {
  "volume-control": "Volume control",
  "pressure-control": "Pressure control",
  "adaptive-pressure": "Adaptive pressure control",
  "pressure-support": "Pressure support",
};

export const MODE_NOTES: Record<Mode, string> = {
  "volume-control":
    "The machine sets the flow and the volume; inspiration ends when the set volume is delivered (volume-cycled), after the pause if one is set.",
  "pressure-control": "The machine holds a set pressure above PEEP for a set inspiratory time (time-cycled); the volume follows the lung.",
  "adaptive-pressure":
    "Pressure-controlled, time-cycled breaths whose pressure the machine moves breath by breath toward a set tidal volume. A test breath with a short plateau finds the starting pressure.",
  "pressure-support":
    "Every breath is started by the patient. The machine holds a set pressure above PEEP until inspiratory flow falls to a set share of its peak (flow-cycled).",
};

export const EFFORT_LABELS: Record<EffortKind, string> = {
  none: "None (passive)",
  steady: "Steady",
  erratic: "Erratic",
};

export const FLOW_PATTERN_LABELS: Record<FlowPattern, string> = {
  constant: "Constant",
  ramp: "Descending ramp",
};

export interface NumberField {
  /** Path as validateScenario names it, e.g. "settings.tidalVolumeMl". */
  path: string;
  label: string;
  range: FieldRange;
  step: number;
  hint?: string;
}

type SettingKey = keyof typeof SETTINGS_RANGES;
const setting = (key: SettingKey, label: string, step: number, hint?: string): NumberField => ({
  path: `settings.${key}`,
  label,
  range: SETTINGS_RANGES[key],
  step,
  hint,
});

export const SETTING_FIELDS = {
  tidalVolumeMl: setting("tidalVolumeMl", "Tidal volume", 10),
  peakFlowLpm: setting("peakFlowLpm", "Peak flow", 1),
  rateBpm: setting("rateBpm", "Rate", 1),
  peepCmH2O: setting("peepCmH2O", "PEEP", 1),
  pauseS: setting("pauseS", "End-inspiratory pause", 0.1, "0 = none; a pause shows Pplat."),
  inspiratoryPressureCmH2O: setting("inspiratoryPressureCmH2O", "Inspiratory pressure above PEEP", 1),
  inspiratoryTimeS: setting("inspiratoryTimeS", "Inspiratory time", 0.1),
  supportPressureCmH2O: setting("supportPressureCmH2O", "Pressure support above PEEP", 1),
  cyclePercent: setting("cyclePercent", "Cycle threshold", 1, "Share of peak flow that ends inspiration."),
  adaptiveStepCmH2O: setting("adaptiveStepCmH2O", "Largest pressure step per breath", 0.5),
  adaptiveMarginCmH2O: setting("adaptiveMarginCmH2O", "Margin under the high-pressure limit", 1, "Pressure stays below limit − margin."),
} satisfies Partial<Record<SettingKey, NumberField>>;

export type ModeFieldKey = keyof typeof SETTING_FIELDS;

export const MODE_FIELDS: Record<Mode, readonly ModeFieldKey[]> = {
  "volume-control": ["tidalVolumeMl", "peakFlowLpm", "rateBpm", "peepCmH2O", "pauseS"],
  "pressure-control": ["inspiratoryPressureCmH2O", "inspiratoryTimeS", "rateBpm", "peepCmH2O"],
  "adaptive-pressure": ["tidalVolumeMl", "inspiratoryTimeS", "rateBpm", "peepCmH2O", "adaptiveStepCmH2O", "adaptiveMarginCmH2O"],
  "pressure-support": ["supportPressureCmH2O", "peepCmH2O", "cyclePercent"],
};

export const LIMIT_FIELDS: readonly NumberField[] = [
  { path: "limits.highPressureCmH2O", label: "High-pressure limit", range: LIMITS_RANGES.highPressureCmH2O, step: 1 },
  { path: "limits.lowPressureCmH2O", label: "Low-pressure limit", range: LIMITS_RANGES.lowPressureCmH2O, step: 1, hint: "0 switches it off." },
  { path: "limits.lowExhaledVolumeMl", label: "Low exhaled volume limit", range: LIMITS_RANGES.lowExhaledVolumeMl, step: 10, hint: "0 switches it off." },
];

export const PATIENT_FIELDS: readonly NumberField[] = [
  { path: "patient.complianceMlPerCmH2O", label: "Compliance", range: PATIENT_RANGES.complianceMlPerCmH2O, step: 1 },
  { path: "patient.resistanceCmH2OPerLps", label: "Resistance", range: PATIENT_RANGES.resistanceCmH2OPerLps, step: 1 },
];

export const EFFORT_FIELDS: readonly NumberField[] = [
  { path: "patient.effort.amplitudeCmH2O", label: "Effort strength (peak muscle pressure)", range: EFFORT_RANGES.amplitudeCmH2O, step: 1 },
  { path: "patient.effort.rateBpm", label: "Patient's own rate", range: EFFORT_RANGES.rateBpm, step: 1 },
];

export const EFFORT_KIND_PATH = "patient.effort.kind";
export const FLOW_PATTERN_PATH = "settings.flowPattern";
export const MODE_PATH = "mode";

/** What the person is editing: numbers as typed, so a half-typed value is never applied. */
export interface BenchDraft {
  mode: Mode;
  flowPattern: FlowPattern;
  effortKind: EffortKind;
  values: Record<string, string>;
}

export function visibleNumberFields(draft: Pick<BenchDraft, "mode" | "effortKind">): NumberField[] {
  return [
    ...MODE_FIELDS[draft.mode].map((k) => SETTING_FIELDS[k]),
    ...LIMIT_FIELDS,
    ...PATIENT_FIELDS,
    ...(draft.effortKind === "none" ? [] : EFFORT_FIELDS),
  ];
}

const ALL_NUMBER_FIELDS: readonly NumberField[] = [...Object.values(SETTING_FIELDS), ...LIMIT_FIELDS, ...PATIENT_FIELDS, ...EFFORT_FIELDS];

/** Labels for every path a message can name (numbers and the three choices). */
export const FIELD_LABELS: Record<string, string> = {
  ...Object.fromEntries(ALL_NUMBER_FIELDS.map((f) => [f.path, f.label])),
  [MODE_PATH]: "Mode",
  [FLOW_PATTERN_PATH]: "Flow pattern",
  [EFFORT_KIND_PATH]: "Patient effort",
};

function read(scenario: Scenario, path: string): number {
  let node: unknown = scenario;
  for (const part of path.split(".")) node = (node as Record<string, unknown>)[part];
  return node as number;
}

/** A draft showing a resolved scenario's values (every mode's fields, so switching mode keeps them). */
export function draftFromScenario(scenario: Scenario): BenchDraft {
  const values: Record<string, string> = {};
  for (const f of ALL_NUMBER_FIELDS) values[f.path] = String(read(scenario, f.path));
  // A passive patient has no effort numbers; offer gentle ones for when effort is switched on.
  const effort = scenario.patient.effort;
  if (effort.kind === "none" || effort.amplitudeCmH2O === 0) values["patient.effort.amplitudeCmH2O"] = "5";
  if (effort.kind === "none") values["patient.effort.rateBpm"] = String(DEFAULT_EFFORT.rateBpm);
  return { mode: scenario.mode, flowPattern: scenario.settings.flowPattern, effortKind: effort.kind, values };
}

export type DraftCheck =
  | { ok: true; scenario: Scenario }
  | { ok: false; fieldErrors: Record<string, string[]>; formErrors: string[] };

/** "Tidal volume must be …" when the message continues the field's name, "Label: …" otherwise. */
export function messageFor(path: string, message: string): string {
  const label = FIELD_LABELS[path];
  if (!label) return `${path}: ${message}`;
  return /^(must|is|too|leaves|give)\b/.test(message) ? `${label} ${message}` : `${label}: ${message}`;
}

function setPath(target: Record<string, unknown>, path: string, value: unknown): void {
  const parts = path.split(".");
  let node = target;
  for (const part of parts.slice(0, -1)) node = (node[part] ??= {}) as Record<string, unknown>;
  node[parts[parts.length - 1]] = value;
}

/**
 * Builds the scenario the draft describes and checks it with validateScenario. Blank or
 * non-numeric entries are refused here (with the field's range) before the module sees them.
 */
export function checkDraft(draft: BenchDraft, base: { seed: number; stepMs?: number }): DraftCheck {
  const fieldErrors: Record<string, string[]> = {};
  const add = (path: string, message: string) => void (fieldErrors[path] ??= []).push(messageFor(path, message));
  const input: Record<string, unknown> = { mode: draft.mode, settings: {}, limits: {}, patient: {}, breaths: 20, seed: base.seed };
  if (base.stepMs !== undefined) input.stepMs = base.stepMs;
  if (draft.mode === "volume-control") setPath(input, FLOW_PATTERN_PATH, draft.flowPattern);
  setPath(input, EFFORT_KIND_PATH, draft.effortKind);
  for (const field of visibleNumberFields(draft)) {
    const text = (draft.values[field.path] ?? "").trim().replace("\u2212", "-");
    const value = text === "" ? Number.NaN : Number(text);
    if (!Number.isFinite(value)) add(field.path, `must be a number ${describeRange(field.range)}${text === "" ? "" : ` (got "${text}")`}`);
    else setPath(input, field.path, value);
  }
  const result = validateScenario(input as ScenarioInput);
  if (result.ok && Object.keys(fieldErrors).length === 0) return { ok: true, scenario: result.scenario };
  const formErrors: string[] = [];
  if (!result.ok) {
    for (const e of result.errors) {
      // A blank field is already reported in our words; skip the module's "is required" twin.
      if (fieldErrors[e.field]) continue;
      if (FIELD_LABELS[e.field]) add(e.field, e.message);
      else formErrors.push(messageFor(e.field, e.message));
    }
  }
  return { ok: false, fieldErrors, formErrors };
}

const SETTING_KEYS = Object.keys(SETTINGS_RANGES).concat(["flowPattern"]) as (keyof Settings)[];
const LIMIT_KEYS = Object.keys(LIMITS_RANGES) as (keyof Limits)[];

/**
 * What changed between the scenario in use and the one the form now describes, as a change set
 * for the running simulator; null when the mode changed (a new run starts). Only what the form
 * can set is compared, so an exercise's own extras (its timeline, effort timing) stay.
 */
export function changesBetween(before: Scenario, after: Scenario): ChangeSet | null {
  if (before.mode !== after.mode) return null;
  const set: Record<string, unknown> = {};
  for (const key of SETTING_KEYS) if (before.settings[key] !== after.settings[key]) set[key] = after.settings[key];
  for (const key of LIMIT_KEYS) if (before.limits[key] !== after.limits[key]) set[key] = after.limits[key];
  for (const key of ["complianceMlPerCmH2O", "resistanceCmH2OPerLps"] as const) {
    if (before.patient[key] !== after.patient[key]) set[key] = after.patient[key];
  }
  const e0 = before.patient.effort;
  const e1 = after.patient.effort;
  if (e0.kind !== e1.kind || (e1.kind !== "none" && (e0.amplitudeCmH2O !== e1.amplitudeCmH2O || e0.rateBpm !== e1.rateBpm))) {
    set.effort = { kind: e1.kind, amplitudeCmH2O: e1.amplitudeCmH2O, rateBpm: e1.rateBpm };
  }
  return set as ChangeSet;
}

/** The scenario in use after a change set from the form (events and extras kept). */
export function withChanges(before: Scenario, set: ChangeSet): Scenario {
  const next: Scenario = {
    ...before,
    settings: { ...before.settings },
    limits: { ...before.limits },
    patient: { ...before.patient, effort: { ...before.patient.effort } },
  };
  for (const [key, value] of Object.entries(set)) {
    if (key === "effort") Object.assign(next.patient.effort, value);
    else if (key === "complianceMlPerCmH2O" || key === "resistanceCmH2OPerLps") next.patient[key] = value as number;
    else if (key in next.limits) (next.limits as unknown as Record<string, unknown>)[key] = value;
    else (next.settings as unknown as Record<string, unknown>)[key] = value;
  }
  return next;
}

/** Same values as typed? (To tell the person their edits are not applied yet.) */
export function sameDraft(a: BenchDraft, b: BenchDraft): boolean {
  if (a.mode !== b.mode || a.flowPattern !== b.flowPattern || a.effortKind !== b.effortKind) return false;
  return visibleNumberFields(a).every((f) => (a.values[f.path] ?? "").trim() === (b.values[f.path] ?? "").trim());
}
