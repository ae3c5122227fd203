import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { viewerContext } from "~/auth/context";
import { clientKey, hitRateLimit } from "~/auth/rate-limit.server";
import { requestCode } from "~/auth/sign-in.server";
import { normaliseEmail } from "~/auth/sign-in-codes.server";
import { AuthFrame } from "~/components/auth-frame";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform } from "~/components/ui/field";
import { env } from "~/config/env.server";
import { EmailSchema } from "./schemas";
import type { Route } from "./+types/login";

/** Per address and per client, each within 15 minutes (OWASP ASVS 4.0.3 V2.2.1). */
const PER_ADDRESS = { limit: 5, windowMs: 15 * 60_000 };
const PER_CLIENT = { limit: 20, windowMs: 15 * 60_000 };

export async function loader({ request, context }: Route.LoaderArgs) {
  if (context.get(viewerContext)) throw redirect("/today");
  const url = new URL(request.url);
  return { demoMode: env().demoMode, signedOut: url.searchParams.has("signed-out") };
}

export async function action({ request }: Route.ActionArgs) {
  const formData = await request.clone().formData();
  const submission = parseWithZod(formData, { schema: EmailSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });

  const email = normaliseEmail(submission.value.email);
  const byAddress = await hitRateLimit(`code-request:address:${email}`, PER_ADDRESS);
  const byClient = await hitRateLimit(`code-request:client:${clientKey(request)}`, PER_CLIENT);
  if (!byAddress.allowed || !byClient.allowed) {
    const minutes = Math.ceil(Math.max(byAddress.retryAfterSeconds, byClient.retryAfterSeconds) / 60);
    return data(
      submission.reply({
        formErrors: [`Too many code requests. Wait ${minutes} minute${minutes === 1 ? "" : "s"} and try again.`],
      }),
      { status: 429, headers: { "Retry-After": String(minutes * 60) } },
    );
  }
  return requestCode(request);
}

export default function Login() {
  const { demoMode, signedOut } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult,
    constraint: getZodConstraint(EmailSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: EmailSchema }),
  });
  return (
    <AuthFrame title="Sign in to Tidemark" demoMode={demoMode}>
      {signedOut ? (
        <p role="status" className="mb-4 rounded-md bg-sea-wash px-4 py-3">
          You are signed out.
        </p>
      ) : null}
      <p className="mb-6 text-muted">We will e-mail you a one-time code and a sign-in link. No password to remember.</p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2">
        <FormErrors id={form.errorId} errors={form.errors} />
        <TextField
          {...fromConform(fields.email)}
          label="Work e-mail"
          type="email"
          autoComplete="email"
          inputMode="email"
          required
        />
        <Button type="submit" disabled={navigation.state === "submitting"}>
          {navigation.state === "submitting" ? "Sending…" : "Send me a code"}
        </Button>
      </Form>
    </AuthFrame>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Tidemark" }];
