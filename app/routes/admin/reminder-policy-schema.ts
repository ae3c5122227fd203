/**
 * The reminder-policy form (Admin → Reminders): shared by conform in the browser and the
 * action. The numbers are typed as lists ("90, 60, 30, 14, 7"); each bad entry comes back as a
 * message on its own field.
 */
import { z } from "zod";
import { MAX_BOARD_MONTHS, MAX_DAYS_BEFORE } from "~/domain/reminders";

const MAX_ENTRIES = 10;

function numberList(unit: "days" | "months", max: number, required: boolean) {
  return z
    .string()
    .trim()
    .optional()
    .transform((value, ctx) => {
      const text = value ?? "";
      const fail = (message: string) => {
        ctx.addIssue({ code: "custom", message });
        return z.NEVER;
      };
      if (!text) return required ? fail(`Enter at least one number of ${unit} before, for example 30.`) : [];
      const out: number[] = [];
      for (const part of text.split(/[\s,;]+/).filter(Boolean)) {
        if (!/^\d+$/.test(part)) return fail(`“${part}” is not a whole number of ${unit}. Separate numbers with commas.`);
        const n = Number(part);
        if (n === 0 && unit === "days") return fail("Use “On the day” for the day itself; days before start at 1.");
        if (n < 1 || n > max) return fail(`${n} is outside 1–${max} ${unit}.`);
        if (out.includes(n)) return fail(`${n} is listed twice.`);
        out.push(n);
      }
      if (out.length > MAX_ENTRIES) return fail(`At most ${MAX_ENTRIES} reminders here.`);
      return out.sort((a, b) => b - a);
    });
}

/** A checkbox sends "on" when ticked and nothing otherwise. */
const checkbox = z
  .string()
  .optional()
  .transform((v) => v === "on");

export const reminderPolicySchema = z.object({
  daysBefore: numberList("days", MAX_DAYS_BEFORE, true),
  onTheDay: checkbox,
  weeklyWhileLapsed: checkbox,
  boardMonthsBefore: numberList("months", MAX_BOARD_MONTHS, false),
  managerDigest: checkbox,
});

export type ReminderPolicyValues = z.infer<typeof reminderPolicySchema>;

export const reminderDeliverySchema = z.object({
  delivery: z.enum(["each", "digest"], { error: "Choose separate e-mails or one daily digest." }),
});
