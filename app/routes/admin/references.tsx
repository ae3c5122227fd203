import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { Button } from "~/components/ui/button";
import { FormErrors, TextAreaField, TextField, fromConform } from "~/components/ui/field";
import { listReferences, updateReference, type ReferenceRow } from "~/db/queries/requirements.server";
import { referenceSchema } from "./reference-schema";
import type { Route } from "./+types/references";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "org:settings");
  return { references: await listReferences(viewer.org.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "org:settings");
  const submission = parseWithZod(await request.formData(), { schema: referenceSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const { referenceId, ...fields } = submission.value;
  if (!(await updateReference(viewer.org.id, viewer.person.id, referenceId, fields))) notFound("We could not find that reference.", true);
  return redirectWithToast("/admin/references", `${fields.code} saved.`);
}

export default function References() {
  const { references } = useLoaderData<typeof loader>();
  return (
    <section aria-labelledby="references-heading" className="flex max-w-4xl flex-col gap-4">
      <h2 id="references-heading" className="text-2xl font-semibold">
        Regulatory references
      </h2>
      <p className="text-muted">
        The standards and rules that requirements and reports cite. Standards are renumbered from time to time: when you check one against its
        current text, update the “last verified” date.
      </p>
      {references.length === 0 ? <p>No references yet.</p> : references.map((r) => <ReferenceForm key={r.id} reference={r} />)}
    </section>
  );
}

function ReferenceForm({ reference }: { reference: ReferenceRow }) {
  const lastResult = useActionData<typeof action>();
  const mine = lastResult && (lastResult.initialValue as Record<string, unknown> | null)?.referenceId === reference.id;
  const [form, fields] = useForm({
    id: `reference-${reference.id}`,
    lastResult: mine ? lastResult : undefined,
    defaultValue: { referenceId: reference.id, code: reference.code, title: reference.title, body: reference.body, lastVerifiedOn: reference.lastVerifiedOn ?? "" },
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: referenceSchema }),
  });
  return (
    <Form method="post" {...getFormProps(form)} aria-label={`Reference ${reference.code}`} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="referenceId" value={reference.id} />
      <div className="grid gap-x-4 sm:grid-cols-2">
        <TextField key={fields.code.key} {...fromConform(fields.code)} label="Code" />
        <TextField key={fields.lastVerifiedOn.key} {...fromConform(fields.lastVerifiedOn)} label="Last verified" hint="YYYY-MM-DD" inputMode="numeric" />
      </div>
      <TextField key={fields.title.key} {...fromConform(fields.title)} label="Title" />
      <TextAreaField key={fields.body.key} {...fromConform(fields.body)} label="Text" rows={3} />
      <div>
        <Button type="submit" variant="secondary">
          Save {reference.code}
        </Button>
      </div>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Regulatory references · Admin · Tidemark" }];
