/**
 * The reminder job inside the running app: once per process, a timer (unref'd, so it never
 * keeps the process alive) that runs at start-up and then every hour checks, per organisation,
 * whether today's run (on the organisation's calendar) happened; if not, it runs. A run is cheap
 * and idempotent thanks to the unique keys, so a check that races `npm run reminders` or another
 * process sends nothing twice.
 */
import { database } from "../client.server";
import { organisations } from "../schema";
import { calendarDateIn } from "~/domain/status";
import { hasRunOn, runRemindersFor, type ReminderJobOptions } from "./reminder-job.server";

const HOUR_MS = 60 * 60 * 1000;
let timer: ReturnType<typeof setInterval> | undefined;
let running: Promise<number> | undefined;

/** Runs the job for each organisation whose run of today is missing; returns how many ran. */
export async function runMissedReminders(now = new Date(), options: Omit<ReminderJobOptions, "now" | "trigger" | "orgIds"> = {}): Promise<number> {
  const { db } = await database();
  const orgs = await db.select({ id: organisations.id, timeZone: organisations.timeZone }).from(organisations);
  let ran = 0;
  for (const org of orgs) {
    if (await hasRunOn(org.id, calendarDateIn(org.timeZone, now))) continue;
    await runRemindersFor(org.id, { ...options, now, trigger: "app" });
    ran += 1;
  }
  return ran;
}

function tick() {
  // One check at a time in this process: an hour-long send would otherwise overlap the next tick.
  running ??= runMissedReminders()
    .catch((error: unknown) => {
      console.error("the reminder job failed", error);
      return 0;
    })
    .finally(() => {
      running = undefined;
    });
}

/** Starts the daily reminder job once per process (not under vitest: tests call the job with their own `now`). */
export function ensureReminderSchedule(): void {
  if (timer || process.env.VITEST || process.env.TIDEMARK_REMINDERS === "off") return;
  timer = setInterval(tick, HOUR_MS);
  timer.unref?.();
  // At start-up too, without holding up the request that started the timer.
  setTimeout(tick, 0).unref?.();
}
