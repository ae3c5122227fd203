import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData } from "react-router";
import { canWriteChecklists } from "~/auth/checkoff-policy";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { ChecklistFields } from "~/components/checkoffs/checklist-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { createChecklist, listChecklists } from "~/db/queries/checkoffs-checklists.server";
import { methodLabel } from "~/domain/checkoffs/methods";
import { checklistSchema, parseStepLines } from "./schemas";
import type { Route } from "./+types/checklists";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  return { checklists: await listChecklists(viewer.org.id), mayWrite: canWriteChecklists(viewer) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "checklists:write");
  const submission = parseWithZod(await request.formData(), { schema: checklistSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const v = submission.value;
  const id = await createChecklist(viewer, { title: v.title, skill: v.skill, method: v.method, steps: parseStepLines(v.steps), references: v.references ?? "" });
  return redirectWithToast(`/checkoffs/checklists/${id}`, `Checklist added: ${v.title}.`);
}

export default function Checklists() {
  const { checklists, mayWrite } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Checklists</h1>
      <p className="max-w-3xl text-muted">
        Skills checklists: ordered steps, some critical (a critical step not met means not competent), the method, references, and the skill
        each clears on the Clearance board. An edit after a check-off has used a version makes a new version.
      </p>
      <LedgerTable caption="Checklists of your organisation">
        <thead>
          <tr>
            <Th>Checklist</Th>
            <Th>Skill</Th>
            <Th>Method</Th>
            <Th numeric>Version</Th>
            <Th numeric>Steps</Th>
            <Th numeric>Critical</Th>
            <Th numeric>Check-offs</Th>
          </tr>
        </thead>
        <tbody>
          {checklists.map((c) => (
            <tr key={c.id}>
              <Td>
                <Link to={`/checkoffs/checklists/${c.id}`} className="inline-flex min-h-11 items-center">
                  {c.title}
                </Link>
              </Td>
              <Td>{c.skill}</Td>
              <Td>{c.method ? methodLabel(c.method) : "—"}</Td>
              <Td numeric>{c.version ?? "—"}</Td>
              <Td numeric>{c.steps}</Td>
              <Td numeric>{c.critical}</Td>
              <Td numeric>{c.uses}</Td>
            </tr>
          ))}
        </tbody>
      </LedgerTable>
      {mayWrite ? <NewChecklist /> : null}
      <CautionFooter />
    </>
  );
}

function NewChecklist() {
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "new-checklist",
    lastResult,
    constraint: getZodConstraint(checklistSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: checklistSchema }),
  });
  return (
    <section aria-labelledby="new-checklist-heading" className="max-w-3xl rounded-lg border border-rule bg-card p-4">
      <h2 id="new-checklist-heading" className="mb-3 text-2xl font-semibold">
        Add a checklist
      </h2>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-1">
        <FormErrors id={form.errorId} errors={form.errors} />
        <ChecklistFields fields={fields} />
        <div>
          <Button type="submit">Add the checklist</Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Checklists · Check-offs · Tidemark" }];
