import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { formatCalendarDate, formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { getReminderDelivery, getReminderPolicy, listRecentReminders, saveReminderDelivery } from "~/db/queries/reminders.server";
import { describeThreshold } from "~/domain/reminders";
import { reminderDeliverySchema } from "~/routes/admin/reminder-policy-schema";
import type { Route } from "./+types/reminders";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:plan");
  const [delivery, policy, recent] = await Promise.all([
    getReminderDelivery(viewer.org.id, viewer.person.id),
    getReminderPolicy(viewer.org.id),
    listRecentReminders(viewer.org.id, { personId: viewer.person.id, limit: 20 }),
  ]);
  if (!delivery || !policy) notFound("We could not find your record in this organisation.");
  return { delivery, policy, recent, timeZone: viewer.org.timeZone, email: viewer.person.email };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:plan");
  const submission = parseWithZod(await request.formData(), { schema: reminderDeliverySchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  await saveReminderDelivery(viewer.org.id, viewer.person.id, submission.value.delivery);
  return redirectWithToast(
    "/plan/reminders",
    submission.value.delivery === "digest" ? "You will get one daily digest of your reminders." : "You will get each reminder as its own e-mail.",
  );
}

export default function MyReminders() {
  const { delivery, policy, recent, timeZone, email } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "reminder-delivery",
    lastResult,
    defaultValue: { delivery },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: reminderDeliverySchema }),
  });
  const errorId = `${fields.delivery.id}-error`;
  const cadence = [
    ...policy.daysBefore.map((d) => `${d} days before`),
    ...(policy.onTheDay ? ["on the day"] : []),
    ...(policy.weeklyWhileLapsed ? ["weekly once lapsed"] : []),
  ].join(", ");
  return (
    <div className="flex max-w-3xl flex-col gap-6">
      <div>
        <h1 className="text-3xl font-semibold">Reminders</h1>
        <p className="mt-2 text-muted">
          Tidemark e-mails you at {email} before something on <Link to="/plan" className="underline">your plan</Link> falls due: {cadence || "as your organisation sets"}.
          {policy.boardMonthsBefore.length > 0 ? ` Board credentials also ${policy.boardMonthsBefore.join(" and ")} months before.` : ""} Each reminder comes
          once.
        </p>
      </div>

      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-3 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <fieldset aria-describedby={fields.delivery.errors ? errorId : undefined} className="flex flex-col gap-3">
          <legend className="mb-2 font-semibold">How would you like your reminders?</legend>
          <label className="flex items-start gap-3">
            <input type="radio" name={fields.delivery.name} value="each" defaultChecked={delivery === "each"} className="mt-1 h-5 w-5" />
            <span>
              <span className="font-semibold">Separate e-mails</span> — one e-mail per reminder, on the day it is due.
            </span>
          </label>
          <label className="flex items-start gap-3">
            <input type="radio" name={fields.delivery.name} value="digest" defaultChecked={delivery === "digest"} className="mt-1 h-5 w-5" />
            <span>
              <span className="font-semibold">One daily digest</span> — on days with reminders, one e-mail listing them all.
            </span>
          </label>
          <div id={errorId} className="min-h-6 text-sm text-coral" aria-live="polite">
            {fields.delivery.errors ? <ul>{fields.delivery.errors.map((e) => <li key={e}>{e}</li>)}</ul> : null}
          </div>
        </fieldset>
        <div>
          <Button type="submit">Save my choice</Button>
        </div>
      </Form>

      <section aria-labelledby="my-recent-heading">
        <h2 id="my-recent-heading" className="text-2xl font-semibold">
          Reminders sent to you
        </h2>
        {recent.length === 0 ? (
          <p className="mt-2">None yet.</p>
        ) : (
          <ul className="mt-2 flex flex-col gap-1">
            {recent.map((r) => (
              <li key={r.id}>
                {r.requirement} — date {formatCalendarDate(r.dueOn)}, {describeThreshold(r.threshold)}:{" "}
                {r.sentAt ? `sent ${formatInstantDate(r.sentAt, timeZone)}${r.channel === "digest" ? " in your daily digest" : ""}` : r.failure ? "not sent" : "sending"}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Reminders · My plan · Tidemark" }];
