import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { ROLE_LABELS, ROLES } from "~/auth/roles";
import { PersonFields } from "~/components/admin/person-fields";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, fromConform } from "~/components/ui/field";
import { createPerson, personChecks, unitOptions } from "~/db/queries/admin-people.server";
import { createNewPersonSchema } from "./schemas";
import type { Route } from "./+types/person-new";

const clientSchema = createNewPersonSchema();

const TAKEN = {
  email: "This address was just given to someone else. Each person signs in with their own address.",
  employeeId: "This employee id was just given to someone else in your organisation.",
} as const;

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "people:manage");
  return { units: await unitOptions(viewer.org.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "people:manage");
  const formData = await request.formData();
  const submission = await parseWithZod(formData, { schema: createNewPersonSchema(personChecks(viewer.org.id)), async: true });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  // Granting a first role is a role grant, so it needs that permission as well.
  if (submission.value.firstRole) requireViewer(context, "roles:grant");
  const result = await createPerson(viewer.org.id, viewer.person.id, submission.value);
  if (!result.ok) return data(submission.reply({ fieldErrors: { [result.field]: [TAKEN[result.field]] } }), { status: 400 });
  return redirectWithToast(`/admin/people/${result.personId}`, `${submission.value.name} is added. They can sign in with ${submission.value.email}.`);
}

export default function NewPerson() {
  const { units } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "new-person",
    lastResult,
    defaultValue: { firstRole: "therapist" },
    constraint: getZodConstraint(clientSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: clientSchema }),
  });
  const saving = navigation.state === "submitting";
  return (
    <section aria-labelledby="new-person-heading" className="flex max-w-4xl flex-col gap-4">
      <p>
        <Link to="/admin/people">← All people</Link>
      </p>
      <h2 id="new-person-heading" className="text-2xl font-semibold">
        Add a person
      </h2>
      <p className="text-muted">They sign in with a one-time code sent to their work e-mail; there is no password to hand out.</p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <PersonFields fields={fields} units={units} />
        <SelectField
          key={fields.firstRole.key}
          {...fromConform(fields.firstRole, { keepValue: false })}
          label="First role"
          hint="More roles, and a manager's units, are on the person's page."
          defaultValue={typeof fields.firstRole.initialValue === "string" ? fields.firstRole.initialValue : "none"}
          options={[{ value: "none", label: "No role yet" }, ...ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))]}
          className="flex max-w-sm flex-col gap-1"
        />
        <div>
          <Button type="submit" disabled={saving}>
            {saving ? "Adding…" : "Add person"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Add a person · Admin · Tidemark" }];
