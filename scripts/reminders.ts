/**
 * `npm run reminders`: runs the reminder job once for every organisation, on today's date in
 * each organisation's time zone, and prints what it sent. It sends to whatever the
 * configuration points at (MAIL_TRANSPORT, RESEND_BASE_URL, SMTP_URL — in demo mode the local
 * fake). Running it again the same day sends nothing more: each reminder is claimed by its row.
 * `--now 2026-12-02T14:00:00Z` judges another instant (catch-up, rehearsals).
 */
import { parseArgs } from "node:util";

// The daily timer belongs to the running app; this run is the whole job.
process.env.TIDEMARK_REMINDERS = "off";

const { values } = parseArgs({ options: { now: { type: "string" } } });
const now = values.now ? new Date(values.now) : new Date();
if (Number.isNaN(now.getTime())) {
  console.error(`--now must be an instant such as 2026-12-02T14:00:00Z, got "${values.now}".`);
  process.exit(2);
}

const { database } = await import("../app/db/client.server");
const { runReminders } = await import("../app/db/queries/reminder-job.server");
const { env } = await import("../app/config/env.server");

const settings = env();
console.log(`Reminder job at ${now.toISOString()}; mail via ${settings.mailTransport === "smtp" ? settings.smtpUrl : settings.resendBaseUrl}; links to ${settings.publicUrl}.`);
const started = performance.now();
const reports = await runReminders({ now, trigger: "script" });
let failures = 0;
for (const r of reports) {
  console.log(`\n${r.orgName} (today ${r.today}): ${r.remindersSent} reminder(s) in ${r.emails.length} e-mail(s), ${r.failed.length} failed.`);
  for (const e of r.emails) console.log(`  sent  ${e.kind.padEnd(14)} ${e.to} — ${e.subject}`);
  for (const f of r.failed) console.log(`  FAIL  ${f.kind.padEnd(14)} ${f.to} — ${f.subject}: ${f.error}${f.retry ? " (will retry on the next run)" : ""}`);
  failures += r.failed.length;
}
console.log(`\nDone in ${((performance.now() - started) / 1000).toFixed(1)} s.`);
(await database()).close();
process.exitCode = failures > 0 ? 1 : 0;
