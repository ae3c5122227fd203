/**
 * What a therapist typed into a numeric item, read as a number — or a message that says exactly
 * what to change. Pure; the exam page shows the message beside the field and never guesses.
 *
 * Accepted: "12.5", "12,5" (decimal comma), ".5", leading and trailing spaces, a leading + or −
 * (also the Unicode minus sign), and the item's own unit after the number, with or without a
 * space, in any letter case and with spaces inside it ignored ("12,5ml", "8 cm H2O" for cmH2O,
 * "6 l/min"). A unit like "% of the starting compliance" may be given as its first word ("%").
 *
 * Refused, each with its own message: nothing typed; a thousands separator ("1,234.5",
 * "1.234,5", "1,234" — read differently in different countries, so ambiguous: the SI puts
 * neither dots nor commas between digit groups, BIPM SI Brochure 9th ed. 2019 §5.4.4); two numbers;
 * another unit than the item's; letters; an exponent; infinity and NaN.
 *
 * One decision without a source (common practice, no source): a single dot is always the
 * decimal point ("1.234" is one point two three four — the app is written in English), while a
 * single comma is a decimal comma unless it could be a thousands separator (1–3 digits, not a
 * lone 0, then exactly three digits: "1,234" is refused as ambiguous, "0,125" and "12,5" are read).
 */

export type NumericAnswer = { ok: true; value: number } | { ok: false; message: string };

/** Units a therapist might type by mistake; only used to word the message "in mL/kg, not mL". */
const KNOWN_UNITS = [
  "mL", "L", "dL", "mL/kg", "L/kg", "mL/min", "L/min", "L/s", "mL/s", "Lpm", "lpm",
  "cmH2O", "cm H2O", "mmHg", "kPa", "hPa", "mbar", "Pa", "torr",
  "mL/cmH2O", "L/cmH2O", "cmH2O/mL", "cmH2O/L", "cmH2O/(L/s)", "cmH2O/L/s", "cmH2O·s/L",
  "s", "sec", "ms", "min", "h", "breaths/min", "bpm", "/min",
  "%", "kg", "g", "mg", "cm", "mm", "m", "in", "Hz", "J", "J/L", "J/min", "mEq/L", "mmol/L",
];

/** Case, spaces and Unicode look-alikes (H₂O, µ) do not matter when comparing units. */
export function normaliseUnit(unit: string): string {
  return unit.normalize("NFKC").replace(/\s+/g, "").toLowerCase();
}

function unitForms(unit: string): string[] {
  const forms = [normaliseUnit(unit)];
  // "% of the starting compliance": the symbol before the description is enough.
  const short = /^(\S+)\s+of\s+/i.exec(unit.trim());
  if (short) forms.push(normaliseUnit(short[1]));
  return forms;
}

const fail = (message: string): NumericAnswer => ({ ok: false, message });
const quoted = (s: string) => `“${s}”`;

/** The separators inside a run of digits, dots and commas ("1,234.5" → [",", "."]). */
const separatorsIn = (digits: string) => digits.replace(/\d/g, "").split("");

export function parseNumericAnswer(text: string, unit: string): NumericAnswer {
  const typed = text.normalize("NFKC").trim();
  if (typed === "") return fail("Enter a number.");
  const t = typed.replace(/^\u2212/, "-");
  const inUnit = unit.trim() ? ` in ${unit.trim()}` : "";

  if (/^[+-]?\s*(infinity|inf|∞)$/i.test(t)) return fail(`Enter a finite number${inUnit}; infinity is not an answer.`);
  if (/^[+-]?\s*nan$/i.test(t)) return fail(`${quoted(typed)} is not a number. Enter a number${inUnit}, such as 12.5.`);

  const m = /^([+-]?)\s*(\d[\d.,]*|[.,]\d[\d.,]*)(.*)$/s.exec(t);
  if (!m) {
    if (unitForms(unit).includes(normaliseUnit(t))) return fail(`Enter a number before the unit, such as 12.5 ${unit.trim()}.`);
    return fail(`${quoted(typed)} is not a number. Enter a number${inUnit}, such as 12.5.`);
  }
  const [, sign, digitsRaw, rest] = m;

  // "12, 13" and "12. 13": a separator at the end followed by more text belongs to what follows.
  let digits = digitsRaw;
  let tail = rest;
  if (/[.,]$/.test(digits) && /^\s/.test(tail)) {
    tail = digits.slice(-1) + tail;
    digits = digits.slice(0, -1);
  }

  const seps = separatorsIn(digits);
  if (seps.length > 1) {
    const groupsOfThree = /^\d{1,3}([.,]\d{3})+([.,]\d*)?$/.test(digits);
    if (new Set(seps).size > 1 || groupsOfThree) {
      const plain = digits.replace(/[.,](?=.*[.,])/g, "").replace(",", ".");
      return fail(
        `${quoted(digits)} has a thousands separator, which is ambiguous (a comma or a point means the thousands in some countries and the decimals in others). ` +
          `Write the number without it${groupsOfThree && new Set(seps).size === 1 ? `, such as ${digits.replace(/[.,]/g, "")}` : `, such as ${plain}`}.`,
      );
    }
    return fail(`${quoted(digits)} is not a number: use one decimal point or comma at most.`);
  }
  if (seps[0] === "," && /^[1-9]\d{0,2},\d{3}$/.test(digits)) {
    const [whole, part] = digits.split(",");
    return fail(`${quoted(digits)} is ambiguous: it could mean ${whole}${part} (comma as a thousands separator) or ${whole}.${part} (decimal comma). Write ${whole}${part} or ${whole}.${part}.`);
  }

  const rawTail = tail;
  tail = tail.trim();
  if (tail !== "") {
    if (/^[eE][+-]?\d/.test(rawTail)) return fail(`Write the number in full, without an exponent (12000, not 1.2e4).`);
    if (!unitForms(unit).includes(normaliseUnit(tail))) {
      // A second number: after a space, a separator or a word like "to", or a fraction "1/2".
      if (/^([-+–—~/;:&,.x×*]|to\b|and\b|or\b)?\s*[+-]?[.,]?\d/i.test(tail) || /(^|[\s,;:/–—~(])[+-]?[.,]?\d/.test(tail)) {
        return fail(`${quoted(typed)} has more than one number. Enter one number only.`);
      }
      const known = KNOWN_UNITS.find((u) => normaliseUnit(u) === normaliseUnit(tail));
      if (known) return unit.trim() ? fail(`The answer is in ${unit.trim()}, not ${tail}.`) : fail(`This answer has no unit: enter the number alone.`);
      return fail(
        `${quoted(typed)} has letters or symbols that are not part of a number${unit.trim() ? ` or of its unit (${unit.trim()})` : ""}. Enter a number, such as 12.5.`,
      );
    }
  }

  const [whole, fraction = ""] = digits.split(/[.,]/);
  const value = Number(`${sign}${whole || "0"}.${fraction || "0"}`);
  if (!Number.isFinite(value)) return fail(`That number is too large to be an answer.`);
  return { ok: true, value: value === 0 ? 0 : value };
}
