/**
 * An organisation's reminder policy and how it sits in `organisations.settings`. Pure.
 *
 * Default cadence — 90, 60, 30, 14 and 7 days before, on the day, then weekly while lapsed; a
 * weekly digest to managers; board credentials also 12 and 6 months before — is common
 * practice, no source (shared/TESTING.md "Reminder cadence").
 *
 * Stored in two parts so the status engine keeps working unchanged: `reminderDays` holds the
 * days before (0 for "on the day"), and the engine's "Due soon" window is its largest value
 * (`reminderWindowDays`); `reminderPolicy` holds the rest.
 */
import type { OrganisationSettingsLike } from "./types";

export type ReminderPolicy = {
  /** Days before a due or valid-through date, largest first (each 1–365). */
  daysBefore: number[];
  /** A reminder on the date itself. */
  onTheDay: boolean;
  /** Once lapsed, one reminder per ISO week until it is renewed or waived. */
  weeklyWhileLapsed: boolean;
  /** Extra reminders for board credentials, in calendar months before (each 1–24). */
  boardMonthsBefore: number[];
  /** A weekly digest to each manager of their units' Due soon and Lapsed people. */
  managerDigest: boolean;
};

export const DEFAULT_REMINDER_POLICY: ReminderPolicy = Object.freeze({
  daysBefore: [90, 60, 30, 14, 7],
  onTheDay: true,
  weeklyWhileLapsed: true,
  boardMonthsBefore: [12, 6],
  managerDigest: true,
}) as ReminderPolicy;

export const MAX_DAYS_BEFORE = 365;
export const MAX_BOARD_MONTHS = 24;

/** Whole numbers in range, without duplicates, largest first. */
function cleanList(values: readonly unknown[] | undefined, max: number): number[] {
  const ok = (values ?? []).filter((v): v is number => typeof v === "number" && Number.isInteger(v) && v >= 1 && v <= max);
  return [...new Set(ok)].sort((a, b) => b - a);
}

/** The policy an organisation's settings describe; anything missing takes the default. */
export function policyFromSettings(settings: OrganisationSettingsLike | null | undefined): ReminderPolicy {
  const days = settings?.reminderDays;
  const rest = settings?.reminderPolicy;
  return {
    daysBefore: days === undefined ? [...DEFAULT_REMINDER_POLICY.daysBefore] : cleanList(days, MAX_DAYS_BEFORE),
    onTheDay: days === undefined ? DEFAULT_REMINDER_POLICY.onTheDay : days.includes(0),
    weeklyWhileLapsed: rest?.weeklyWhileLapsed ?? DEFAULT_REMINDER_POLICY.weeklyWhileLapsed,
    boardMonthsBefore: rest?.boardMonthsBefore === undefined ? [...DEFAULT_REMINDER_POLICY.boardMonthsBefore] : cleanList(rest.boardMonthsBefore, MAX_BOARD_MONTHS),
    managerDigest: rest?.managerDigest ?? DEFAULT_REMINDER_POLICY.managerDigest,
  };
}

/** The two settings fields that store a policy (merge them into the rest of the settings). */
export function settingsFromPolicy(policy: ReminderPolicy): Required<Pick<OrganisationSettingsLike, "reminderDays" | "reminderPolicy">> {
  const daysBefore = cleanList(policy.daysBefore, MAX_DAYS_BEFORE);
  return {
    reminderDays: policy.onTheDay ? [...daysBefore, 0] : daysBefore,
    reminderPolicy: {
      weeklyWhileLapsed: policy.weeklyWhileLapsed,
      boardMonthsBefore: cleanList(policy.boardMonthsBefore, MAX_BOARD_MONTHS),
      managerDigest: policy.managerDigest,
    },
  };
}
