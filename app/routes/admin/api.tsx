import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform, resultFor } from "~/components/ui/field";
import { API_ENDPOINTS, openApiPath } from "~/api/endpoints";
import { createToken, listTokens, revokeToken } from "~/api/token.server";
import { createTokenSchema, revokeTokenSchema, TOKEN_INTENTS } from "~/api/token-form";
import { statusOptionsFor } from "~/db/queries/people.server";
import type { Route } from "./+types/api";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "api-tokens:manage");
  const tokens = await listTokens(viewer.org.id);
  const now = Date.now();
  return {
    timeZone: viewer.org.timeZone,
    tokens: tokens.map((t) => ({
      ...t,
      state: t.revokedAt ? ("revoked" as const) : t.expiresAt && t.expiresAt.getTime() <= now ? ("expired" as const) : ("active" as const),
    })),
    // The reference is drawn from the same table as /api/v1/openapi.json.
    endpoints: API_ENDPOINTS.map((e) => ({
      method: e.method.toUpperCase(),
      path: openApiPath(e.route),
      scope: e.scope,
      summary: e.summary,
      description: e.description,
      query: e.query ? Object.keys(e.query.shape) : [],
    })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "api-tokens:manage");
  const formData = await request.formData();
  switch (formData.get("intent")) {
    case TOKEN_INTENTS.create: {
      const submission = parseWithZod(formData, { schema: createTokenSchema });
      if (submission.status !== "success") return data({ result: submission.reply(), created: null }, { status: 400 });
      const { today } = await statusOptionsFor(viewer.org.id, viewer.org.timeZone);
      if (submission.value.expiresOn && submission.value.expiresOn < today) {
        return data({ result: submission.reply({ fieldErrors: { expiresOn: ["The expiry date has passed. Choose today or a later day, or leave it blank."] } }), created: null }, { status: 400 });
      }
      const made = await createToken(viewer.org.id, viewer.person.id, { name: submission.value.name, scopes: submission.value.scopes, expiresOn: submission.value.expiresOn ?? null });
      // Shown once, in this answer only: the database keeps its hash.
      return { result: submission.reply({ resetForm: true }), created: { name: submission.value.name, token: made.token, prefix: made.prefix } };
    }
    case TOKEN_INTENTS.revoke: {
      const submission = parseWithZod(formData, { schema: revokeTokenSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const outcome = await revokeToken(viewer.org.id, viewer.person.id, submission.value.tokenId);
      if (outcome === "not-found") return data(submission.reply({ formErrors: ["That token is already revoked or is not one of your organisation's."] }), { status: 404 });
      return submission.reply({ resetForm: true });
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

export default function AdminApi() {
  const { tokens, endpoints, timeZone } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const created = actionData && "created" in actionData ? actionData.created : null;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="tokens-heading" className="flex flex-col gap-4">
        <div className="flex flex-col gap-1">
          <h2 id="tokens-heading" className="text-2xl font-semibold">
            API tokens
          </h2>
          <p className="text-muted">
            A token lets another system of the hospital read this organisation's records (read) or record and change credentials (write). It is shown once when
            created; Tidemark keeps only a fingerprint of it. Revoke a token the moment it is no longer needed or may have been seen.
          </p>
        </div>
        {created ? <CreatedToken {...created} /> : null}
        {tokens.length > 0 ? (
          <LedgerTable caption="API tokens of your organisation">
            <thead>
              <tr>
                <Th>Name</Th>
                <Th>Starts with</Th>
                <Th>Scopes</Th>
                <Th>Expires</Th>
                <Th>Last used</Th>
                <Th>Created by</Th>
                <Th>State</Th>
              </tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={`${t.id}:${t.state}`}>
                  <Td className="font-semibold">{t.name}</Td>
                  <Td className="font-mono text-sm">{t.prefix}…</Td>
                  <Td>{t.scopes.join(", ")}</Td>
                  <Td>{t.expiresAt ? formatInstantDate(t.expiresAt, timeZone) : "No expiry"}</Td>
                  <Td>{t.lastUsedAt ? formatInstantDate(t.lastUsedAt, timeZone) : "Never"}</Td>
                  <Td>
                    {t.createdByName ?? "—"}, {formatInstantDate(t.createdAt, timeZone)}
                  </Td>
                  <Td>
                    {t.state === "active" ? (
                      <AskTwice
                        id={`revoke-${t.id}`}
                        triggerLabel={`Revoke ${t.name}`}
                        question={`Revoke “${t.name}” (${t.prefix}…)? Every call with it is refused from now on; this cannot be undone.`}
                        confirmLabel={`Yes, revoke ${t.name}`}
                        intent={TOKEN_INTENTS.revoke}
                        fields={{ tokenId: t.id }}
                      />
                    ) : t.state === "revoked" ? (
                      <span className="text-muted">Revoked {t.revokedAt ? formatInstantDate(t.revokedAt, timeZone) : ""}</span>
                    ) : (
                      <span className="text-muted">Expired</span>
                    )}
                  </Td>
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        ) : (
          <p>No tokens yet.</p>
        )}
        <CreateToken />
      </section>
      <section aria-labelledby="reference-heading" className="flex flex-col gap-3">
        <h2 id="reference-heading" className="text-2xl font-semibold">
          API reference
        </h2>
        <p>
          Send the token as <code className="font-mono">Authorization: Bearer &lt;token&gt;</code>, never in the address. Answers are JSON; an error is{" "}
          <code className="font-mono">{"{ error: { code, message, field? } }"}</code>. Lists return <code className="font-mono">{"{ data, nextCursor }"}</code>. At
          most 120 calls a minute per token. The machine-readable description is at{" "}
          <a className="underline" href="/api/v1/openapi.json">
            /api/v1/openapi.json
          </a>{" "}
          (OpenAPI 3.1).
        </p>
        <LedgerTable caption="Endpoints">
          <thead>
            <tr>
              <Th>Call</Th>
              <Th>Scope</Th>
              <Th>What it does</Th>
            </tr>
          </thead>
          <tbody>
            {endpoints.map((e) => (
              <tr key={`${e.method} ${e.path}`}>
                <Td className="font-mono text-sm whitespace-nowrap">
                  {e.method} {e.path}
                </Td>
                <Td>{e.scope ?? "none (public)"}</Td>
                <Td>
                  <span className="font-semibold">{e.summary}.</span> {e.description}
                  {e.query.length ? <span className="block text-sm text-muted">Query: {e.query.join(", ")}</span> : null}
                </Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      </section>
    </div>
  );
}

function CreatedToken({ name, token, prefix }: { name: string; token: string; prefix: string }) {
  return (
    <div role="status" className="flex flex-col gap-2 rounded-md border-l-4 border-sea bg-sea-wash px-4 py-3">
      <p className="font-semibold">
        Token “{name}” created ({prefix}…). Copy it now: it is shown only this once.
      </p>
      <label htmlFor="new-token" className="text-sm">
        The token
      </label>
      <input id="new-token" readOnly value={token} className="w-full rounded-md border border-muted/60 bg-card px-3 py-2 font-mono text-sm" onFocus={(e) => e.currentTarget.select()} />
    </div>
  );
}

function CreateToken() {
  const actionData = useActionData<typeof action>();
  const navigation = useNavigation();
  const lastResult = actionData && "result" in actionData ? resultFor(actionData.result, TOKEN_INTENTS.create) : undefined;
  const [form, fields] = useForm({
    id: "create-token",
    lastResult,
    constraint: getZodConstraint(createTokenSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: createTokenSchema }),
  });
  const busy = navigation.state !== "idle" && navigation.formData?.get("intent") === TOKEN_INTENTS.create;
  const scopeErrorId = `${fields.scopes.id}-error`;
  return (
    <Form method="post" {...getFormProps(form)} aria-labelledby="create-token-heading" className="flex max-w-xl flex-col gap-2 rounded-md border border-muted/30 bg-card p-4">
      <h3 id="create-token-heading" className="text-xl font-semibold">
        Create a token
      </h3>
      <FormErrors id={form.errorId} errors={form.errors} />
      <TextField key={fields.name.key} {...fromConform(fields.name)} label="Name" hint="The system that will use it, e.g. “Staffing system”." autoComplete="off" required />
      <fieldset className="flex flex-col gap-1" aria-describedby={fields.scopes.errors?.length ? scopeErrorId : undefined}>
        <legend className="font-semibold">Scopes</legend>
        <label className="flex items-center gap-2">
          <input type="checkbox" name={fields.scopes.name} value="read" defaultChecked /> read — people, units, requirements, statuses, exam results, clearances, credentials
        </label>
        <label className="flex items-center gap-2">
          <input type="checkbox" name={fields.scopes.name} value="write" /> write — record and change credentials
        </label>
        <div id={scopeErrorId} className="min-h-6 text-sm text-coral" aria-live="polite">
          {fields.scopes.errors?.join(" ")}
        </div>
      </fieldset>
      <TextField
        key={fields.expiresOn.key}
        {...fromConform(fields.expiresOn)}
        label="Expires on (optional)"
        hint="YYYY-MM-DD; the token works through that day. Leave blank for no expiry."
        inputMode="numeric"
        autoComplete="off"
      />
      <input type="hidden" name="intent" value={TOKEN_INTENTS.create} />
      <div>
        <Button type="submit" disabled={busy}>
          {busy ? "Creating…" : "Create token"}
        </Button>
      </div>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "API · Admin · Tidemark" }];

