import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { assignFormSchema, examFormSchema, examFormValues, NEW_EXAM_DEFAULTS, type ExamSettings } from "./exam-form";

/** The form as the browser sends it: nested values as dotted names, unchecked boxes absent. */
function formData(values: Record<string, unknown>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) {
    if (v === undefined) continue;
    if (typeof v === "string") fd.append(k, v);
    else if (Array.isArray(v)) for (const one of v) fd.append(k, String(one));
    else for (const [name, inner] of Object.entries(v as Record<string, string>)) fd.append(`${k}.${name}`, inner);
  }
  return fd;
}
const parse = (values: Record<string, unknown>, check = {}) => parseWithZod(formData(values), { schema: examFormSchema(check) });
const errorsOf = (r: ReturnType<typeof parse>) => (r.status === "error" ? r.error : null) ?? {};
const base = { ...NEW_EXAM_DEFAULTS, title: "Modes check", topics: { modes: "3", "cycle-variables": "0", "lung-mechanics": "" } };

describe("the exam form", () => {
  it("keeps topics with items, leaves out blank and zero ones, and reads the defaults", () => {
    const r = parse(base);
    expect(r.status).toBe("success");
    if (r.status !== "success") return;
    expect(r.value).toEqual({
      title: "Modes check",
      description: null,
      blueprint: { topics: { modes: 3 } },
      timeLimitMinutes: 30,
      passMarkPercent: 80,
      attemptsAllowed: 2,
      shuffleItems: true,
      shuffleOptions: true,
      reviewPolicy: "score-and-topics",
      multipleResponseScoring: "all-or-nothing",
      orderingScoring: "exact",
      availableFrom: null,
      availableUntil: null,
    } satisfies ExamSettings);
  });

  it("a blank time limit is untimed; unchecked boxes mean no shuffling", () => {
    const r = parse({ ...base, timeLimitMinutes: "", shuffleItems: undefined, shuffleOptions: undefined });
    expect(r.status === "success" && [r.value.timeLimitMinutes, r.value.shuffleItems, r.value.shuffleOptions]).toEqual([null, false, false]);
  });

  it("a difficulty mix: all blank is none; a blank band counts as 0; it must add up to 100", () => {
    expect(parse({ ...base, difficulty: { easy: "", medium: "", hard: "" } }).status === "success").toBe(true);
    const partial = parse({ ...base, difficulty: { easy: "40", medium: "60", hard: "" } });
    expect(partial.status === "success" && partial.value.blueprint.difficulty).toEqual({ easy: 40, medium: 60, hard: 0 });
    expect(errorsOf(parse({ ...base, difficulty: { easy: "40", medium: "40", hard: "" } })).difficulty).toEqual([
      "The difficulty mix must add up to 100 % (it adds up to 80 %). Leave all three blank for no mix.",
    ]);
    expect(errorsOf(parse({ ...base, difficulty: { easy: "abc", medium: "100", hard: "" } }))["difficulty.easy"]).toEqual(["Enter a whole percent from 0 to 100."]);
  });

  it.each([
    ["passMarkPercent", "0", "The pass mark must be from 1 to 100 %."],
    ["passMarkPercent", "100.5", "The pass mark must be from 1 to 100 %."],
    ["passMarkPercent", "", "Enter the pass mark, from 1 to 100 %."],
    ["attemptsAllowed", "0", "Attempts allowed must be a whole number from 1 to 10."],
    ["attemptsAllowed", "2.5", "Attempts allowed must be a whole number from 1 to 10."],
    ["timeLimitMinutes", "481", "Enter whole minutes from 1 to 480, or leave it blank for an untimed exam."],
    ["availableFrom", "2027-02-30", "Enter a date like 2027-01-31."],
    ["reviewPolicy", "everything", "Choose what the therapist sees after submitting."],
  ])("%s = %j → %s", (field, value, message) => {
    expect(errorsOf(parse({ ...base, [field]: value }))[field]).toEqual([message]);
  });

  it("the window may open and close the same day, not close before it opens", () => {
    expect(parse({ ...base, availableFrom: "2027-01-10", availableUntil: "2027-01-10" }).status).toBe("success");
    expect(errorsOf(parse({ ...base, availableFrom: "2027-01-10", availableUntil: "2027-01-09" })).availableUntil).toEqual(["The window must close on or after the day it opens."]);
  });

  it("topic counts: whole numbers up to 100, a known topic, at least one item in all", () => {
    expect(errorsOf(parse({ ...base, topics: { modes: "2.5" } }))["topics.modes"]).toEqual(["Enter a whole number of items from 0 to 100."]);
    expect(errorsOf(parse({ ...base, topics: { astrology: "2" } }))["topics.astrology"]).toEqual(["Unknown topic."]);
    expect(errorsOf(parse({ ...base, topics: { modes: "0" } })).topics).toEqual(["Give at least one topic at least one item."]);
  });

  it("fixed items: duplicates collapse; on the server, only published items of the bank", () => {
    const ok = parse({ ...base, fixed: ["item-a", "item-a"] }, { publishedItemIds: new Set(["item-a"]) });
    expect(ok.status === "success" && ok.value.blueprint.fixed).toEqual(["item-a"]);
    expect(errorsOf(parse({ ...base, fixed: ["item-a", "item-b"] }, { publishedItemIds: new Set(["item-a"]) })).fixed).toEqual([
      "One fixed item is not a published item of your bank. Choose from the list.",
    ]);
  });

  it("a saved version's values go round the form unchanged", () => {
    const settings: ExamSettings = {
      title: "Round trip",
      description: "Described.",
      blueprint: { topics: { modes: 4, "alarm-reasoning": 2 }, difficulty: { easy: 20, medium: 50, hard: 30 }, fixed: ["item-x"] },
      timeLimitMinutes: null,
      passMarkPercent: 72.5,
      attemptsAllowed: 3,
      shuffleItems: false,
      shuffleOptions: true,
      reviewPolicy: "full-rationale",
      multipleResponseScoring: "partial",
      orderingScoring: "partial",
      availableFrom: "2027-01-01",
      availableUntil: "2027-03-31",
    };
    const r = parse(examFormValues(settings), { publishedItemIds: new Set(["item-x"]) });
    expect(r.status === "success" && r.value).toEqual(settings);
  });
});

describe("the assign form", () => {
  const today = "2026-12-02";
  const parseAssign = (values: Record<string, unknown>) => parseWithZod(formData({ intent: "assign", ...values }), { schema: assignFormSchema(today) });
  it("reads each kind of target", () => {
    const people = parseAssign({ to: "people", personIds: ["p1", "p2", "p1"], dueOn: today });
    expect(people.status === "success" && people.value).toEqual({ target: { kind: "people", personIds: ["p1", "p2"] }, dueOn: today });
    const unit = parseAssign({ to: "unit", unitId: "u1", dueOn: "2027-01-01" });
    expect(unit.status === "success" && unit.value.target).toEqual({ kind: "unit", unitId: "u1" });
    const role = parseAssign({ to: "role", role: "therapist", dueOn: "2027-01-01" });
    expect(role.status === "success" && role.value.target).toEqual({ kind: "role", role: "therapist" });
  });

  it("asks for what the chosen target needs, a real date, and not before today", () => {
    const e = (v: Record<string, unknown>) => (((r) => (r.status === "error" ? r.error : null))(parseAssign(v)) ?? {}) as Record<string, string[]>;
    expect(e({ to: "people", dueOn: today }).personIds).toEqual(["Choose at least one person."]);
    expect(e({ to: "role", role: "admin", dueOn: today }).role).toEqual(["Choose a role."]);
    expect(e({ to: "unit", unitId: "u1", dueOn: "2026-12-01" }).dueOn).toEqual(["The due date must be today (2026-12-02) or later."]);
    expect(e({ to: "unit", unitId: "u1", dueOn: "2027-02-29" }).dueOn).toEqual(["Enter the due date, like 2027-01-31."]);
    expect(e({ to: "everyone", dueOn: today }).to).toEqual(["Choose whom to assign: people, a unit or a role."]);
  });
});
