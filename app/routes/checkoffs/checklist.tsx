import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData } from "react-router";
import { canWriteChecklists } from "~/auth/checkoff-policy";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { ChecklistFields } from "~/components/checkoffs/checklist-fields";
import { formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { getChecklist, saveChecklist } from "~/db/queries/checkoffs-checklists.server";
import { methodLabel } from "~/domain/checkoffs/methods";
import { checklistSchema, parseStepLines, stepLines } from "./schemas";
import type { Route } from "./+types/checklist";

export async function loader({ context, params }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const checklist = await getChecklist(viewer.org.id, params.checklistId);
  if (!checklist) notFound("We could not find that checklist.", true);
  return { checklist, mayWrite: canWriteChecklists(viewer), timeZone: viewer.org.timeZone };
}

export async function action({ request, context, params }: Route.ActionArgs) {
  const viewer = requireViewer(context, "checklists:write");
  const submission = parseWithZod(await request.formData(), { schema: checklistSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const v = submission.value;
  const saved = await saveChecklist(viewer, params.checklistId, { title: v.title, skill: v.skill, method: v.method, steps: parseStepLines(v.steps), references: v.references ?? "" });
  if (!saved) notFound("We could not find that checklist.", true);
  return redirectWithToast(
    `/checkoffs/checklists/${params.checklistId}`,
    saved.newVersion ? `Saved as version ${saved.version}; past check-offs keep the version they were done on.` : `Saved (version ${saved.version}, not yet used).`,
  );
}

export default function ChecklistPage() {
  const { checklist, mayWrite, timeZone } = useLoaderData<typeof loader>();
  const current = checklist.current;
  return (
    <>
      <p className="text-muted">
        <Link to="/checkoffs/checklists">Checklists</Link> › {checklist.title}
      </p>
      <h1 className="text-3xl font-semibold">{checklist.title}</h1>
      <p>
        Skill: <strong className="font-semibold">{checklist.skill}</strong>
        {current ? ` · ${methodLabel(current.method)} · version ${current.version}` : null}
      </p>
      {current ? (
        <ol className="flex max-w-3xl list-decimal flex-col gap-1 pl-6">
          {current.steps.map((s, i) => (
            <li key={i}>
              {s.text}
              {s.critical ? <strong className="font-semibold text-coral"> (critical)</strong> : null}
            </li>
          ))}
        </ol>
      ) : null}
      {current?.references ? <p className="max-w-3xl text-muted">References: {current.references}</p> : null}
      <LedgerTable caption="Versions of this checklist" captionVisible maxHeight="max-h-80">
        <thead>
          <tr>
            <Th numeric>Version</Th>
            <Th>Made</Th>
            <Th numeric>Check-offs on it</Th>
          </tr>
        </thead>
        <tbody>
          {checklist.versions.map((v) => (
            <tr key={v.id}>
              <Td numeric>{v.version}</Td>
              <Td>{formatInstantDate(v.createdAt, timeZone)}</Td>
              <Td numeric>{v.uses}</Td>
            </tr>
          ))}
        </tbody>
      </LedgerTable>
      {mayWrite && current ? <EditChecklist /> : null}
      <CautionFooter />
    </>
  );
}

function EditChecklist() {
  const { checklist } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const current = checklist.current!;
  const [form, fields] = useForm({
    id: `edit-${checklist.id}-${current.version}`,
    lastResult,
    defaultValue: { title: checklist.title, skill: checklist.skill, method: current.method, steps: stepLines(current.steps), references: current.references },
    constraint: getZodConstraint(checklistSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: checklistSchema }),
  });
  return (
    <section aria-labelledby="edit-heading" className="max-w-3xl rounded-lg border border-rule bg-card p-4">
      <h2 id="edit-heading" className="mb-3 text-2xl font-semibold">
        Edit the checklist
      </h2>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-1">
        <FormErrors id={form.errorId} errors={form.errors} />
        <ChecklistFields fields={fields} />
        <div>
          <Button type="submit">Save</Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.checklist.title ?? "Checklist"} · Checklists · Tidemark` }];
