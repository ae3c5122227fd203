/**
 * Shared pieces of the scenario templates: their contract, drawing parameters on a step grid,
 * and rounding readings the way an item shows them. Kept apart from generator.ts so template
 * modules and the registry do not import each other.
 */
import type { Random } from "../prng";
import type { SimulationResult } from "../simulate";
import type { AlarmKind, Scenario } from "../types";

export interface ParameterRange {
  min: number;
  max: number;
  step: number;
  unit: string;
}

export type Question =
  | { kind: "numeric"; prompt: string; unit: string; tolerance: number }
  | { kind: "single-best-answer"; prompt: string; options: { id: string; text: string }[] };

export interface TemplateOutput {
  scenario: Scenario;
  result: SimulationResult;
  visibleThroughBreath: number;
  shown: Record<string, number>;
  question: Question;
  answer: number | string;
  rationale: string;
}

export interface ScenarioTemplate {
  id: string;
  title: string;
  /** PRODUCT.md topic words. */
  topics: string[];
  parameterRanges: Record<string, ParameterRange>;
  build(random: Random, seed: number): TemplateOutput;
}

/** A value from a range on its step grid: min, min+step, … ≤ max. */
export function drawFrom(random: Random, range: ParameterRange): number {
  const steps = Math.round((range.max - range.min) / range.step);
  // Round away binary noise (0.1 steps) so parameters read as typed.
  return Number((range.min + range.step * random.int(0, steps)).toFixed(6));
}

/** Rounds a reading the way the item displays it. */
export function shownValue(x: number, places: number): number {
  return Number(x.toFixed(places));
}

export const ALARM_LABELS: Record<AlarmKind, string> = {
  "high-pressure": "High pressure",
  "low-pressure": "Low pressure",
  "low-exhaled-volume": "Low exhaled tidal volume",
  "volume-not-reached": "Volume target not reached",
};

