import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can, ROLE_LABELS, isRole } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, TextField, fromConform } from "~/components/ui/field";
import { listReferences, listRequirements, updateRequirement, type RequirementView } from "~/db/queries/requirements.server";
import { describeRule } from "~/domain/validity";
import { requirementEditSchema } from "./requirement-schema";
import type { Route } from "./+types/requirements";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  const canEdit = can(viewer.roles, "assignments:write");
  const [requirements, references] = await Promise.all([listRequirements(viewer.org.id), canEdit ? listReferences(viewer.org.id) : Promise.resolve([])]);
  return { requirements, references: references.map((r) => ({ id: r.id, code: r.code, title: r.title })), orgName: viewer.org.name, canEdit };
}

/** Educators and managers (who assign work) set a requirement's grace period, reference and lapse consequence. */
export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "assignments:write");
  const submission = parseWithZod(await request.formData(), { schema: requirementEditSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const { requirementId, ...edit } = submission.value;
  const outcome = await updateRequirement(viewer.org.id, viewer.person.id, requirementId, edit);
  if (outcome === "not-found") notFound("We could not find that requirement.", true);
  if (outcome === "bad-reference") return data(submission.reply({ fieldErrors: { regulatoryReferenceId: ["Choose one of your organisation's references."] } }), { status: 400 });
  return redirectWithToast("/team/requirements", "Requirement saved.");
}

const RECURRENCE: Record<string, string> = { "at-hire": "At hire", "every-12-months": "Every 12 months", "every-24-months": "Every 24 months", once: "Once" };
const KIND: Record<string, string> = { exam: "Exam", checklist: "Check-off", credential: "Credential" };

export default function Requirements() {
  const { requirements, references, orgName, canEdit } = useLoaderData<typeof loader>();
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
              <td className="py-2 pr-4">
                {[r.unit ?? "Every unit", r.role && isRole(r.role) ? ROLE_LABELS[r.role] : "any role"].join(", ")}
              </td>
              <td className="py-2 pr-4">
                {r.terms ? describeRule(r.terms) : r.recurrence ? RECURRENCE[r.recurrence] : "—"}
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
        <section aria-labelledby="edit-heading" className="mt-10 max-w-4xl">
          <h2 id="edit-heading" className="text-2xl font-semibold">
            Change a requirement
          </h2>
          <p className="mt-1 text-muted">The grace period keeps a lapsing record Due soon for that many days after its valid-through date.</p>
          <div className="mt-3 flex flex-col gap-3">
            {requirements.map((r) => (
              <RequirementForm key={r.id} requirement={r} references={references} />
            ))}
          </div>
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

function RequirementForm({ requirement: r, references }: { requirement: RequirementView; references: { id: string; code: string; title: string }[] }) {
  const lastResult = useActionData<typeof action>();
  const mine = lastResult && (lastResult.initialValue as Record<string, unknown> | null)?.requirementId === r.id;
  const [form, fields] = useForm({
    id: `requirement-${r.id}`,
    lastResult: mine ? lastResult : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: requirementEditSchema }),
    shouldValidate: "onSubmit",
  });
  return (
    <Form method="post" {...getFormProps(form)} aria-label={`Change ${r.name}`} className="flex flex-wrap items-end gap-3 rounded-md border border-rule bg-card p-4">
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="requirementId" value={r.id} />
      <p className="w-full font-semibold">{r.name}</p>
      <TextField id={fields.graceDays.id} name={fields.graceDays.name} errors={fields.graceDays.errors} label="Grace period (days)" defaultValue={String(r.graceDays)} inputMode="numeric" className="flex w-40 flex-col gap-1" />
      <SelectField
        {...fromConform(fields.regulatoryReferenceId, { keepValue: false })}
        label="Regulatory reference"
        defaultValue={r.reference?.id ?? ""}
        options={[{ value: "", label: "None" }, ...references.map((x) => ({ value: x.id, label: `${x.code} — ${x.title}` }))]}
        className="flex min-w-72 flex-1 flex-col gap-1"
      />
      <SelectField
        {...fromConform(fields.lapseLeaves, { keepValue: false })}
        label="A lapse leaves"
        defaultValue={r.lapseLeaves}
        options={[
          { value: "supervised", label: "Supervised" },
          { value: "not-cleared", label: "Not cleared" },
        ]}
        className="flex w-44 flex-col gap-1"
      />
      <Button type="submit" variant="secondary" className="mb-6">
        Save<span className="sr-only"> {r.name}</span>
      </Button>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Requirements · Team · Tidemark" }];
