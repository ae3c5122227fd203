import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { canRequestCheckoff } from "~/auth/checkoff-policy";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { CheckoffStatusMark } from "~/components/checkoffs/checkoff-status";
import { formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, resultFor, fromConform } from "~/components/ui/field";
import { listOwnCheckoffs, listPublishedChecklists, listRecentCheckoffs, listTherapists, listToObserve, type CheckoffListRow } from "~/db/queries/checkoffs.server";
import { actorOf, requestCheckoff, startCheckoffFor } from "~/db/queries/checkoffs-write.server";
import { OUTCOME_WORDS } from "~/domain/checkoffs/record";
import { INDEX_INTENTS, requestSchema, startForSchema } from "./schemas";
import type { Route } from "./+types/index";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const orgId = viewer.org.id;
  const observes = can(viewer.roles, "checkoffs:observe");
  const reads = can(viewer.roles, "team:read") || can(viewer.roles, "checklists:write");
  const [own, toObserve, recent, checklists, therapists] = await Promise.all([
    listOwnCheckoffs(orgId, viewer.person.id),
    observes ? listToObserve(orgId, viewer.person.id) : Promise.resolve([]),
    reads ? listRecentCheckoffs(orgId) : Promise.resolve([]),
    listPublishedChecklists(orgId),
    observes ? listTherapists(orgId, viewer.person.id) : Promise.resolve([]),
  ]);
  return { own, toObserve, recent, checklists, therapists, observes, reads, mayRequest: canRequestCheckoff(actorOf(viewer)), timeZone: viewer.org.timeZone };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const formData = await request.formData();
  switch (formData.get("intent")) {
    case INDEX_INTENTS.request: {
      const submission = parseWithZod(formData, { schema: requestSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await requestCheckoff(viewer, submission.value.checklistId);
      if (!result.ok) return data(submission.reply({ formErrors: [result.message] }), { status: result.status });
      return redirectWithToast(`/checkoffs/${result.value}`, "Check-off requested. A preceptor will pick it up.");
    }
    case INDEX_INTENTS.startFor: {
      requireViewer(context, "checkoffs:observe");
      const submission = parseWithZod(formData, { schema: startForSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await startCheckoffFor(viewer, submission.value.personId, submission.value.checklistId);
      if (!result.ok) return data(submission.reply({ formErrors: [result.message] }), { status: result.status });
      return redirectWithToast(`/checkoffs/${result.value}`, "Check-off started. Each tap is saved as you go.");
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

export default function CheckoffsIndex() {
  const d = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Check-offs</h1>
      <p className="max-w-3xl text-muted">
        A check-off is one observed performance of a checklist at the bedside: each step met, not met or not applicable, an outcome, and the
        signatures of the preceptor and the therapist.
      </p>
      {d.observes ? (
        <section aria-labelledby="observe-heading" className="flex flex-col gap-3">
          <h2 id="observe-heading" className="text-2xl font-semibold">
            To observe
          </h2>
          <CheckoffTable rows={d.toObserve} caption="Check-offs asked for, and those you are observing" empty="Nobody is waiting for a check-off." timeZone={d.timeZone} />
          <StartFor d={d} />
        </section>
      ) : null}
      <section aria-labelledby="own-heading" className="flex flex-col gap-3">
        <h2 id="own-heading" className="text-2xl font-semibold">
          My check-offs
        </h2>
        <CheckoffTable rows={d.own} caption="Your check-offs, newest first" empty="You have no check-offs yet." timeZone={d.timeZone} hidePerson />
        {d.mayRequest ? <RequestForm d={d} /> : null}
      </section>
      {d.reads ? (
        <section aria-labelledby="recent-heading" className="flex flex-col gap-3">
          <h2 id="recent-heading" className="text-2xl font-semibold">
            Recent check-offs in the organisation
          </h2>
          <CheckoffTable rows={d.recent} caption="Recent check-offs of everyone" empty="No check-offs yet." timeZone={d.timeZone} />
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

function CheckoffTable({ rows, caption, empty, timeZone, hidePerson = false }: { rows: CheckoffListRow[]; caption: string; empty: string; timeZone: string; hidePerson?: boolean }) {
  if (rows.length === 0) return <p className="text-muted">{empty}</p>;
  return (
    <LedgerTable caption={caption} maxHeight="max-h-[60vh]">
      <thead>
        <tr>
          {hidePerson ? null : <Th>Therapist</Th>}
          <Th>Checklist</Th>
          <Th>Status</Th>
          <Th>Outcome</Th>
          <Th>Preceptor</Th>
          <Th>Last change</Th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id}>
            {hidePerson ? null : <Td className="font-semibold">{r.personName}</Td>}
            <Td>
              <Link to={`/checkoffs/${r.id}`} className="inline-flex min-h-11 items-center">
                {r.checklistTitle}
                {hidePerson ? null : <span className="sr-only"> — {r.personName}</span>}
              </Link>
            </Td>
            <Td>
              <CheckoffStatusMark status={r.status} />
            </Td>
            <Td>{r.outcome ? OUTCOME_WORDS[r.outcome] : <span className="text-muted">—</span>}</Td>
            <Td>{r.preceptorName ?? <span className="text-muted">—</span>}</Td>
            <Td>{formatInstantDate(r.updatedAt, timeZone)}</Td>
          </tr>
        ))}
      </tbody>
    </LedgerTable>
  );
}

type IndexData = ReturnType<typeof useLoaderData<typeof loader>>;

function RequestForm({ d }: { d: IndexData }) {
  const navigation = useNavigation();
  const last = useActionData<typeof action>() as SubmissionResult<string[]> | undefined;
  const [form, fields] = useForm({
    id: "request",
    lastResult: resultFor(last, INDEX_INTENTS.request),
    constraint: getZodConstraint(requestSchema),
    onValidate: ({ formData }) => parseWithZod(formData, { schema: requestSchema }),
  });
  return (
    <Form method="post" {...getFormProps(form)} className="flex max-w-2xl flex-col gap-1 rounded-lg border border-rule bg-card p-4">
      <h3 className="mb-2 text-xl font-semibold">Ask for a check-off</h3>
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="intent" value={INDEX_INTENTS.request} />
      <SelectField
        key={fields.checklistId.key}
        {...fromConform(fields.checklistId, { keepValue: false })}
        label="Checklist"
        options={[{ value: "", label: "Choose a checklist…" }, ...d.checklists.map((c) => ({ value: c.id, label: c.title }))]}
      />
      <div>
        <Button type="submit" disabled={navigation.state === "submitting"}>
          Ask for a check-off
        </Button>
      </div>
    </Form>
  );
}

function StartFor({ d }: { d: IndexData }) {
  const last = useActionData<typeof action>() as SubmissionResult<string[]> | undefined;
  const [form, fields] = useForm({
    id: "start-for",
    lastResult: resultFor(last, INDEX_INTENTS.startFor),
    constraint: getZodConstraint(startForSchema),
    onValidate: ({ formData }) => parseWithZod(formData, { schema: startForSchema }),
  });
  return (
    <Form method="post" {...getFormProps(form)} className="flex max-w-2xl flex-col gap-1 rounded-lg border border-rule bg-card p-4">
      <h3 className="mb-2 text-xl font-semibold">Start a check-off at the bedside</h3>
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="intent" value={INDEX_INTENTS.startFor} />
      <SelectField
        key={fields.personId.key}
        {...fromConform(fields.personId, { keepValue: false })}
        label="Therapist"
        options={[{ value: "", label: "Choose the therapist…" }, ...d.therapists.map((p) => ({ value: p.id, label: p.name }))]}
      />
      <SelectField
        key={fields.checklistId.key}
        {...fromConform(fields.checklistId, { keepValue: false })}
        label="Checklist"
        options={[{ value: "", label: "Choose a checklist…" }, ...d.checklists.map((c) => ({ value: c.id, label: c.title }))]}
      />
      <div>
        <Button type="submit">Start</Button>
      </div>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Check-offs · Tidemark" }];
