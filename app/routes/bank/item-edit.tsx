import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { ItemFormFields, type ItemFields } from "~/components/bank/item-form-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { getItem, getVersion, listTopics } from "~/db/queries/bank.server";
import { editItem } from "~/db/queries/bank-write.server";
import { editMode } from "~/domain/bank/lifecycle";
import { formValuesOf, itemFormSchema } from "./item-form";
import type { Route } from "./+types/item-edit";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const item = await getItem(viewer.org.id, params.itemId);
  if (!item) notFound("We could not find that item in your organisation's bank.", true);
  const version = await getVersion(viewer.org.id, item.id, item.currentVersion);
  return { item, values: formValuesOf(version!.content), mode: editMode(item.status), topics: await listTopics(viewer.org.id) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const submission = parseWithZod(await request.formData(), { schema: itemFormSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const result = await editItem(viewer.org.id, viewer.person.id, params.itemId, submission.value);
  if (!result.ok) {
    if (result.reason === "not-found") notFound("We could not find that item in your organisation's bank.", true);
    return data(submission.reply({ formErrors: [result.reason] }), { status: 409 });
  }
  return redirectWithToast(
    `/bank/items/${params.itemId}`,
    result.newVersion ? `Saved as version ${result.version}, a draft. The published version stays as it was until this one is approved.` : `Draft version ${result.version} saved.`,
  );
}

export default function EditItem() {
  const { item, values, mode, topics } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: `edit-item-${item.id}`,
    lastResult,
    defaultValue: values,
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: itemFormSchema }),
  });
  return (
    <section aria-labelledby="edit-item-heading" className="flex max-w-5xl flex-col gap-4">
      <p>
        <Link to={`/bank/items/${item.id}`}>← Back to the item</Link>
      </p>
      <h2 id="edit-item-heading" className="text-2xl font-semibold">
        Edit item (version {item.currentVersion})
      </h2>
      {mode === "frozen" ? (
        <p role="alert" className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
          This item is in review. Its reviewer must return it to draft before it changes.
        </p>
      ) : (
        <p className="text-muted">
          {mode === "new-version"
            ? `Saving makes version ${Math.max(...item.versions.map((v) => v.version)) + 1}, a draft; version ${item.currentVersion} stays exactly as it is for every exam that used it.`
            : "This draft changes in place."}
        </p>
      )}
      {mode !== "frozen" ? (
        <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
          <FormErrors id={form.errorId} errors={form.errors} />
          <ItemFormFields fields={fields as unknown as ItemFields} topics={topics} />
          <div>
            <Button type="submit" disabled={navigation.state === "submitting"}>
              {mode === "new-version" ? "Save as a new version" : "Save draft"}
            </Button>
          </div>
        </Form>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Edit item · Bank · Tidemark" }];
