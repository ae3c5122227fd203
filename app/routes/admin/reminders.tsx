import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { formatCalendarDate, formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform } from "~/components/ui/field";
import { getReminderPolicy, listRecentManagerDigests, listRecentReminders, listReminderRuns, saveReminderPolicy } from "~/db/queries/reminders.server";
import { describeThreshold } from "~/domain/reminders";
import { reminderPolicySchema } from "./reminder-policy-schema";
import type { Route } from "./+types/reminders";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "org:settings");
  const policy = await getReminderPolicy(viewer.org.id);
  if (!policy) notFound("We could not find your organisation.");
  const [runs, recent, digests] = await Promise.all([listReminderRuns(viewer.org.id), listRecentReminders(viewer.org.id), listRecentManagerDigests(viewer.org.id)]);
  return { policy, runs, recent, digests, timeZone: viewer.org.timeZone };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "org:settings");
  const submission = parseWithZod(await request.formData(), { schema: reminderPolicySchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const changed = await saveReminderPolicy(viewer.org.id, viewer.person.id, submission.value);
  return redirectWithToast("/admin/reminders", changed ? "Reminder policy saved." : "Nothing changed.");
}

export default function ReminderPolicyPage() {
  const { policy, runs, recent, digests, timeZone } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "reminder-policy",
    lastResult,
    defaultValue: {
      daysBefore: policy.daysBefore.join(", "),
      boardMonthsBefore: policy.boardMonthsBefore.join(", "),
    },
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: reminderPolicySchema }),
  });
  return (
    <div className="flex max-w-4xl flex-col gap-8">
      <section aria-labelledby="policy-heading" className="flex flex-col gap-4">
        <h2 id="policy-heading" className="text-2xl font-semibold">
          Reminder policy
        </h2>
        <p className="text-muted">
          Tidemark e-mails each person before a requirement falls due or a card stops being valid, and weekly once it has lapsed. Each reminder
          is sent once: a person, a requirement, its date and the threshold. When the job could not run for a few days, it sends only the most
          recent threshold passed. A renewal starts a fresh series. “Due soon” everywhere in Tidemark means within the largest number of days
          below.
        </p>
        <Form method="post" {...getFormProps(form)} aria-labelledby="policy-heading" className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField
            key={fields.daysBefore.key}
            {...fromConform(fields.daysBefore)}
            label="Days before the date"
            hint="Whole numbers from 1 to 365, separated by commas. Default: 90, 60, 30, 14, 7."
          />
          <Checkbox name={fields.onTheDay.name} id={fields.onTheDay.id} defaultChecked={policy.onTheDay} label="On the day itself" />
          <Checkbox
            name={fields.weeklyWhileLapsed.name}
            id={fields.weeklyWhileLapsed.id}
            defaultChecked={policy.weeklyWhileLapsed}
            label="Every week once lapsed, until it is renewed or waived"
          />
          <TextField
            key={fields.boardMonthsBefore.key}
            {...fromConform(fields.boardMonthsBefore)}
            label="Board credentials: also months before"
            hint="Calendar months from 1 to 24, separated by commas; leave empty for none. Default: 12, 6."
          />
          <Checkbox
            name={fields.managerDigest.name}
            id={fields.managerDigest.id}
            defaultChecked={policy.managerDigest}
            label="A weekly digest to each manager of their units’ Due soon and Lapsed people"
          />
          <div className="mt-2">
            <Button type="submit">Save reminder policy</Button>
          </div>
        </Form>
      </section>

      <section aria-labelledby="runs-heading" className="flex flex-col gap-2">
        <h2 id="runs-heading" className="text-2xl font-semibold">
          Last runs of the reminder job
        </h2>
        <p className="text-muted">The job runs daily inside Tidemark and whenever someone runs it by hand. Dates are in {timeZone}.</p>
        {runs.length === 0 ? (
          <p>The job has not run yet.</p>
        ) : (
          <table className="w-full border-collapse text-left">
            <caption className="sr-only">Last runs of the reminder job, newest first</caption>
            <thead>
              <tr className="border-b border-rule">
                <th scope="col" className="py-2 pr-4">Day judged</th>
                <th scope="col" className="py-2 pr-4">Started by</th>
                <th scope="col" className="py-2 pr-4 text-right">Reminders</th>
                <th scope="col" className="py-2 pr-4 text-right">E-mails</th>
                <th scope="col" className="py-2 pr-4 text-right">Failed</th>
              </tr>
            </thead>
            <tbody>
              {runs.map((r) => (
                <tr key={r.id} className="border-b border-rule">
                  <td className="py-2 pr-4">{formatCalendarDate(r.ranOn)}</td>
                  <td className="py-2 pr-4">{r.trigger === "app" ? "the daily timer" : r.trigger === "script" ? "npm run reminders" : "a test"}</td>
                  <td className="py-2 pr-4 text-right tabular-nums">{r.sent}</td>
                  <td className="py-2 pr-4 text-right tabular-nums">{r.emails}</td>
                  <td className="py-2 pr-4 text-right tabular-nums">{r.failed}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="recent-heading" className="flex flex-col gap-2">
        <h2 id="recent-heading" className="text-2xl font-semibold">
          Recent reminders
        </h2>
        {recent.length === 0 ? (
          <p>No reminders yet.</p>
        ) : (
          <table className="w-full border-collapse text-left">
            <caption className="sr-only">Recent reminders, newest first</caption>
            <thead>
              <tr className="border-b border-rule">
                <th scope="col" className="py-2 pr-4">Person</th>
                <th scope="col" className="py-2 pr-4">Requirement</th>
                <th scope="col" className="py-2 pr-4">Date</th>
                <th scope="col" className="py-2 pr-4">Threshold</th>
                <th scope="col" className="py-2 pr-4">Sent</th>
              </tr>
            </thead>
            <tbody>
              {recent.map((r) => (
                <tr key={r.id} className="border-b border-rule">
                  <td className="py-2 pr-4">{r.personName}</td>
                  <td className="py-2 pr-4">{r.requirement}</td>
                  <td className="py-2 pr-4">{formatCalendarDate(r.dueOn)}</td>
                  <td className="py-2 pr-4">{describeThreshold(r.threshold)}</td>
                  <td className="py-2 pr-4">
                    {r.sentAt
                      ? `${formatInstantDate(r.sentAt, timeZone)}${r.channel === "digest" ? " (daily digest)" : ""}`
                      : r.failure
                        ? `Not sent: ${r.failure}`
                        : "Sending"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="digests-heading" className="flex flex-col gap-2">
        <h2 id="digests-heading" className="text-2xl font-semibold">
          Managers’ weekly digests
        </h2>
        {digests.length === 0 ? (
          <p>No digests yet.</p>
        ) : (
          <ul className="flex flex-col gap-1">
            {digests.map((d) => (
              <li key={d.id}>
                {d.managerName}, week {d.week}: {d.people} {d.people === 1 ? "person" : "people"} —{" "}
                {d.sentAt ? `sent ${formatInstantDate(d.sentAt, timeZone)}` : d.failure ? `not sent: ${d.failure}` : "sending"}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

function Checkbox({ id, name, label, defaultChecked }: { id: string; name: string; label: string; defaultChecked: boolean }) {
  return (
    <div className="mb-3 flex items-center gap-3">
      <input type="checkbox" id={id} name={name} defaultChecked={defaultChecked} className="h-5 w-5" />
      <label htmlFor={id}>{label}</label>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Reminder policy · Admin · Tidemark" }];
