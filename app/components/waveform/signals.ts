/**
 * The three signals of the waveform plot, each with its own calm colour on the paper. Colour is
 * never the only cue: every panel carries its title and unit. Each colour has a contrast of at
 * least 3:1 against the paper #FAF6EF (WCAG 2.1 success criterion 1.4.11, non-text contrast);
 * signals.test.ts computes the ratios.
 */
import type { Domain } from "./scale";

export type SignalKey = "pressureCmH2O" | "flowLpm" | "volumeMl";

export interface SignalSpec {
  key: SignalKey;
  title: string;
  unit: string;
  colour: string;
  /** The smallest range the panel shows, so a quiet trace does not fill it. Adult teaching values
   *  (common practice, no source). */
  atLeast: Domain;
  /** Flow is drawn about a zero line: inspiration up, expiration down. */
  symmetric: boolean;
}

export const PAPER = "#FAF6EF";

export const SIGNALS: readonly SignalSpec[] = [
  { key: "pressureCmH2O", title: "Pressure", unit: "cmH2O", colour: "#0F5C57", atLeast: [0, 30], symmetric: false },
  { key: "flowLpm", title: "Flow", unit: "L/min", colour: "#2A5599", atLeast: [-60, 60], symmetric: true },
  { key: "volumeMl", title: "Volume", unit: "mL", colour: "#7A3466", atLeast: [0, 600], symmetric: false },
];

/** Marker lines and shaded windows: ink and a warm wash that differ from all three signals. */
export const MARKER_COLOUR = "#17302E";
export const WINDOW_FILL = "#E9DFC9";
export const GRID_COLOUR = "#E3DCCF";
export const AXIS_COLOUR = "#5B6B68";
