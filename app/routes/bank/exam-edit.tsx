import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { ExamFormFields, type ExamFields } from "~/components/bank/exam-form-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { blueprintOf, examFormChoices, getExam, saveExamVersion } from "~/db/queries/exams-authoring.server";
import { examFormSchema, examFormValues } from "./exam-form";
import type { Route } from "./+types/exam-edit";

const NOT_FOUND = "We could not find that exam in your organisation's bank.";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const exam = await getExam(viewer.org.id, params.examId);
  if (!exam) notFound(NOT_FOUND, true);
  const v = exam.latest;
  const values = examFormValues({
    title: exam.title,
    description: v.description,
    blueprint: blueprintOf(v),
    timeLimitMinutes: v.timeLimitMinutes,
    passMarkPercent: v.passMarkPercent,
    attemptsAllowed: v.attemptsAllowed,
    shuffleItems: v.shuffleItems,
    shuffleOptions: v.shuffleOptions,
    reviewPolicy: v.reviewPolicy,
    multipleResponseScoring: v.multipleResponseScoring,
    orderingScoring: v.orderingScoring,
    availableFrom: v.availableFrom,
    availableUntil: v.availableUntil,
  });
  const choices = await examFormChoices(viewer.org.id);
  return { exam: { id: exam.id, title: exam.title, latest: v.version, live: exam.live?.version ?? null }, values, ...choices };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const { items } = await examFormChoices(viewer.org.id);
  const submission = parseWithZod(await request.formData(), { schema: examFormSchema({ publishedItemIds: new Set(items.map((i) => i.itemId)) }) });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const result = await saveExamVersion(viewer.org.id, viewer.person.id, params.examId, submission.value);
  if (!result.ok) notFound(NOT_FOUND, true);
  return redirectWithToast(
    `/bank/exams/${params.examId}`,
    result.live === null
      ? `Saved as version ${result.version}, a draft. Publish it when it is ready.`
      : `Saved as version ${result.version}, a draft. Version ${result.live} stays live until you publish this one.`,
  );
}

export default function EditExam() {
  const { exam, values, topics, items } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: `edit-exam-${exam.id}`,
    lastResult,
    defaultValue: values,
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: examFormSchema() }),
  });
  return (
    <section aria-labelledby="edit-exam-heading" className="flex max-w-5xl flex-col gap-4">
      <p>
        <Link to={`/bank/exams/${exam.id}`}>← Back to the exam</Link>
      </p>
      <h2 id="edit-exam-heading" className="text-2xl font-semibold">
        Edit {exam.title}
      </h2>
      <p className="text-muted">
        The form starts from version {exam.latest}. Saving makes version {exam.latest + 1}, a draft; every earlier version stays exactly as it is
        {exam.live !== null ? `, and version ${exam.live} stays live until you publish the new one` : ""}.
      </p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-3 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <ExamFormFields fields={fields as unknown as ExamFields} topics={topics} items={items} />
        <div>
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Saving…" : "Save as a new version"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Edit exam · Bank · Tidemark" }];
