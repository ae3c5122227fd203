import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { ItemFormFields, type ItemFields } from "~/components/bank/item-form-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { listTopics } from "~/db/queries/bank.server";
import { createItem } from "~/db/queries/bank-write.server";
import { itemFormSchema } from "./item-form";
import type { Route } from "./+types/item-new";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  return { topics: await listTopics(viewer.org.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const submission = parseWithZod(await request.formData(), { schema: itemFormSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const id = await createItem(viewer.org.id, viewer.person.id, submission.value);
  return redirectWithToast(`/bank/items/${id}`, "Draft saved as version 1. Preview it, then send it to review.");
}

export default function NewItem() {
  const { topics } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "new-item",
    lastResult,
    defaultValue: { kind: "single" },
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: itemFormSchema }),
  });
  return (
    <section aria-labelledby="new-item-heading" className="flex max-w-5xl flex-col gap-4">
      <p>
        <Link to="/bank">← All items</Link>
      </p>
      <h2 id="new-item-heading" className="text-2xl font-semibold">
        Write an item
      </h2>
      <p className="text-muted">It is saved as a draft. A second educator approves it before therapists see it.</p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <ItemFormFields fields={fields as unknown as ItemFields} topics={topics} />
        <div>
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Saving…" : "Save draft"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Write an item · Bank · Tidemark" }];
