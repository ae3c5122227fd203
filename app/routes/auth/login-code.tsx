import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { viewerContext } from "~/auth/context";
import { clientKey, hitRateLimit } from "~/auth/rate-limit.server";
import { readPendingSignIn, redeemCode, strategyError } from "~/auth/sign-in.server";
import { AuthFrame } from "~/components/auth-frame";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform } from "~/components/ui/field";
import { env } from "~/config/env.server";
import { CodeSchema } from "./schemas";
import type { Route } from "./+types/login-code";

/** Code checks per client, on top of the per-code try limit. */
const CHECKS_PER_CLIENT = { limit: 30, windowMs: 15 * 60_000 };

export async function loader({ request, context }: Route.LoaderArgs) {
  if (context.get(viewerContext)) throw redirect("/today");
  const pending = await readPendingSignIn(request);
  return {
    demoMode: env().demoMode,
    hasPending: !!pending,
    error: strategyError(request),
    minutes: Math.max(1, Math.round(env().signInCodeTtlSeconds / 60)),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const formData = await request.clone().formData();
  const submission = parseWithZod(formData, { schema: CodeSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const limited = await hitRateLimit(`code-check:client:${clientKey(request)}`, CHECKS_PER_CLIENT);
  if (!limited.allowed) {
    return data(submission.reply({ formErrors: ["Too many tries from this device. Wait a few minutes and ask for a new code."] }), {
      status: 429,
      headers: { "Retry-After": String(limited.retryAfterSeconds) },
    });
  }
  const result = await redeemCode(request, submission.value.code);
  if (result instanceof Response) return result;
  if (result.ok) throw new Error("unreachable: a good code always ends in a redirect");
  return data(submission.reply({ fieldErrors: { code: [result.message] } }), { status: 400 });
}

export default function LoginCode() {
  const { demoMode, hasPending, error, minutes } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult,
    constraint: getZodConstraint(CodeSchema),
    shouldValidate: "onSubmit",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: CodeSchema }),
  });
  return (
    <AuthFrame title="Enter your code" demoMode={demoMode}>
      {hasPending ? (
        <p className="mb-4">
          If the address belongs to a Tidemark account, a 6-digit code is on its way. It works once, for {minutes} minute
          {minutes === 1 ? "" : "s"}. The link in the e-mail signs you in too, but only in this browser.
        </p>
      ) : (
        <p className="mb-4">
          This browser has no code request waiting. <Link to="/login">Ask for a code</Link> first.
        </p>
      )}
      {error && !lastResult ? (
        <p role="alert" className="mb-4 rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
          {error}
        </p>
      ) : null}
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2">
        <FormErrors id={form.errorId} errors={form.errors} />
        <TextField
          {...fromConform(fields.code, { keepValue: false })}
          label="6-digit code"
          autoComplete="one-time-code"
          inputMode="numeric"
          maxLength={12}
          className="flex flex-col gap-1 [&_input]:text-2xl [&_input]:tracking-[0.3em]"
          required
        />
        <Button type="submit" disabled={navigation.state === "submitting"}>
          Sign in
        </Button>
      </Form>
      <p className="mt-6 text-sm">
        <Link to="/login">Use a different address or ask for a new code</Link>
      </p>
    </AuthFrame>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Enter your code · Tidemark" }];
