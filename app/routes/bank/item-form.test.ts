import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { formValuesOf, itemFormSchema } from "./item-form";
import { DEMO_BANK } from "../../../seeds/bank";

function formData(values: ReturnType<typeof formValuesOf>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) {
    if (typeof v === "string" || Array.isArray(v)) for (const one of Array.isArray(v) ? v : [v]) fd.append(k, one);
    else for (const [name, r] of Object.entries(v)) fd.append(`${k}.${name}.min`, r.min), fd.append(`${k}.${name}.max`, r.max);
  }
  return fd;
}

describe("the item form", () => {
  it("reports every problem at once, each on its own field", () => {
    const result = parseWithZod(formData({ kind: "single", stem: "", options: "only one", correct: "3", rationale: "", reference: "" }), { schema: itemFormSchema });
    expect(result.status).toBe("error");
    const errors = (result.status === "error" ? result.error : null) ?? {};
    expect(errors.stem).toEqual(["Enter the stem."]);
    expect(errors.topics).toEqual(["Choose at least one topic."]);
    expect(errors.options).toEqual(["Give at least two options."]);
    expect(errors.rationale).toEqual(["Enter the rationale."]);
    expect(errors.reference).toEqual(["Enter the reference."]);
  });

  it("turns one-based option numbers into the stored zero-based key", () => {
    const result = parseWithZod(
      formData({ kind: "multiple", stem: "Which?", topics: ["modes", "lung-mechanics"], options: "a\nb\nc", correct: "3, 1", rationale: "Because.", reference: "Chatburn 2014." }),
      { schema: itemFormSchema },
    );
    expect(result.status).toBe("success");
    if (result.status === "success") expect(result.value.body).toEqual({ kind: "multiple", options: ["a", "b", "c"], correct: [0, 2] });
  });

  it("keeps only the ranges an educator narrowed, and refuses a range outside the template's", () => {
    const fields = { kind: "scenario", stem: "{prompt}", topics: ["lung-mechanics"], rationale: "Because.", reference: "Chatburn 2014.", templateId: "vc-static-compliance", previewSeeds: "1, 2" };
    const ok = parseWithZod(formData({ ...fields, range: { tidalVolumeMl: { min: "450", max: "550" }, peepCmH2O: { min: "5", max: "12" } } }), { schema: itemFormSchema });
    expect(ok.status).toBe("success");
    if (ok.status === "success") expect(ok.value.scenario).toEqual({ templateId: "vc-static-compliance", previewSeeds: [1, 2], ranges: { tidalVolumeMl: { min: 450, max: 550 } } });
    const bad = parseWithZod(formData({ ...fields, range: { tidalVolumeMl: { min: "300", max: "550" } } }), { schema: itemFormSchema });
    expect(bad.status).toBe("error");
    expect(bad.status === "error" && bad.error?.["range.tidalVolumeMl"]).toEqual(["Stay within 350–600 mL."]);
  });

  it.each(DEMO_BANK.map((d) => [d.key, d] as const))("%s: the form shows the item and saves it back unchanged", (_k, d) => {
    const result = parseWithZod(formData(formValuesOf(d.content)), { schema: itemFormSchema });
    expect(result.status).toBe("success");
    if (result.status === "success") expect({ ...result.value, topics: [...result.value.topics].sort() }).toEqual({ ...d.content, topics: [...d.content.topics].sort() });
  });
});
