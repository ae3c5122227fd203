/**
 * The bedside page's forms and sections below the steps: the outcome, the signature forms
 * (observer and acknowledgement), addenda and evidence. Route-private parts of checkoff.tsx.
 */
import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useActionData, useFetcher, useLoaderData, useNavigation } from "react-router";
import { isSigned } from "~/auth/checkoff-policy";
import { SignatureBlock } from "~/components/checkoffs/signature-block";
import { CalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FieldFrame, FormErrors, SelectField, TextAreaField, TextField, resultFor, fromConform } from "~/components/ui/field";
import { OUTCOME_WORDS } from "~/domain/checkoffs/record";
import { addendumSchema, CHECKOFF_INTENTS, outcomeSchema, signSchema } from "./schemas";
import type { action, loader } from "./checkoff";

export type LoaderData = ReturnType<typeof useLoaderData<typeof loader>>;

export function OutcomeSummary({ d }: { d: LoaderData }) {
  const c = d.record.checkoff;
  return (
    <section aria-labelledby="outcome-heading" className="flex flex-col gap-2">
      <h2 id="outcome-heading" className="text-2xl font-semibold">
        Outcome
      </h2>
      <p className="text-lg font-semibold" data-testid="outcome">
        {c.outcome ? OUTCOME_WORDS[c.outcome] : <span className="font-normal text-muted">Not decided yet</span>}
      </p>
      {c.outcome === "needs-practice" ? (
        <p>
          Plan: {c.practicePlan} — by {c.practiceBy ? <CalendarDate value={c.practiceBy} /> : "—"}
        </p>
      ) : null}
    </section>
  );
}

export function OutcomeForm({ d }: { d: LoaderData }) {
  const c = d.record.checkoff;
  const fetcher = useFetcher<SubmissionResult<string[]>>();
  const [form, fields] = useForm({
    id: "outcome",
    lastResult: fetcher.data,
    defaultValue: { outcome: c.outcome ?? "", practicePlan: c.practicePlan ?? "", practiceBy: c.practiceBy ?? "" },
    constraint: getZodConstraint(outcomeSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: outcomeSchema }),
  });
  const options = [
    { value: "", label: "Choose the outcome…" },
    ...d.outcomes.map((o) => ({ value: o, label: OUTCOME_WORDS[o] })),
  ];
  return (
    <section aria-labelledby="outcome-heading" className="flex flex-col gap-2 rounded-lg border border-rule bg-card p-4">
      <h2 id="outcome-heading" className="text-2xl font-semibold">
        Outcome
      </h2>
      {d.outcomes.length === 1 ? <p className="text-coral">A critical step was not met, so the outcome is needs practice.</p> : null}
      <fetcher.Form method="post" {...getFormProps(form)} className="flex flex-col gap-1">
        <FormErrors id={form.errorId} errors={form.errors} />
        <SelectField key={fields.outcome.key} id={fields.outcome.id} name={fields.outcome.name} label="Outcome" options={options} defaultValue={fields.outcome.initialValue as string} errors={fields.outcome.errors} />
        <TextAreaField
          key={fields.practicePlan.key}
          {...fromConform(fields.practicePlan)}
          label="Practice plan (needs practice)"
          hint="What to practise, and how."
          rows={3}
        />
        <TextField
          key={fields.practiceBy.key}
          {...fromConform(fields.practiceBy)}
          type="date"
          min={d.today}
          label="Practise by (needs practice)"
          hint="A repeat check-off is scheduled for this date when you sign."
        />
        <div>
          <Button type="submit" variant="secondary" name="intent" value={CHECKOFF_INTENTS.outcome} disabled={fetcher.state !== "idle"}>
            {fetcher.state !== "idle" ? "Saving…" : "Save outcome"}
          </Button>
        </div>
      </fetcher.Form>
    </section>
  );
}

export function SignForm({
  d,
  intent,
  heading,
  submitLabel,
  emailHint,
  emailRequired = false,
  disabled = false,
}: {
  d: LoaderData;
  intent: string;
  heading: string;
  submitLabel: string;
  emailHint: string;
  emailRequired?: boolean;
  disabled?: boolean;
}) {
  const lastResult = useActionData<typeof action>() as SubmissionResult<string[]> | undefined;
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: intent,
    lastResult: navigation.state === "idle" ? resultFor(lastResult, intent) : undefined,
    constraint: getZodConstraint(signSchema),
    shouldValidate: "onSubmit",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: signSchema }),
  });
  const busy = navigation.state === "submitting" && navigation.formData?.get("intent") === intent;
  return (
    <section aria-labelledby={`${intent}-heading`} className="rounded-lg border border-rule bg-card p-4">
      <h3 id={`${intent}-heading`} className="mb-2 text-xl font-semibold">
        {heading}
      </h3>
      {disabled ? (
        <ul className="mb-3 list-disc pl-6 text-coral" data-testid="signing-problems">
          {d.problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      ) : null}
      {!d.hasPin && !emailRequired ? (
        <p className="mb-3">
          You have no signing PIN yet. <Link to="/checkoffs/signing-pin">Set your signing PIN</Link> first.
        </p>
      ) : null}
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-1">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={intent} />
        <TextField
          key={fields.email.key}
          {...fromConform(fields.email)}
          type="email"
          autoComplete="off"
          label={emailRequired ? "Signer's work e-mail" : "Signer's work e-mail (shared tablet only)"}
          hint={emailHint}
          required={emailRequired}
        />
        <TextField
          key={fields.pin.key}
          {...fromConform(fields.pin, { keepValue: false })}
          type="password"
          inputMode="numeric"
          autoComplete="off"
          label="Signing PIN"
          hint="Your own PIN of at least 6 digits. Five wrong PINs lock signing for 15 minutes."
          required
        />
        <div>
          <Button type="submit" disabled={disabled || busy}>
            {busy ? "Signing…" : submitLabel}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export function AddendaSection({ d }: { d: LoaderData }) {
  const { record, may } = d;
  const lastResult = useActionData<typeof action>() as SubmissionResult<string[]> | undefined;
  const navigation = useNavigation();
  const mine = resultFor(lastResult, CHECKOFF_INTENTS.addendum) !== undefined;
  const [form, fields] = useForm({
    id: "addendum",
    lastResult: navigation.state === "idle" && mine ? lastResult : undefined,
    constraint: getZodConstraint(addendumSchema),
    shouldValidate: "onSubmit",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: addendumSchema }),
  });
  if (!isSigned(record.checkoff) && record.addenda.length === 0) return null;
  return (
    <section aria-labelledby="addenda-heading" className="flex flex-col gap-3">
      <h2 id="addenda-heading" className="text-2xl font-semibold">
        Addenda
      </h2>
      {record.addenda.length === 0 ? <p className="text-muted">No addenda.</p> : null}
      <ol className="flex flex-col gap-3">
        {record.addenda.map((a) => (
          <li key={a.id} className="flex flex-col gap-2 border-l-4 border-sea pl-4" data-testid="addendum">
            <p className="whitespace-pre-wrap">{a.text}</p>
            {a.signature ? <SignatureBlock signature={a.signature} holds={d.holds[a.signature.id]} /> : null}
          </li>
        ))}
      </ol>
      {may.addendum ? (
        <Form method="post" {...getFormProps(form)} aria-labelledby="add-addendum-heading" className="flex flex-col gap-1 rounded-lg border border-rule bg-card p-4">
          <h3 id="add-addendum-heading" className="mb-2 text-xl font-semibold">
            Add a signed addendum
          </h3>
          <FormErrors id={form.errorId} errors={form.errors} />
          <input type="hidden" name="intent" value={CHECKOFF_INTENTS.addendum} />
          <TextAreaField key={fields.text.key} id={fields.text.id} name={fields.text.name} label="Correction or note" rows={3} defaultValue={fields.text.initialValue as string} errors={fields.text.errors} required />
          <TextField
            key={fields.email.key}
            {...fromConform(fields.email)}
            type="email"
            autoComplete="off"
            label="Signer's work e-mail (shared tablet only)"
            hint="Leave empty to sign as yourself."
          />
          <TextField key={fields.pin.key} id={fields.pin.id} name={fields.pin.name} type="password" inputMode="numeric" autoComplete="off" label="Signing PIN" errors={fields.pin.errors} required />
          <div>
            <Button type="submit">Sign and add the addendum</Button>
          </div>
        </Form>
      ) : null}
    </section>
  );
}

export function EvidenceSection({ d }: { d: LoaderData }) {
  const { record, may } = d;
  const result = useActionData<typeof action>() as { intent?: string; message?: string } | undefined;
  const error = result?.intent === CHECKOFF_INTENTS.evidence ? result.message : undefined;
  return (
    <section aria-labelledby="evidence-heading" className="flex flex-col gap-3">
      <h2 id="evidence-heading" className="text-2xl font-semibold">
        Evidence
      </h2>
      {record.evidence.length === 0 ? (
        <p className="text-muted">No evidence attached.</p>
      ) : (
        <ul className="flex flex-col gap-1">
          {record.evidence.map((e) => (
            <li key={e.id}>
              <a href={`/checkoffs/${record.checkoff.id}/evidence/${e.id}`} download>
                {e.name}
              </a>{" "}
              <span className="text-muted">
                ({Math.max(1, Math.round(e.sizeBytes / 1024))} KB, attached by {e.uploadedBy})
              </span>
            </li>
          ))}
        </ul>
      )}
      {may.evidence ? (
        <Form method="post" encType="multipart/form-data" className="flex flex-col gap-1 rounded-lg border border-rule bg-card p-4">
          <input type="hidden" name="intent" value={CHECKOFF_INTENTS.evidence} />
          <FieldFrame id="evidence-file" label="Attach a photo or PDF" hint="PNG, JPEG or PDF, 10 MB at most — for example a paper check-off from before Tidemark." errors={error ? [error] : undefined}>
            {(aria) => <input {...aria} type="file" name="file" accept="image/png,image/jpeg,application/pdf" className="min-h-11" />}
          </FieldFrame>
          <div>
            <Button type="submit" variant="secondary">
              Attach evidence
            </Button>
          </div>
        </Form>
      ) : null}
    </section>
  );
}

