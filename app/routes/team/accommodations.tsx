import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CalendarDate, formatCalendarDate, formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, TextAreaField, TextField, fromConform, resultFor } from "~/components/ui/field";
import {
  accommodationCandidates,
  getAccommodation,
  grantAccommodation,
  listAccommodations,
  personInAccommodationScope,
  revokeAccommodation,
  type AccommodationRow,
} from "~/db/queries/accommodations.server";
import { matrixScopeFor } from "~/db/queries/team-matrix.server";
import { MAX_MULTIPLIER } from "~/domain/exams/timing";
import { calendarDateIn } from "~/domain/status";
import {
  ACCOMMODATION_INTENTS,
  REASON_MAX,
  describeAccommodation,
  grantAccommodationSchema,
  revokeAccommodationSchema,
} from "./accommodation-schema";
import type { Route } from "./+types/accommodations";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "exams:accommodate");
  const orgId = viewer.org.id;
  const today = calendarDateIn(viewer.org.timeZone, new Date());
  const scope = await matrixScopeFor(orgId, viewer.person.id, viewer.roles);
  const [people, rows] = await Promise.all([accommodationCandidates(orgId, scope, viewer.person.id), listAccommodations(orgId, scope, today)]);
  return { today, timeZone: viewer.org.timeZone, wholeOrganisation: scope.unitIds === null, noUnits: scope.unitIds?.length === 0, people, rows };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "exams:accommodate");
  const orgId = viewer.org.id;
  const today = calendarDateIn(viewer.org.timeZone, new Date());
  const scope = await matrixScopeFor(orgId, viewer.person.id, viewer.roles);
  const formData = await request.formData();

  switch (formData.get("intent")) {
    case ACCOMMODATION_INTENTS.grant: {
      const submission = parseWithZod(formData, { schema: grantAccommodationSchema(today) });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const v = submission.value;
      const person = await personInAccommodationScope(orgId, scope, v.personId);
      if (!person) notFound("We could not find that person among the people you may give extra time to.", true);
      // Separation of duties: another educator or manager decides on one's own extra time.
      if (person.id === viewer.person.id) return data(submission.reply({ fieldErrors: { personId: ["You cannot give yourself extra time; ask another educator or manager."] } }), { status: 400 });
      if (!person.active) return data(submission.reply({ fieldErrors: { personId: [`${person.name} is not active, so cannot sit an exam.`] } }), { status: 400 });
      await grantAccommodation(orgId, viewer.person.id, { personId: person.id, kind: v.kind, multiplier: v.multiplier, reason: v.reason, endsOn: v.endsOn ?? null });
      const until = v.endsOn ? ` through ${formatCalendarDate(v.endsOn)}` : " until revoked";
      return redirectWithToast("/team/accommodations", `${person.name} now has ${describeAccommodation(v).toLowerCase()}${until}. The reason is recorded.`);
    }
    case ACCOMMODATION_INTENTS.revoke: {
      const submission = parseWithZod(formData, { schema: revokeAccommodationSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const row = await getAccommodation(orgId, submission.value.accommodationId);
      const person = row ? await personInAccommodationScope(orgId, scope, row.personId) : null;
      if (!row || !person) notFound("We could not find that accommodation among the people you look after.", true);
      if (!(await revokeAccommodation(orgId, viewer.person.id, row.id))) {
        return data(submission.reply({ formErrors: ["This accommodation was already revoked. Reload the page to see who revoked it."] }), { status: 409 });
      }
      return redirectWithToast("/team/accommodations", `Revoked ${person.name}'s adjustment (${describeAccommodation(row).toLowerCase()}). Exams they start from now use the usual time.`);
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

export default function Accommodations() {
  const { today, timeZone, wholeOrganisation, noUnits, people, rows } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Exam time</h1>
      <div className="mt-3 flex max-w-3xl flex-col gap-2">
        <p>
          Some people need more time for a timed exam, or no time limit at all (for example because of dyslexia, a visual impairment or
          the assistive technology they use). Here you give a person that adjustment, with the reason, for as long as they need it.
        </p>
        <ul className="list-disc pl-6">
          <li>
            <strong>Extra time</strong> multiplies every timed exam's limit: 1.5 gives half as long again (a 40-minute exam becomes
            60 minutes), 2 gives twice as long, up to {MAX_MULTIPLIER} times.
          </li>
          <li>
            <strong>No time limit</strong> lets the person take every exam untimed.
          </li>
          <li>The exam always warns the person before their time runs out, and the clock is kept by the server.</li>
          <li>
            A time limit never ends early because the person's sign-in session ends: the attempt keeps its time and resumes where it was.
          </li>
          <li>An adjustment applies to exams started while it is in force; revoking it does not shorten an exam already under way.</li>
        </ul>
        <p className="text-muted">
          {wholeOrganisation
            ? "You see everyone in the organisation."
            : noUnits
              ? "You do not manage any units yet, so there is no one to list. Your administrator can add the units you manage."
              : "You see the people of the units you manage."}{" "}
          Every grant and revocation is kept in the audit trail.
        </p>
      </div>

      <GrantForm today={today} people={people} />

      <section aria-labelledby="accommodations-heading" className="mt-8">
        <h2 id="accommodations-heading" className="mb-3 text-2xl font-semibold">
          Current and past adjustments
        </h2>
        {rows.length === 0 ? (
          <p>No one has an adjustment yet.</p>
        ) : (
          <LedgerTable caption="Exam time adjustments, those in force first">
            <thead>
              <tr>
                <Th>Person</Th>
                <Th>What</Th>
                <Th>Reason</Th>
                <Th>Until</Th>
                <Th>Granted</Th>
                <Th>Status</Th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <AccommodationLine key={r.id} row={r} timeZone={timeZone} />
              ))}
            </tbody>
          </LedgerTable>
        )}
      </section>
    </>
  );
}

function AccommodationLine({ row: r, timeZone }: { row: AccommodationRow; timeZone: string }) {
  return (
    <tr data-testid="accommodation-row" data-state={r.state}>
      <Td>
        <span className="font-semibold">{r.person}</span>
        {r.homeUnit ? <span className="block text-sm text-muted">{r.homeUnit}</span> : null}
      </Td>
      <Td>{describeAccommodation(r)}</Td>
      <Td className="max-w-md break-words">{r.reason}</Td>
      <Td className="whitespace-nowrap">{r.endsOn ? <CalendarDate value={r.endsOn} /> : "Until revoked"}</Td>
      <Td className="whitespace-nowrap">
        {r.grantedBy ?? "Unknown"}
        <span className="block text-sm text-muted">{formatInstantDate(r.createdAt, timeZone)}</span>
      </Td>
      <Td>
        {r.state === "revoked" ? (
          <>
            Revoked {r.revokedAt ? formatInstantDate(r.revokedAt, timeZone) : ""}
            {r.revokedBy ? <span className="block text-sm text-muted">by {r.revokedBy}</span> : null}
          </>
        ) : r.state === "ended" ? (
          "Ended"
        ) : (
          <div className="flex flex-col gap-2">
            <span>In force</span>
            <AskTwice
              id={`revoke-${r.id}`}
              triggerLabel={`Revoke for ${r.person}`}
              question={`Revoke ${r.person}'s adjustment (${describeAccommodation(r).toLowerCase()})? Exams they start from now use the usual time.`}
              confirmLabel="Yes, revoke"
              intent={ACCOMMODATION_INTENTS.revoke}
              fields={{ accommodationId: r.id }}
            />
          </div>
        )}
      </Td>
    </tr>
  );
}

function GrantForm({ today, people }: { today: string; people: { value: string; label: string }[] }) {
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const granting = navigation.state === "submitting" && navigation.formData?.get("intent") === ACCOMMODATION_INTENTS.grant;
  const [form, fields] = useForm({
    id: "grant-accommodation",
    lastResult: resultFor(lastResult, ACCOMMODATION_INTENTS.grant),
    defaultValue: { kind: "multiplier" },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: grantAccommodationSchema(today) }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const initialKind = fields.kind.initialValue === "untimed" ? "untimed" : "multiplier";
  const [kind, setKind] = useState<"multiplier" | "untimed">(initialKind);
  return (
    <section aria-labelledby="grant-heading" className="mt-6 max-w-2xl rounded-md border border-rule bg-card p-5">
      <h2 id="grant-heading" className="mb-3 text-2xl font-semibold">
        Give someone more time
      </h2>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={ACCOMMODATION_INTENTS.grant} />
        <SelectField
          key={fields.personId.key}
          {...fromConform(fields.personId)}
          label="Person"
          hint="Listed as “Name — home unit”; type the first letters of a name to jump to it."
          options={[{ value: "", label: people.length === 0 ? "No one to choose" : "Choose a person…" }, ...people]}
        />
        <KindChoice id={fields.kind.id} name={fields.kind.name} errors={fields.kind.errors} value={kind} onChange={setKind} />
        <TextField
          key={fields.multiplier.key}
          {...fromConform(fields.multiplier)}
          label="Times the usual time limit"
          hint={`1.5 = half as long again; up to ${MAX_MULTIPLIER}.`}
          type="number"
          inputMode="decimal"
          // No `min`: the step would then count from it (1.1, 1.35, …) and 1.5 would not be a step.
          step={0.25}
          max={MAX_MULTIPLIER}
          disabled={kind === "untimed"}
        />
        <TextAreaField
          key={fields.reason.key}
          {...fromConform(fields.reason)}
          label="Reason"
          hint="Why the person needs it, in a few words (kept with the record and in the audit trail)."
          rows={3}
          maxLength={REASON_MAX}
        />
        <TextField
          key={fields.endsOn.key}
          {...fromConform(fields.endsOn)}
          label="Ends after (optional)"
          hint={`YYYY-MM-DD, the last day it applies; leave empty to keep it until revoked. Today is ${today}.`}
          inputMode="numeric"
        />
        <div>
          <Button type="submit" disabled={granting}>
            {granting ? "Saving…" : "Give this time"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

/** Two radios in a fieldset, framed like every other field (legend, error list, aria-describedby). */
function KindChoice({
  id,
  name,
  errors,
  value,
  onChange,
}: {
  id: string;
  name: string;
  errors?: string[];
  value: "multiplier" | "untimed";
  onChange: (kind: "multiplier" | "untimed") => void;
}) {
  const options = [
    { value: "multiplier", label: "Extra time" },
    { value: "untimed", label: "No time limit" },
  ] as const;
  const errorId = `${id}-error`;
  const hasErrors = !!errors && errors.length > 0;
  return (
    <fieldset className="flex flex-col gap-1" aria-describedby={hasErrors ? errorId : undefined}>
      <legend className="font-semibold">What to give</legend>
      <div className="flex flex-wrap gap-4">
        {options.map((o) => (
          <label key={o.value} className="inline-flex min-h-11 items-center gap-2">
            <input
              type="radio"
              id={`${id}-${o.value}`}
              name={name}
              value={o.value}
              checked={value === o.value}
              onChange={() => onChange(o.value)}
              aria-invalid={hasErrors || undefined}
              className="h-5 w-5"
            />
            {o.label}
          </label>
        ))}
      </div>
      <div className="min-h-6 text-sm text-coral" id={errorId} aria-live="polite">
        {hasErrors ? (
          <ul>
            {errors.map((e) => (
              <li key={e}>{e}</li>
            ))}
          </ul>
        ) : null}
      </div>
    </fieldset>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Exam time · Team · Tidemark" }];
