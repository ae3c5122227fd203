import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, useActionData, useFetcher, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can, ROLE_LABELS, isRole } from "~/auth/roles";
import { AskTwice } from "~/components/admin/ask-twice";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, TextField, fromConform, resultFor } from "~/components/ui/field";
import { listReferences, listRequirementChoices, listRequirements, type RequirementChoices, type RequirementView } from "~/db/queries/requirements.server";
import { createRequirement, setRequirementActive, updateRequirement, type WriteOutcome } from "~/db/queries/requirements-write.server";
import { describeRule } from "~/domain/validity";
import {
  AUDIENCE_ROLES,
  RECURRENCE_LABELS,
  RECURRENCES,
  REQUIREMENT_INTENTS,
  requirementCreateSchema,
  requirementEditSchema,
  requirementRestoreSchema,
  requirementRetireSchema,
  type RequirementKind,
} from "./requirement-schema";
import type { Route } from "./+types/requirements";

const NO_CHOICES: RequirementChoices = { exams: [], checklists: [], credentialTypes: [], units: [] };

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  // Educators and managers (who hold "assignments:write") add, change, retire and bring back requirements.
  const canEdit = can(viewer.roles, "assignments:write");
  const [all, references, choices] = await Promise.all([
    listRequirements(viewer.org.id, { includeRetired: canEdit }),
    canEdit ? listReferences(viewer.org.id) : Promise.resolve([]),
    canEdit ? listRequirementChoices(viewer.org.id) : Promise.resolve(NO_CHOICES),
  ]);
  return {
    requirements: all.filter((r) => r.active),
    retired: all.filter((r) => !r.active),
    references: references.map((r) => ({ id: r.id, code: r.code, title: r.title })),
    choices,
    orgName: viewer.org.name,
    canEdit,
  };
}

/**
 * Educators and managers — both hold "assignments:write" (app/auth/roles.ts) — create a
 * requirement, change its recurrence, audience, grace period, reference and lapse consequence,
 * retire it or bring it back. Everything named must be the organisation's own.
 */
export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "assignments:write");
  const orgId = viewer.org.id;
  const actorId = viewer.person.id;
  const formData = await request.formData();
  switch (formData.get("intent")) {
    case REQUIREMENT_INTENTS.create: {
      const submission = parseWithZod(formData, { schema: requirementCreateSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const outcome = await createRequirement(orgId, actorId, submission.value);
      if (!outcome.ok) return data(submission.reply({ fieldErrors: refusalOf(outcome) }), { status: 400 });
      return redirectWithToast("/team/requirements", `Requirement added: ${submission.value.name}. It appears in the plans of the people it applies to.`);
    }
    case REQUIREMENT_INTENTS.update: {
      const submission = parseWithZod(formData, { schema: requirementEditSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const { requirementId, intent: _intent, ...edit } = submission.value;
      const outcome = await updateRequirement(orgId, actorId, requirementId, edit);
      if (!outcome.ok) return data(submission.reply({ fieldErrors: refusalOf(outcome) }), { status: 400 });
      return redirectWithToast("/team/requirements", "Requirement saved.");
    }
    case REQUIREMENT_INTENTS.retire: {
      const submission = parseWithZod(formData, { schema: requirementRetireSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const outcome = await setRequirementActive(orgId, actorId, submission.value.requirementId, false);
      if (!outcome.ok) return data(submission.reply({ fieldErrors: refusalOf(outcome) }), { status: 400 });
      return redirectWithToast("/team/requirements", "Requirement retired. People's records are kept; bring it back from the list of retired requirements.");
    }
    case REQUIREMENT_INTENTS.restore: {
      const submission = parseWithZod(formData, { schema: requirementRestoreSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const outcome = await setRequirementActive(orgId, actorId, submission.value.requirementId, true);
      if (!outcome.ok) return data(submission.reply({ fieldErrors: refusalOf(outcome) }), { status: 400 });
      return redirectWithToast("/team/requirements", "Requirement brought back. It counts again in plans and on Team.");
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

/** A refusal as conform field errors; a requirement that is not the organisation's is a 404. */
function refusalOf(outcome: Exclude<WriteOutcome, { ok: true }>): Record<string, string[]> {
  if (outcome.notFound) notFound("We could not find that requirement.", true);
  return { [outcome.field]: [outcome.message] };
}

const KIND: Record<RequirementKind, string> = { exam: "Exam", checklist: "Check-off", credential: "Credential" };
const LAPSE_OPTIONS = [
  { value: "supervised", label: "Supervised" },
  { value: "not-cleared", label: "Not cleared" },
];
const ROLE_OPTIONS = [{ value: "", label: "Any role" }, ...AUDIENCE_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))];
const RECURRENCE_OPTIONS = RECURRENCES.map((r) => ({ value: r, label: RECURRENCE_LABELS[r] }));

type Reference = { id: string; code: string; title: string };

function referenceOptions(references: Reference[]) {
  return [{ value: "", label: "None" }, ...references.map((x) => ({ value: x.id, label: `${x.code} — ${x.title}` }))];
}

/** Active units, plus the one a requirement already names if it has since been deactivated. */
function unitOptions(units: RequirementChoices["units"], keeping: string | null = null) {
  return [{ value: "", label: "Every unit" }, ...units.filter((u) => u.active || u.id === keeping).map((u) => ({ value: u.id, label: u.active ? u.name : `${u.name} (deactivated)` }))];
}

function audienceOf(r: RequirementView): string {
  if (!r.unit && !r.role) return "Everyone";
  return [r.unit ?? "Every unit", r.role && isRole(r.role) ? ROLE_LABELS[r.role] : "any role"].join(", ");
}

export default function Requirements() {
  const { requirements, retired, references, choices, orgName, canEdit } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Requirements</h1>
      <p className="mt-2 max-w-3xl text-muted">
        What each unit or role at {orgName} must hold, how long it counts, what a lapse leaves on the Clearance board, and the regulatory reference it
        cites. References are edited in Admin; check the “last verified” date against the current standard.
      </p>
      <table className="mt-6 w-full border-collapse text-left">
        <caption className="sr-only">Requirements with their rules and regulatory references</caption>
        <thead>
          <tr className="border-b border-rule text-sm text-muted">
            <th scope="col" className="py-2 pr-4">Requirement</th>
            <th scope="col" className="py-2 pr-4">Applies to</th>
            <th scope="col" className="py-2 pr-4">How long it counts</th>
            <th scope="col" className="py-2 pr-4">A lapse leaves</th>
            <th scope="col" className="py-2">Regulatory reference</th>
          </tr>
        </thead>
        <tbody>
          {requirements.map((r) => (
            <tr key={r.id} className="border-b border-rule align-top">
              <td className="py-2 pr-4">
                <span className="font-semibold">{r.name}</span>
                <span className="block text-sm text-muted">
                  {KIND[r.kind]}
                  {r.what && r.what !== r.name ? `: ${r.what}` : ""}
                </span>
              </td>
              <td className="py-2 pr-4">{audienceOf(r)}</td>
              <td className="py-2 pr-4">
                {r.terms ? describeRule(r.terms) : r.recurrence && r.recurrence in RECURRENCE_LABELS ? RECURRENCE_LABELS[r.recurrence as keyof typeof RECURRENCE_LABELS] : "—"}
                {r.graceDays > 0 ? <span className="block text-sm text-muted">Grace period {r.graceDays} days</span> : null}
              </td>
              <td className="py-2 pr-4">{r.lapseLeaves === "supervised" ? "Supervised" : "Not cleared"}</td>
              <td className="py-2">
                {r.reference ? (
                  <>
                    <span className="font-semibold">{r.reference.code}</span> — {r.reference.title}
                    <span className="block text-sm text-muted">
                      Last verified {r.reference.lastVerifiedOn ? <CalendarDate value={r.reference.lastVerifiedOn} /> : "never"}
                    </span>
                  </>
                ) : (
                  <span className="text-muted">None cited</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {canEdit ? (
        <>
          {/* Keyed by the count, so a form that just added one starts empty again. */}
          <NewRequirementForm key={requirements.length} choices={choices} references={references} />
          <section aria-labelledby="edit-heading" className="mt-10 max-w-5xl">
            <h2 id="edit-heading" className="text-2xl font-semibold">
              Change a requirement
            </h2>
            <p className="mt-1 text-muted">
              The grace period keeps a lapsing record Due soon for that many days after its valid-through date. Leave unit and role at “Every unit” and “Any
              role” to ask it of everyone; set both to ask it of that role on that unit. Retiring takes a requirement out of plans, the matrix and the counts;
              people's records are kept.
            </p>
            <div className="mt-3 flex flex-col gap-3">
              {requirements.map((r) => (
                // Keyed by what can change, so a saved form shows the saved values.
                <RequirementForm key={`${r.id}:${r.recurrence}:${r.unitId}:${r.role}:${r.graceDays}:${r.reference?.id}:${r.lapseLeaves}`} requirement={r} references={references} units={choices.units} />
              ))}
            </div>
          </section>
          {retired.length > 0 ? <RetiredList retired={retired} /> : null}
        </>
      ) : null}
      <CautionFooter />
    </>
  );
}

function NewRequirementForm({ choices, references }: { choices: RequirementChoices; references: Reference[] }) {
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "new-requirement",
    lastResult: resultFor(lastResult, REQUIREMENT_INTENTS.create),
    defaultValue: { kind: "exam", graceDays: "0", lapseLeaves: "not-cleared", recurrence: "every-12-months" },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: requirementCreateSchema }),
    shouldValidate: "onSubmit",
  });
  const initialKind = (["exam", "checklist", "credential"] as const).find((k) => k === fields.kind.initialValue) ?? "exam";
  const [kind, setKind] = useState<RequirementKind>(initialKind);
  return (
    <section aria-labelledby="new-heading" className="mt-10 max-w-5xl">
      <h2 id="new-heading" className="text-2xl font-semibold">
        New requirement
      </h2>
      <Form method="post" {...getFormProps(form)} aria-labelledby="new-heading" className="mt-3 flex flex-col gap-2 rounded-md border border-rule bg-card p-4">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={REQUIREMENT_INTENTS.create} />
        <div className="grid gap-x-4 md:grid-cols-[2fr_1fr]">
          <TextField key={fields.name.key} {...fromConform(fields.name)} label="Name" hint="As people will see it in their plan." autoComplete="off" />
          <SelectField
            key={fields.kind.key}
            {...fromConform(fields.kind)}
            label="Kind"
            hint="What meets it."
            options={[
              { value: "exam", label: "Exam" },
              { value: "checklist", label: "Check-off" },
              { value: "credential", label: "Credential" },
            ]}
            onChange={(e) => setKind(e.currentTarget.value as RequirementKind)}
          />
        </div>
        <div className="grid gap-x-4 md:grid-cols-2">
          {kind === "exam" ? (
            <SelectField
              key={fields.examId.key}
              {...fromConform(fields.examId)}
              label="Exam"
              hint="Your organisation's published exams."
              options={[{ value: "", label: choices.exams.length ? "Choose an exam" : "No published exams yet" }, ...choices.exams.map((e) => ({ value: e.id, label: e.title }))]}
            />
          ) : kind === "checklist" ? (
            <SelectField
              key={fields.checklistId.key}
              {...fromConform(fields.checklistId)}
              label="Check-off"
              hint="Your organisation's published check-offs."
              options={[{ value: "", label: choices.checklists.length ? "Choose a check-off" : "No published check-offs yet" }, ...choices.checklists.map((c) => ({ value: c.id, label: c.title }))]}
            />
          ) : (
            <SelectField
              key={fields.credentialTypeId.key}
              {...fromConform(fields.credentialTypeId)}
              label="Credential type"
              hint="How long a card counts comes from its type's validity rule."
              options={[{ value: "", label: "Choose a credential type" }, ...choices.credentialTypes.map((t) => ({ value: t.id, label: t.name }))]}
            />
          )}
          {kind === "credential" ? null : (
            <SelectField key={fields.recurrence.key} {...fromConform(fields.recurrence)} label="Recurrence" hint="When it is due again after it is met." options={RECURRENCE_OPTIONS} />
          )}
        </div>
        <div className="grid gap-x-4 md:grid-cols-3">
          <SelectField key={fields.unitId.key} {...fromConform(fields.unitId)} label="Unit" hint="Everyone who works on it." options={unitOptions(choices.units)} />
          <SelectField key={fields.role.key} {...fromConform(fields.role)} label="Role" hint="Everyone who holds it." options={ROLE_OPTIONS} />
          <TextField key={fields.graceDays.key} {...fromConform(fields.graceDays)} label="Grace period (days)" hint="0 to 365." inputMode="numeric" />
        </div>
        <div className="grid gap-x-4 md:grid-cols-[2fr_1fr]">
          <SelectField key={fields.regulatoryReferenceId.key} {...fromConform(fields.regulatoryReferenceId)} label="Regulatory reference" hint="Optional." options={referenceOptions(references)} />
          <SelectField key={fields.lapseLeaves.key} {...fromConform(fields.lapseLeaves)} label="A lapse leaves" hint="On the Clearance board." options={LAPSE_OPTIONS} />
        </div>
        <div>
          <Button type="submit">Add requirement</Button>
        </div>
      </Form>
    </section>
  );
}

function RequirementForm({ requirement: r, references, units }: { requirement: RequirementView; references: Reference[]; units: RequirementChoices["units"] }) {
  const lastResult = useActionData<typeof action>();
  const mine = resultFor(lastResult, REQUIREMENT_INTENTS.update);
  const [form, fields] = useForm({
    id: `requirement-${r.id}`,
    lastResult: (mine?.initialValue as Record<string, unknown> | null | undefined)?.requirementId === r.id ? mine : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: requirementEditSchema }),
    shouldValidate: "onSubmit",
  });
  return (
    <div className="flex flex-col gap-2 rounded-md border border-rule bg-card p-4">
      <Form method="post" {...getFormProps(form)} aria-label={`Change ${r.name}`} className="flex flex-wrap items-end gap-3">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={REQUIREMENT_INTENTS.update} />
        <input type="hidden" name="requirementId" value={r.id} />
        <p className="w-full font-semibold">
          {r.name} <span className="font-normal text-muted">({KIND[r.kind]})</span>
        </p>
        {r.kind === "credential" ? null : (
          <SelectField {...fromConform(fields.recurrence, { keepValue: false })} label="Recurrence" defaultValue={r.recurrence ?? ""} options={RECURRENCE_OPTIONS} className="flex w-48 flex-col gap-1" />
        )}
        <SelectField {...fromConform(fields.unitId, { keepValue: false })} label="Unit" defaultValue={r.unitId ?? ""} options={unitOptions(units, r.unitId)} className="flex w-52 flex-col gap-1" />
        <SelectField {...fromConform(fields.role, { keepValue: false })} label="Role" defaultValue={r.role ?? ""} options={ROLE_OPTIONS} className="flex w-40 flex-col gap-1" />
        <TextField {...fromConform(fields.graceDays, { keepValue: false })} label="Grace period (days)" defaultValue={String(r.graceDays)} inputMode="numeric" className="flex w-40 flex-col gap-1" />
        <SelectField
          {...fromConform(fields.regulatoryReferenceId, { keepValue: false })}
          label="Regulatory reference"
          defaultValue={r.reference?.id ?? ""}
          options={referenceOptions(references)}
          className="flex min-w-72 flex-1 flex-col gap-1"
        />
        <SelectField {...fromConform(fields.lapseLeaves, { keepValue: false })} label="A lapse leaves" defaultValue={r.lapseLeaves} options={LAPSE_OPTIONS} className="flex w-44 flex-col gap-1" />
        <Button type="submit" variant="secondary" className="mb-6">
          Save<span className="sr-only"> {r.name}</span>
        </Button>
      </Form>
      <AskTwice
        id={`retire-${r.id}`}
        triggerLabel={`Retire ${r.name}`}
        question={`Retire ${r.name}? It leaves everyone's plan, the Team matrix and the counts. People's history is kept — their completions, cards, waivers and extensions — and you can bring it back from the list of retired requirements.`}
        confirmLabel="Yes, retire it"
        intent={REQUIREMENT_INTENTS.retire}
        fields={{ requirementId: r.id }}
      />
    </div>
  );
}

function RetiredList({ retired }: { retired: RequirementView[] }) {
  return (
    <section aria-labelledby="retired-heading" className="mt-10 max-w-5xl">
      <h2 id="retired-heading" className="text-2xl font-semibold">
        Retired requirements
      </h2>
      <p className="mt-1 text-muted">Not in anyone's plan or on Team. Bringing one back makes it count again, with people's records as they were.</p>
      <ul className="mt-3 flex flex-col gap-2">
        {retired.map((r) => (
          <RetiredItem key={r.id} requirement={r} />
        ))}
      </ul>
    </section>
  );
}

function RetiredItem({ requirement: r }: { requirement: RequirementView }) {
  const fetcher = useFetcher<SubmissionResult<string[]>>();
  const errors = Object.values(fetcher.data?.error ?? {}).flatMap((e) => e ?? []);
  return (
    <li className="flex flex-col gap-2 rounded-md border border-rule bg-card p-3">
      <p>
        <span className="font-semibold">{r.name}</span> <span className="text-muted">({KIND[r.kind]}{r.what && r.what !== r.name ? `: ${r.what}` : ""}; {audienceOf(r)})</span>
      </p>
      <FormErrors id={`restore-${r.id}-errors`} errors={errors} />
      <fetcher.Form method="post">
        <input type="hidden" name="requirementId" value={r.id} />
        <Button type="submit" variant="secondary" name="intent" value={REQUIREMENT_INTENTS.restore} disabled={fetcher.state !== "idle"}>
          Bring back<span className="sr-only"> {r.name}</span>
        </Button>
      </fetcher.Form>
    </li>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Requirements · Team · Tidemark" }];
