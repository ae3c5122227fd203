/**
 * How a checklist is assessed (PRODUCT.md, "Checklist"). The same list as the schema's
 * CHECKLIST_METHODS (a unit test keeps them equal), kept here so browser code need not load the
 * database schema.
 */
export const METHODS = [
  "direct-observation",
  "return-demonstration",
  "simulation",
  "case-study",
  "written-or-online-test",
  "peer-review",
  "verbal-review",
  "evidence-of-daily-work",
] as const;
export type Method = (typeof METHODS)[number];

export const METHOD_LABELS: Record<Method, string> = {
  "direct-observation": "Direct observation",
  "return-demonstration": "Return demonstration",
  simulation: "Simulation",
  "case-study": "Case study",
  "written-or-online-test": "Written or online test",
  "peer-review": "Peer review",
  "verbal-review": "Verbal review",
  "evidence-of-daily-work": "Evidence of daily work",
};

export function methodLabel(value: string): string {
  return (METHOD_LABELS as Record<string, string>)[value] ?? value;
}
