import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseNumericAnswer } from "./index";

// What a therapist may type, and what the exam page must make of it. The decimal marker "shall be
// either the point on the line or the comma on the line", and digit groups are separated by a
// space — "neither dots nor commas are inserted" (BIPM, The International System of Units, 9th
// ed., 2019, §5.4.4; CGPM 2003 Resolution 10) — because a point or comma means the thousands in
// some countries and the decimals in others: hence "1,234.5" is refused, never guessed.
describe("parseNumericAnswer: accepted", () => {
  it.each([
    ["12.5", "mL", 12.5],
    ["12,5", "mL", 12.5],
    ["  12.5  ", "mL", 12.5],
    ["+12.5", "mL", 12.5],
    ["-3", "cmH2O", -3],
    ["\u22123", "cmH2O", -3], // the Unicode minus sign
    ["- 3", "cmH2O", -3],
    ["0", "mL", 0],
    ["-0", "mL", 0],
    [".5", "s", 0.5],
    [",5", "s", 0.5],
    ["12.", "s", 12],
    ["0,125", "s", 0.125], // a lone 0 before a comma is never thousands
    ["1234,567", "mL", 1234.567], // four digits before the comma: not a thousands group
    ["1.234", "s", 1.234], // a single point is always the decimal point (English interface)
    ["1234", "mL", 1234],
    ["12.5 mL", "mL", 12.5],
    ["12,5ml", "mL", 12.5],
    ["12.5ML", "mL", 12.5],
    ["8 cmH2O", "cmH2O", 8],
    ["8 cm H2O", "cmH2O", 8],
    ["8cm h2o", "cmH2O", 8],
    ["8 cmH₂O", "cmH2O", 8], // subscript two, as pasted from a document
    ["60 L/min", "L/min", 60],
    ["60 l / min", "L/min", 60],
    ["7.5 mL/kg", "mL/kg", 7.5],
    ["13.5 cmH2O/(L/s)", "cmH2O/(L/s)", 13.5],
    ["18 breaths/min", "breaths/min", 18],
    ["25 %", "%", 25],
    ["25%", "%", 25],
    ["40 %", "% of the starting compliance", 40],
    ["40 % of the starting compliance", "% of the starting compliance", 40],
  ] as const)("%j (unit %s) → %d", (text, unit, value) => {
    expect(parseNumericAnswer(text, unit)).toEqual({ ok: true, value });
  });
});

describe("parseNumericAnswer: refused with a specific message", () => {
  it.each([
    ["", "mL", "Enter a number."],
    ["   ", "mL", "Enter a number."],
    ["mL", "mL", "Enter a number before the unit, such as 12.5 mL."],
    ["1,234.5", "mL", "“1,234.5” has a thousands separator, which is ambiguous (a comma or a point means the thousands in some countries and the decimals in others). Write the number without it, such as 1234.5."],
    ["1.234,5", "mL", "“1.234,5” has a thousands separator, which is ambiguous (a comma or a point means the thousands in some countries and the decimals in others). Write the number without it, such as 1234.5."],
    ["1,234,567", "mL", "“1,234,567” has a thousands separator, which is ambiguous (a comma or a point means the thousands in some countries and the decimals in others). Write the number without it, such as 1234567."],
    ["1,234", "mL", "“1,234” is ambiguous: it could mean 1234 (comma as a thousands separator) or 1.234 (decimal comma). Write 1234 or 1.234."],
    ["12,500 mL", "mL", "“12,500” is ambiguous: it could mean 12500 (comma as a thousands separator) or 12.500 (decimal comma). Write 12500 or 12.500."],
    ["1.2.3", "mL", "“1.2.3” is not a number: use one decimal point or comma at most."],
    ["12 13", "mL", "“12 13” has more than one number. Enter one number only."],
    ["12, 13", "mL", "“12, 13” has more than one number. Enter one number only."],
    ["12-13", "mL", "“12-13” has more than one number. Enter one number only."],
    ["12 to 13", "mL", "“12 to 13” has more than one number. Enter one number only."],
    ["1/2", "mL", "“1/2” has more than one number. Enter one number only."],
    ["12 mL 13", "mL", "“12 mL 13” has more than one number. Enter one number only."],
    ["12.5 mL", "mL/kg", "The answer is in mL/kg, not mL."],
    ["7 ml/kg", "mL", "The answer is in mL, not ml/kg."],
    ["8 mmHg", "cmH2O", "The answer is in cmH2O, not mmHg."],
    ["60 L/s", "L/min", "The answer is in L/min, not L/s."],
    ["abc", "mL", "“abc” is not a number. Enter a number in mL, such as 12.5."],
    ["twelve", "mL", "“twelve” is not a number. Enter a number in mL, such as 12.5."],
    ["12abc", "mL", "“12abc” has letters or symbols that are not part of a number or of its unit (mL). Enter a number, such as 12.5."],
    ["12a5", "mL", "“12a5” has letters or symbols that are not part of a number or of its unit (mL). Enter a number, such as 12.5."],
    ["1.2e4", "mL", "Write the number in full, without an exponent (12000, not 1.2e4)."],
    ["Infinity", "mL", "Enter a finite number in mL; infinity is not an answer."],
    ["-Infinity", "mL", "Enter a finite number in mL; infinity is not an answer."],
    ["∞", "mL", "Enter a finite number in mL; infinity is not an answer."],
    ["NaN", "mL", "“NaN” is not a number. Enter a number in mL, such as 12.5."],
    ["+-12", "mL", "“+-12” is not a number. Enter a number in mL, such as 12.5."],
    ["9".repeat(400), "mL", "That number is too large to be an answer."],
  ] as const)("%j (unit %s)", (text, unit, message) => {
    expect(parseNumericAnswer(text, unit)).toEqual({ ok: false, message });
  });
});

describe("parseNumericAnswer: properties", () => {
  // Numbers as the exam asks for them: up to 3 decimals (item-content.ts numericBody.decimals).
  const answer = fc.record({ whole: fc.integer({ min: -100000, max: 100000 }), decimals: fc.integer({ min: 0, max: 3 }) }).map(({ whole, decimals }) => (whole / 10 ** decimals).toFixed(decimals));
  const unit = fc.constantFrom("mL", "cmH2O", "L/min", "mL/cmH2O", "s", "breaths/min", "%", "cmH2O/(L/s)");

  it("a number written with a point reads back as the same number, with or without its unit in any case and spacing", () => {
    fc.assert(
      fc.property(answer, unit, fc.constantFrom("", " ", "  "), fc.boolean(), (text, u, gap, upper) => {
        const expected = Number(text) === 0 ? 0 : Number(text);
        expect(parseNumericAnswer(text, u)).toEqual({ ok: true, value: expected });
        const withUnit = `${text}${gap}${upper ? u.toUpperCase() : u.toLowerCase()}`;
        expect(parseNumericAnswer(withUnit, u)).toEqual({ ok: true, value: expected });
      }),
    );
  });

  it("the same number with a decimal comma reads the same, unless it could be a thousands group (then it is refused, never misread)", () => {
    fc.assert(
      fc.property(answer, unit, (text, u) => {
        const comma = text.replace(".", ",");
        const result = parseNumericAnswer(comma, u);
        const ambiguous = /^-?[1-9]\d{0,2},\d{3}$/.test(comma);
        if (ambiguous) expect(result.ok).toBe(false);
        else expect(result).toEqual({ ok: true, value: Number(text) === 0 ? 0 : Number(text) });
      }),
    );
  });

  it("never throws and never returns a value that is not finite, whatever is typed", () => {
    fc.assert(
      fc.property(fc.string(), unit, (text, u) => {
        const result = parseNumericAnswer(text, u);
        if (result.ok) expect(Number.isFinite(result.value)).toBe(true);
        else expect(result.message.length).toBeGreaterThan(10);
      }),
      { numRuns: 1000 },
    );
  });
});
