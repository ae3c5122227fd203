/**
 * How a breath's readings are printed wherever Tidemark shows them (plot table, Bench readings
 * panel): pressures and flows to 0.1, volumes to whole millilitres, times to 0.01 s. A true
 * minus sign, and an em dash for "no value" (Pplat without a pause).
 */
import type { AlarmKind, BreathCycle, BreathTrigger } from "~/domain/bench/types";

export function formatNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "\u2014";
  const text = value.toFixed(decimals);
  if (Number(text) === 0) return text.replace("-", "");
  return text.startsWith("-") ? `\u2212${text.slice(1)}` : text;
}

export const pressure = (v: number | null | undefined) => formatNumber(v, 1);
export const flow = (v: number | null | undefined) => formatNumber(v, 1);
export const volume = (v: number | null | undefined) => formatNumber(v, 0);
export const seconds = (v: number | null | undefined) => formatNumber(v, 2);

/** Alarm names as the Bench and items write them (same words as the scenario templates). */
export const ALARM_NAMES: Record<AlarmKind, string> = {
  "high-pressure": "High pressure",
  "low-pressure": "Low pressure",
  "low-exhaled-volume": "Low exhaled tidal volume",
  "volume-not-reached": "Volume target not reached",
};

export const TRIGGER_WORDS: Record<BreathTrigger, string> = {
  time: "time (machine)",
  patient: "patient effort",
};

export const CYCLE_WORDS: Record<BreathCycle, string> = {
  volume: "volume delivered",
  time: "set time",
  flow: "flow fell to the cycle threshold",
  "high-pressure": "high-pressure limit reached",
};

export function alarmList(kinds: readonly AlarmKind[]): string {
  return kinds.length === 0 ? "none" : kinds.map((k) => ALARM_NAMES[k]).join(", ");
}
