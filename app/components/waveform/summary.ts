/**
 * The plot's text alternative in one sentence group (its aria-label): what is drawn, over which
 * times, the range of each signal, the latest breath's main readings, and any markers or
 * shaded windows. The readings table beside the plot carries the detail.
 */
import type { BreathReading } from "~/domain/bench/types";
import { alarmList, flow, pressure, volume } from "./reading-format";
import type { Domain } from "./scale";
import type { SignalKey } from "./signals";

export interface SummaryInput {
  startS: number;
  endS: number;
  /** Lowest and highest value drawn per signal; null when nothing is drawn. */
  ranges: Record<SignalKey, Domain> | null;
  breaths?: readonly BreathReading[];
  markers?: readonly { timeS: number; label: string }[];
  windows?: readonly { fromS: number; toS: number; label: string }[];
}

const s1 = (v: number) => v.toFixed(1);

export function describeWaveform(input: SummaryInput): string {
  const parts = [`Pressure, flow and volume against time, ${s1(input.startS)} to ${s1(input.endS)} s.`];
  if (input.ranges) {
    const r = input.ranges;
    parts.push(
      `Pressure ${pressure(r.pressureCmH2O[0])} to ${pressure(r.pressureCmH2O[1])} cmH2O; flow ${flow(r.flowLpm[0])} to ${flow(r.flowLpm[1])} L/min; volume ${volume(r.volumeMl[0])} to ${volume(r.volumeMl[1])} mL.`,
    );
  } else {
    parts.push("No samples in this time window.");
  }
  const breaths = input.breaths ?? [];
  if (breaths.length > 0) {
    const first = breaths[0];
    const last = breaths[breaths.length - 1];
    parts.push(
      breaths.length === 1 ? `Breath ${last.breath} shown.` : `Breaths ${first.breath} to ${last.breath} shown.`,
      `Latest, breath ${last.breath}: peak pressure ${pressure(last.pipCmH2O)} cmH2O, inspired volume ${volume(last.vtiMl)} mL, exhaled volume ${volume(last.vteMl)} mL, alarms ${alarmList(last.alarms)}.`,
    );
  }
  for (const m of input.markers ?? []) parts.push(`Marker "${m.label}" at ${s1(m.timeS)} s.`);
  for (const w of input.windows ?? []) parts.push(`Shaded "${w.label}" from ${s1(w.fromS)} to ${s1(w.toS)} s.`);
  return parts.join(" ");
}
