import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform } from "~/components/ui/field";
import { hasSigningPin, setSigningPin } from "~/db/queries/checkoffs-signing.server";
import { setPinSchema } from "./schemas";
import type { Route } from "./+types/signing-pin";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  return { hasPin: await hasSigningPin(viewer.org.id, viewer.person.id), name: viewer.person.name };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const submission = parseWithZod(await request.formData(), { schema: setPinSchema });
  if (submission.status !== "success") return data(submission.reply({ hideFields: ["pin", "confirm"] }), { status: 400 });
  const result = await setSigningPin(viewer, submission.value.pin);
  if (!result.ok) return data(submission.reply({ fieldErrors: { pin: [result.message] }, hideFields: ["pin", "confirm"] }), { status: result.status });
  return redirectWithToast("/checkoffs/signing-pin", "Your signing PIN is set. Keep it to yourself.");
}

export default function SigningPin() {
  const { hasPin, name } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "signing-pin",
    lastResult,
    constraint: getZodConstraint(setPinSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: setPinSchema }),
  });
  return (
    <section aria-labelledby="pin-heading" className="flex max-w-2xl flex-col gap-4">
      <h1 id="pin-heading" className="text-3xl font-semibold">
        Signing PIN
      </h1>
      <p>
        Every signature in Tidemark takes two things: who you are (your signed-in session, or your e-mail typed on a shared tablet) and
        your own signing PIN. Nobody else should know it; a signature with it carries your name, the date and time, and what it means.
      </p>
      {hasPin ? (
        <p className="rounded-md border-l-4 border-sea bg-sea-wash px-4 py-3" data-testid="pin-set">
          {name}, your signing PIN is set. If you forget it, ask your administrator to clear it, then set a new one here.
        </p>
      ) : (
        <Form method="post" {...getFormProps(form)} className="flex flex-col gap-1 rounded-lg border border-rule bg-card p-4">
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField
            key={fields.pin.key}
            {...fromConform(fields.pin, { keepValue: false })}
            type="password"
            inputMode="numeric"
            autoComplete="new-password"
            label="New signing PIN"
            hint="6 to 12 digits; not one digit repeated and not a run such as 123456."
            required
          />
          <TextField
            key={fields.confirm.key}
            {...fromConform(fields.confirm, { keepValue: false })}
            type="password"
            inputMode="numeric"
            autoComplete="new-password"
            label="The same PIN again"
            required
          />
          <div>
            <Button type="submit">Set my signing PIN</Button>
          </div>
        </Form>
      )}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Signing PIN · Check-offs · Tidemark" }];
