/**
 * Reminders (issue 9 §1): the organisation's policy, ISO weeks, and which reminders are due
 * for a person today. Pure — no framework, database or clock; the job
 * (app/db/queries/reminders.server.ts) loads the rows, claims and sends.
 */
export { DEFAULT_REMINDER_POLICY, MAX_BOARD_MONTHS, MAX_DAYS_BEFORE, policyFromSettings, settingsFromPolicy, type ReminderPolicy } from "./policy";
export { dueReminders, indexSent, latestThreshold, thresholdDate, thresholdsFor, type DueReminder, type ReminderSubject, type SentReminder } from "./due";
export { isoWeek, isoWeekday, isoWeekStart, mondayOfIsoWeek } from "./iso-week";
export { describeThreshold } from "./words";
