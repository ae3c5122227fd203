import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { forbidden, notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { CalendarDate, formatCalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, TextField, resultFor } from "~/components/ui/field";
import { STATUS_WORDS, StatusMark } from "~/components/ui/status-mark";
import { personOf, verifyCredential } from "~/db/queries/credentials.server";
import { VERIFICATION_METHODS } from "~/routes/credentials/schemas";
import { statusOptionsFor } from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import { matrixScopeFor, personInScope } from "~/db/queries/team-matrix.server";
import { grantExtension, grantWaiver, revokeWaiver } from "~/db/queries/waivers.server";
import type { Evidence } from "~/domain/status/engine";
import { CELL_INTENTS, extensionSchema, revokeSchema, verifySchema, waiverSchema } from "./cell-schemas";
import type { Route } from "./+types/cell";

/** Only addresses inside Team are followed back, never one from elsewhere. */
function backTo(request: Request): string {
  const back = new URL(request.url).searchParams.get("back") ?? "";
  return back.startsWith("/team/") || back === "/team" ? back : "/team/matrix";
}

async function loadCell(viewer: ReturnType<typeof requireViewer>, personId: string, requirementId: string) {
  const scope = await matrixScopeFor(viewer.org.id, viewer.person.id, viewer.roles);
  if (!(await personInScope(viewer.org.id, scope, personId))) notFound("We could not find that person on your units.", true);
  const options = await statusOptionsFor(viewer.org.id, viewer.org.timeZone);
  const [person, rows] = await Promise.all([personOf(viewer.org.id, personId), getPlan(viewer.org.id, personId, viewer.org.timeZone, options)]);
  const row = rows?.find((r) => r.key === `requirement:${requirementId}`);
  if (!person || !row) notFound("That requirement does not apply to this person.", true);
  return { person, row, today: options.today, currentDue: currentDueOf(row) };
}

/** The last day the cell is on time now: its due date (extension included) or valid-through date, or the extension when later. */
function currentDueOf(row: { result: { date: string | null }; extendedTo: string | null }): string | null {
  const dates = [row.result.date, row.extendedTo].filter((d): d is string => d !== null).sort();
  return dates.at(-1) ?? null;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  const { person, row, today, currentDue } = await loadCell(viewer, params.personId, params.requirementId);
  return {
    person: { id: person.id, name: person.name },
    row,
    today,
    currentDue,
    back: backTo(request),
    canManage: can(viewer.roles, "team:manage"),
    canVerify: can(viewer.roles, "credentials:verify") && person.id !== viewer.person.id,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "team:manage");
  const { person, today, currentDue } = await loadCell(viewer, params.personId, params.requirementId);
  const formData = await request.formData();
  const intent = formData.get("intent");
  const back = backTo(request);
  if (intent === CELL_INTENTS.waive) {
    const submission = parseWithZod(formData, { schema: waiverSchema(today) });
    if (submission.status !== "success") return data(submission.reply(), { status: 400 });
    await grantWaiver(viewer.org.id, viewer.person.id, { personId: person.id, requirementId: params.requirementId, reason: submission.value.reason, endsOn: submission.value.endsOn });
    return redirectWithToast(back, `Waiver granted to ${person.name} through ${formatCalendarDate(submission.value.endsOn)}.`);
  }
  if (intent === CELL_INTENTS.revoke) {
    const submission = parseWithZod(formData, { schema: revokeSchema });
    if (submission.status !== "success") return data(submission.reply(), { status: 400 });
    const revoked = await revokeWaiver(viewer.org.id, viewer.person.id, { ...submission.value, personId: person.id, requirementId: params.requirementId });
    if (!revoked) notFound("That waiver is not in force for this person and requirement.", true);
    const self = new URL(request.url);
    return redirectWithToast(`${self.pathname}${self.search}`, `Waiver revoked for ${person.name}. The reason is recorded.`);
  }
  if (intent === CELL_INTENTS.extend) {
    const submission = parseWithZod(formData, { schema: extensionSchema(today, currentDue) });
    if (submission.status !== "success") return data(submission.reply(), { status: 400 });
    await grantExtension(viewer.org.id, viewer.person.id, { personId: person.id, requirementId: params.requirementId, reason: submission.value.reason, newDueOn: submission.value.newDueOn });
    return redirectWithToast(back, `Due date for ${person.name} extended to ${formatCalendarDate(submission.value.newDueOn)}.`);
  }
  if (intent === CELL_INTENTS.verify) {
    if (!can(viewer.roles, "credentials:verify")) forbidden("Only a manager verifies credentials.");
    const submission = parseWithZod(formData, { schema: verifySchema });
    if (submission.status !== "success") return data(submission.reply(), { status: 400 });
    if ((await verifyCredential(viewer.org.id, viewer.person.id, submission.value.credentialId, submission.value.method)) === "not-found") notFound("We could not find that credential.", true);
    const self = new URL(request.url);
    return redirectWithToast(`${self.pathname}${self.search}`, "Credential verified. Your name, the time and the method are recorded.");
  }
  throw data({ message: "Unknown action." }, { status: 400 });
}

export default function Cell() {
  const { person, row, back, canManage, canVerify, today, currentDue } = useLoaderData<typeof loader>();
  const credential = row.evidence?.find((e): e is Extract<Evidence, { kind: "credential" }> => e.kind === "credential");
  return (
    <>
      <p>
        <Link to={back}>← Back to the matrix</Link>
      </p>
      <h1 className="mt-2 text-3xl font-semibold">
        {person.name}: {row.title}
      </h1>
      <p className="mt-3 text-lg" data-testid="cell-status">
        <StatusMark status={row.result.status} />{" "}
        {row.result.date ? (
          <span className="text-muted">
            {row.dateMeaning === "due" ? "Due " : "Valid through "}
            <CalendarDate value={row.result.date} />
          </span>
        ) : null}
        {row.nextChangeOn && row.nextStatus ? (
          <span className="block text-base text-muted">
            {STATUS_WORDS[row.nextStatus]} from {formatCalendarDate(row.nextChangeOn)} unless something changes.
          </span>
        ) : null}
      </p>

      <section aria-labelledby="evidence-heading" className="mt-6 max-w-3xl">
        <h2 id="evidence-heading" className="text-2xl font-semibold">
          Evidence
        </h2>
        {row.evidence && row.evidence.length > 0 ? (
          <ul className="mt-2 flex flex-col gap-2">
            {row.evidence.map((e, i) => (
              <li key={i} className="rounded-md border border-rule bg-card p-3">
                <EvidenceLine evidence={e} personId={person.id} />
                {e.kind === "waiver" && canManage ? <RevokeWaiver waiverId={e.id} /> : null}
              </li>
            ))}
          </ul>
        ) : (
          <p className="mt-2">Nothing recorded yet.</p>
        )}
      </section>

      {canVerify && credential && !credential.verified ? <VerifyForm credentialId={credential.id} /> : null}
      {canManage ? (
        <div className="mt-8 grid max-w-4xl gap-6 md:grid-cols-2">
          <WaiverForm today={today} />
          <ExtensionForm today={today} currentDue={currentDue} />
        </div>
      ) : null}
      <CautionFooter />
    </>
  );
}

function EvidenceLine({ evidence: e, personId }: { evidence: Evidence; personId: string }) {
  switch (e.kind) {
    case "credential":
      return (
        <>
          <strong>{e.typeName}</strong> {e.number ? `No. ${e.number}` : ""} {e.issuer ? `· ${e.issuer}` : ""} · issued {formatCalendarDate(e.issuedOn)} ·{" "}
          {e.validThrough ? `valid through ${formatCalendarDate(e.validThrough)}` : "no expiry"} · {e.verified ? "verified" : "not yet verified"} ·{" "}
          <Link to={`/credentials?person=${personId}`}>All credentials and scans</Link>
        </>
      );
    case "completion":
      return (
        <>
          {e.of === "exam" ? "Exam passed" : "Check-off signed competent"} on {formatCalendarDate(e.completedOn)}
          {e.validThrough ? `, counts through ${formatCalendarDate(e.validThrough)}` : ""}
        </>
      );
    case "assignment":
      return <>Assigned, due {formatCalendarDate(e.dueOn)}</>;
    case "waiver":
      return (
        <>
          <strong>Waived</strong> through {formatCalendarDate(e.endsOn)} — {e.reason}
        </>
      );
    case "extension":
      return (
        <>
          <strong>Extended</strong> to {formatCalendarDate(e.newDueOn)} — {e.reason}
        </>
      );
  }
}

/** Destructive, so it asks twice in place: open, give the reason, confirm. */
function RevokeWaiver({ waiverId }: { waiverId: string }) {
  return (
    <details className="mt-2">
      <summary className="inline-flex min-h-11 cursor-pointer items-center font-semibold text-coral">Revoke this waiver…</summary>
      <Form method="post" className="mt-2 flex flex-col gap-2">
        <input type="hidden" name="intent" value={CELL_INTENTS.revoke} />
        <input type="hidden" name="waiverId" value={waiverId} />
        <TextField id={`revoke-reason-${waiverId}`} name="reason" label="Why it ends now" required minLength={3} maxLength={500} />
        <div>
          <Button type="submit" variant="danger">
            Yes, revoke the waiver
          </Button>
        </div>
      </Form>
    </details>
  );
}

function VerifyForm({ credentialId }: { credentialId: string }) {
  return (
    <Form method="post" aria-labelledby="verify-cell-heading" className="mt-6 flex max-w-3xl flex-wrap items-end gap-4 rounded-md border border-rule bg-card p-4">
      <h2 id="verify-cell-heading" className="w-full text-xl font-semibold">
        Verify with the issuing body
      </h2>
      <input type="hidden" name="intent" value={CELL_INTENTS.verify} />
      <input type="hidden" name="credentialId" value={credentialId} />
      <SelectField id="verify-method" name="method" label="How you checked it" defaultValue={VERIFICATION_METHODS[0]} options={VERIFICATION_METHODS.map((m) => ({ value: m, label: m }))} className="flex min-w-72 flex-col gap-1" />
      <Button type="submit" className="mb-6">
        Mark verified
      </Button>
    </Form>
  );
}

function WaiverForm({ today }: { today: string }) {
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "waiver",
    lastResult: resultFor(lastResult, CELL_INTENTS.waive),
    onValidate: ({ formData }) => parseWithZod(formData, { schema: waiverSchema(today) }),
    shouldValidate: "onSubmit",
  });
  return (
    <Form method="post" {...getFormProps(form)} aria-labelledby="waiver-heading" className="flex flex-col gap-2 rounded-md border border-rule bg-card p-4">
      <h2 id="waiver-heading" className="text-xl font-semibold">
        Grant a waiver
      </h2>
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="intent" value={CELL_INTENTS.waive} />
      <TextField id={fields.reason.id} name={fields.reason.name} errors={fields.reason.errors} label="Reason" />
      <TextField id={fields.endsOn.id} name={fields.endsOn.name} errors={fields.endsOn.errors} label="Waived through" hint={`YYYY-MM-DD, today or later; today is ${today}.`} inputMode="numeric" />
      <div>
        <Button type="submit">Grant waiver</Button>
      </div>
    </Form>
  );
}

function ExtensionForm({ today, currentDue }: { today: string; currentDue: string | null }) {
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: "extension",
    lastResult: resultFor(lastResult, CELL_INTENTS.extend),
    onValidate: ({ formData }) => parseWithZod(formData, { schema: extensionSchema(today, currentDue) }),
    shouldValidate: "onSubmit",
  });
  return (
    <Form method="post" {...getFormProps(form)} aria-labelledby="extension-heading" className="flex flex-col gap-2 rounded-md border border-rule bg-card p-4">
      <h2 id="extension-heading" className="text-xl font-semibold">
        Extend the due date
      </h2>
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="intent" value={CELL_INTENTS.extend} />
      <TextField id={fields.reason.id} name={fields.reason.name} errors={fields.reason.errors} label="Reason" />
      <TextField id={fields.newDueOn.id} name={fields.newDueOn.name} errors={fields.newDueOn.errors} label="New due date"
        hint={currentDue ? `YYYY-MM-DD, after the current ${currentDue}; today is ${today}.` : `YYYY-MM-DD; today is ${today}.`} inputMode="numeric" />
      <div>
        <Button type="submit" variant="secondary">
          Extend
        </Button>
      </div>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Evidence · Team · Tidemark" }];
