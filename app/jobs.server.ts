/**
 * The app's background jobs, started by the first request a process serves (root middleware)
 * and then kept by their own unref'd timers: the deadline sweep (closes and grades expired exam
 * attempts, issues pending certificates) and the daily reminder job. Both start once per
 * process and are idempotent; neither starts under vitest, and the reminder job not with
 * TIDEMARK_REMINDERS=off.
 */
import type { MiddlewareFunction } from "react-router";
import { ensureDeadlineSweeper } from "./db/queries/exam-attempts.server";
import { ensureReminderSchedule } from "./db/queries/reminder-schedule.server";

export const backgroundJobs: MiddlewareFunction<Response> = (_args, next) => {
  ensureDeadlineSweeper();
  ensureReminderSchedule();
  return next();
};
