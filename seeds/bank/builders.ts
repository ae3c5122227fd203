/** Small builders that keep the demo items readable: one call per item, content checked later. */
import type { ItemContent } from "../../app/domain/bank/item-content";

type Topic = ItemContent["topics"][number];
export type DemoItem = { key: string; content: ItemContent };

export function single(key: string, topics: Topic[], stem: string, options: string[], correct: number, rationale: string, reference: string): DemoItem {
  return { key, content: { type: "single", stem, topics, body: { kind: "single", options, correct }, scenario: null, rationale, reference } };
}

export function multiple(key: string, topics: Topic[], stem: string, options: string[], correct: number[], rationale: string, reference: string): DemoItem {
  return { key, content: { type: "multiple", stem, topics, body: { kind: "multiple", options, correct }, scenario: null, rationale, reference } };
}

export function numeric(
  key: string,
  topics: Topic[],
  stem: string,
  answer: { value: number; unit: string; tolerance: number; decimals: number },
  rationale: string,
  reference: string,
): DemoItem {
  return {
    key,
    content: { type: "numeric", stem, topics, body: { kind: "numeric", answer: answer.value, unit: answer.unit, tolerance: answer.tolerance, decimals: answer.decimals }, scenario: null, rationale, reference },
  };
}

export function ordering(key: string, topics: Topic[], stem: string, steps: string[], rationale: string, reference: string): DemoItem {
  return { key, content: { type: "ordering", stem, topics, body: { kind: "ordering", steps }, scenario: null, rationale, reference } };
}
