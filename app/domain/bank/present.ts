/**
 * What a therapist sees of one item version, and how an answer is graded. The same (content,
 * seed) always gives the same presentation — options and steps are shuffled with the bench's
 * seeded generator, scenario numbers are drawn by the bench — so an attempt that stores its
 * seed is graded and replayed exactly (PRODUCT.md "Scenario item").
 */
import { createRandom, generateScenarioItem, simulate, type BreathReading, type GeneratedItem, type ScenarioInput, type TemplateId, type Waveform } from "~/domain/bench";
import type { ItemContent } from "./item-content";
import { drawScenario } from "./scenario-ranges";

export type Presented =
  | { kind: "single"; stem: string; options: { id: number; text: string }[] }
  | { kind: "multiple"; stem: string; options: { id: number; text: string }[] }
  | { kind: "numeric"; stem: string; unit: string; decimals: number }
  | { kind: "ordering"; stem: string; steps: { id: number; text: string }[] }
  | { kind: "waveform-point"; stem: string; waveform: Waveform; breaths: BreathReading[]; viewFromS: number; viewToS: number };

export type Key =
  | { kind: "single"; correct: number; text: string }
  | { kind: "multiple"; correct: number[]; text: string }
  | { kind: "numeric"; answer: number; tolerance: number; unit: string; text: string }
  | { kind: "ordering"; order: number[]; text: string }
  | { kind: "waveform-point"; fromS: number; toS: number; text: string };

export type Response =
  | { kind: "single"; choice: number }
  | { kind: "multiple"; choices: number[] }
  | { kind: "numeric"; value: number }
  | { kind: "ordering"; order: number[] }
  | { kind: "waveform-point"; timeS: number };

/** Placeholders look like {name}; {prompt} is the template's own question text. */
const PLACEHOLDER = /\{([A-Za-z][A-Za-z0-9]*)\}/g;

export function placeholdersIn(stem: string): string[] {
  return [...stem.matchAll(PLACEHOLDER)].map((m) => m[1]);
}

/** The names a template's stem may use: the template's shown numbers, plus {prompt}. */
export function placeholderNames(generated: GeneratedItem): string[] {
  return ["prompt", ...Object.keys(generated.shown)];
}

/** Fills a scenario stem's placeholders with one seed's drawn values; unknown names stay visible. */
export function fillStem(stem: string, generated: GeneratedItem): string {
  return stem.replace(PLACEHOLDER, (whole, name: string) => {
    if (name === "prompt") return generated.question.prompt;
    const value = generated.shown[name];
    return value === undefined ? whole : String(value);
  });
}

function shuffledIds(n: number, seed: number): number[] {
  const random = createRandom(seed);
  const ids = Array.from({ length: n }, (_, i) => i);
  // Fisher–Yates (Knuth, The Art of Computer Programming vol. 2, Algorithm P).
  for (let i = n - 1; i > 0; i--) {
    const j = random.int(0, i);
    [ids[i], ids[j]] = [ids[j], ids[i]];
  }
  // An ordering item shown already in order would give the answer away.
  if (n > 1 && ids.every((v, i) => v === i)) ids.push(ids.shift()!);
  return ids;
}

function sliceWaveform(w: Waveform, toS: number): Waveform {
  let n = 0;
  while (n < w.timeS.length && w.timeS[n] <= toS + 1e-9) n++;
  return { timeS: w.timeS.slice(0, n), pressureCmH2O: w.pressureCmH2O.slice(0, n), flowLpm: w.flowLpm.slice(0, n), volumeMl: w.volumeMl.slice(0, n) };
}

/** The question as shown, and its key, for one seed. */
export function presentItem(content: ItemContent, seed: number): { presented: Presented; key: Key; generated: GeneratedItem | null } {
  const b = content.body;
  if (b.kind === "scenario") {
    const generated = drawScenario(content.scenario!.templateId, seed, content.scenario!.ranges);
    const stem = fillStem(content.stem, generated);
    const q = generated.question;
    if (q.kind === "numeric") {
      const answer = generated.answer as number;
      // The precision asked for follows the template's tolerance, never the drawn answer (which
      // would tell a therapist whether this seed's answer happens to be a whole number).
      const decimals = q.tolerance > 0 && q.tolerance < 1 ? Math.min(3, (String(q.tolerance).split(".")[1] ?? "").length) : 0;
      return {
        presented: { kind: "numeric", stem, unit: q.unit, decimals },
        key: { kind: "numeric", answer, tolerance: q.tolerance, unit: q.unit, text: `${answer} ${q.unit} (± ${q.tolerance})` },
        generated,
      };
    }
    const options = q.options.map((o, i) => ({ id: i, text: o.text }));
    const correct = q.options.findIndex((o) => o.id === generated.answer);
    return { presented: { kind: "single", stem, options }, key: { kind: "single", correct, text: q.options[correct].text }, generated };
  }
  switch (b.kind) {
    case "single": {
      const order = shuffledIds(b.options.length, seed);
      return {
        presented: { kind: "single", stem: content.stem, options: order.map((i) => ({ id: i, text: b.options[i] })) },
        key: { kind: "single", correct: b.correct, text: b.options[b.correct] },
        generated: null,
      };
    }
    case "multiple": {
      const order = shuffledIds(b.options.length, seed);
      return {
        presented: { kind: "multiple", stem: content.stem, options: order.map((i) => ({ id: i, text: b.options[i] })) },
        key: { kind: "multiple", correct: b.correct, text: b.correct.map((i) => b.options[i]).join("; ") },
        generated: null,
      };
    }
    case "numeric":
      return {
        presented: { kind: "numeric", stem: content.stem, unit: b.unit, decimals: b.decimals },
        key: { kind: "numeric", answer: b.answer, tolerance: b.tolerance, unit: b.unit, text: `${b.answer.toFixed(b.decimals)} ${b.unit} (± ${b.tolerance})` },
        generated: null,
      };
    case "ordering": {
      const order = shuffledIds(b.steps.length, seed);
      return {
        presented: { kind: "ordering", stem: content.stem, steps: order.map((i) => ({ id: i, text: b.steps[i] })) },
        key: { kind: "ordering", order: b.steps.map((_, i) => i), text: b.steps.map((s, i) => `${i + 1}. ${s}`).join(" ") },
        generated: null,
      };
    }
    case "waveform-point": {
      const run = simulate(b.bench as ScenarioInput);
      return {
        presented: {
          kind: "waveform-point",
          stem: content.stem,
          waveform: sliceWaveform(run.waveform, b.viewToS),
          breaths: run.breaths.filter((r) => r.startS + r.durationS <= b.viewToS + 1e-9),
          viewFromS: b.viewFromS,
          viewToS: b.viewToS,
        },
        key: { kind: "waveform-point", fromS: b.window.fromS, toS: b.window.toS, text: `between ${b.window.fromS} s and ${b.window.toS} s` },
        generated: null,
      };
    }
  }
}

/** Right or wrong, all or nothing (partial credit is an exam policy, not an item's). */
export function gradeResponse(key: Key, response: Response): boolean {
  switch (key.kind) {
    case "single":
      return response.kind === "single" && response.choice === key.correct;
    case "multiple":
      return response.kind === "multiple" && [...response.choices].sort((a, b) => a - b).join(",") === key.correct.join(",");
    case "numeric":
      // A hair of slack so 0.1 + 0.2 style binary noise never fails an exact-tolerance answer.
      return response.kind === "numeric" && Number.isFinite(response.value) && Math.abs(response.value - key.answer) <= key.tolerance + 1e-9;
    case "ordering":
      return response.kind === "ordering" && response.order.join(",") === key.order.join(",");
    case "waveform-point":
      return response.kind === "waveform-point" && response.timeS >= key.fromS && response.timeS <= key.toS;
  }
}

const typeCache = new Map<string, "numeric" | "single">();
/** A scenario item's type: its template's question kind (numeric or single best answer). */
export function scenarioItemType(templateId: TemplateId): "numeric" | "single" {
  let t = typeCache.get(templateId);
  if (!t) {
    t = generateScenarioItem(templateId, 1).question.kind === "numeric" ? "numeric" : "single";
    typeCache.set(templateId, t);
  }
  return t;
}
