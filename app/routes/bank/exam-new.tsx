import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { ExamFormFields, type ExamFields } from "~/components/bank/exam-form-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { createExam, examFormChoices } from "~/db/queries/exams-authoring.server";
import { examFormSchema, NEW_EXAM_DEFAULTS } from "./exam-form";
import type { Route } from "./+types/exam-new";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  return examFormChoices(viewer.org.id);
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const { items } = await examFormChoices(viewer.org.id);
  const submission = parseWithZod(await request.formData(), { schema: examFormSchema({ publishedItemIds: new Set(items.map((i) => i.itemId)) }) });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const id = await createExam(viewer.org.id, viewer.person.id, submission.value);
  return redirectWithToast(`/bank/exams/${id}`, "Exam saved as a draft, version 1. Check the blueprint, then publish it.");
}

export default function NewExam() {
  const { topics, items } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "new-exam",
    lastResult,
    defaultValue: NEW_EXAM_DEFAULTS,
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: examFormSchema() }),
  });
  return (
    <section aria-labelledby="new-exam-heading" className="flex max-w-5xl flex-col gap-4">
      <p>
        <Link to="/bank/exams">← All exams</Link>
      </p>
      <h2 id="new-exam-heading" className="text-2xl font-semibold">
        Write an exam
      </h2>
      <p className="text-muted">It is saved as a draft. Therapists can take it once you publish it and assign it.</p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-3 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <ExamFormFields fields={fields as unknown as ExamFields} topics={topics} items={items} />
        <div>
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Saving…" : "Save draft"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Write an exam · Bank · Tidemark" }];
