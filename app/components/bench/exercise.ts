import type { ScenarioInput } from "~/domain/bench/schema";
import type { Mode } from "~/domain/bench/types";

/** A guided exercise of the Bench page (content in app/routes/bench/exercises.ts). */
export interface Exercise {
  id: string;
  title: string;
  mode: Mode;
  /** One line for the list of exercises. */
  summary: string;
  /** What to do and what to watch, in order. */
  steps: string[];
  question: string;
  answer: string;
  rationale: string;
  scenario: ScenarioInput;
}
