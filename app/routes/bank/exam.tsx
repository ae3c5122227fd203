import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { ExamAssignPanel } from "~/components/bank/exam-assign-panel";
import { ExamStatusMark } from "~/components/bank/exam-status-mark";
import { ExamVersionCard } from "~/components/bank/exam-version-card";
import { CalendarDate } from "~/components/calendar-date";
import { Button, buttonClass } from "~/components/ui/button";
import { FormErrors, resultFor } from "~/components/ui/field";
import { assignChoices, assignExam, cancelAssignment, listOpenAssignments } from "~/db/queries/exam-assignments.server";
import { blueprintOf, feasibility, getExam, listExamAttempts, publishExam, retireExam } from "~/db/queries/exams-authoring.server";
import { listTopics } from "~/db/queries/bank.server";
import { calendarDateIn } from "~/domain/status/calendar-date";
import { assignFormSchema } from "./exam-form";
import type { Route } from "./+types/exam";

const INTENTS = ["publish", "retire", "assign", "cancel-assignment"] as const;
type Intent = (typeof INTENTS)[number];
const NOT_FOUND = "We could not find that exam in your organisation's bank.";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const orgId = viewer.org.id;
  const exam = await getExam(orgId, params.examId);
  if (!exam) notFound(NOT_FOUND, true);
  const [topics, latestProblems, liveProblems, open, sat, choices] = await Promise.all([
    listTopics(orgId),
    feasibility(orgId, blueprintOf(exam.latest)),
    exam.live && exam.live.id !== exam.latest.id ? feasibility(orgId, blueprintOf(exam.live)) : Promise.resolve(null),
    listOpenAssignments(orgId, exam.id),
    listExamAttempts(orgId, exam.id),
    assignChoices(orgId),
  ]);
  const view = (v: typeof exam.latest) => ({ ...v, blueprint: blueprintOf(v) });
  return {
    exam: { id: exam.id, title: exam.title, status: exam.status, createdBy: exam.createdBy },
    live: exam.live ? view(exam.live) : null,
    latest: view(exam.latest),
    versions: exam.versions.map((v) => ({ id: v.id, version: v.version, createdAt: v.createdAt, publishedAt: v.publishedAt })),
    latestProblems,
    liveProblems,
    topics,
    open,
    attempts: sat,
    choices,
    canAssign: can(viewer.roles, "assignments:write"),
    today: calendarDateIn(viewer.org.timeZone, new Date()),
    timeZone: viewer.org.timeZone,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "") as Intent;
  if (!INTENTS.includes(intent)) throw data({ message: "Unknown action." }, { status: 400 });
  // Assigning and cancelling need the assigning permission as well as the Bank's.
  if (intent === "assign" || intent === "cancel-assignment") requireViewer(context, "assignments:write");
  const orgId = viewer.org.id;
  const examId = params.examId;
  switch (intent) {
    case "publish": {
      const result = await publishExam(orgId, viewer.person.id, examId);
      if (!result.ok && result.reason === "not-found") notFound(NOT_FOUND, true);
      if (!result.ok) return refused(result.reason, intent);
      return redirectWithToast(`/bank/exams/${examId}`, result.restored ? `Published again: version ${result.version} is live.` : `Version ${result.version} published: therapists can take it once it is assigned.`);
    }
    case "retire": {
      if (form.get("confirm") !== "yes") throw data({ message: "Retiring an exam needs a confirmation." }, { status: 400 });
      const result = await retireExam(orgId, viewer.person.id, examId);
      if (!result.ok && result.reason === "not-found") notFound(NOT_FOUND, true);
      if (!result.ok) return refused(result.reason, intent);
      return redirectWithToast(`/bank/exams/${examId}`, "Exam retired: no new attempts start; past attempts and results stay.");
    }
    case "assign": {
      const today = calendarDateIn(viewer.org.timeZone, new Date());
      const submission = parseWithZod(form, { schema: assignFormSchema(today) });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await assignExam(orgId, viewer.person.id, examId, submission.value.target, submission.value.dueOn, today);
      if (!result.ok) {
        if (result.reason === "not-found") notFound(NOT_FOUND, true);
        return data(result.field ? submission.reply({ fieldErrors: { [result.field]: [result.reason] } }) : submission.reply({ formErrors: [result.reason] }), { status: 409 });
      }
      const skipped = result.skipped ? ` ${result.skipped} already held an open assignment for this exam and ${result.skipped === 1 ? "was" : "were"} skipped.` : "";
      const people = `${result.created} ${result.created === 1 ? "person" : "people"}`;
      return redirectWithToast(`/bank/exams/${examId}`, `Assigned to ${people}, due ${submission.value.dueOn}.${skipped}`);
    }
    case "cancel-assignment": {
      if (form.get("confirm") !== "yes") throw data({ message: "Cancelling an assignment needs a confirmation." }, { status: 400 });
      const result = await cancelAssignment(orgId, viewer.person.id, examId, String(form.get("assignmentId") ?? ""));
      if (!result.ok) {
        if (result.reason === "not-found") notFound("We could not find that assignment of this exam.", true);
        return refused(result.reason, intent);
      }
      return redirectWithToast(`/bank/exams/${examId}`, "Assignment cancelled. It no longer shows in that person's plan.");
    }
  }
}

/** In conform's reply shape, so an in-place confirmation (AskTwice) shows it too. */
function refused(reason: string, step: Intent) {
  return data({ step, error: { "": [reason] } }, { status: 409 });
}

function whenIn(timeZone: string) {
  const f = new Intl.DateTimeFormat("en-GB", { timeZone, dateStyle: "medium", timeStyle: "short" });
  return (d: Date | string | number) => f.format(new Date(d));
}

export default function ExamPage({ actionData }: Route.ComponentProps) {
  const { exam, live, latest, versions, latestProblems, liveProblems, topics, open, attempts, choices, canAssign, today, timeZone } = useLoaderData<typeof loader>();
  const topicName = new Map(topics.map((t) => [t.slug, t.name]));
  const when = whenIn(timeZone);
  const stepError = actionData && "step" in actionData ? actionData.error[""] : null;
  const latestIsLive = live?.id === latest.id;
  const canPublish = !latestIsLive || exam.status === "retired";
  const publishLabel = latestIsLive ? "Publish again" : live ? `Publish version ${latest.version} (replaces version ${live.version})` : `Publish version ${latest.version}`;
  return (
    <section aria-labelledby="exam-heading" className="flex flex-col gap-6">
      <p>
        <Link to="/bank/exams">← All exams</Link>
      </p>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="exam-heading" className="text-2xl font-semibold">
          {exam.title}
        </h2>
        <p className="text-lg">
          <ExamStatusMark status={exam.status} detail={live ? `version ${live.version} live` : "never published"} />
        </p>
      </div>
      {exam.createdBy ? <p className="-mt-4 text-sm text-muted">Written by {exam.createdBy}</p> : null}
      {stepError && actionData && "step" in actionData && actionData.step === "publish" ? <FormErrors id="exam-step-errors" errors={stepError} /> : null}

      <div className="flex flex-wrap items-start gap-2">
        <Link to={`/bank/exams/${exam.id}/edit`} className={buttonClass("secondary", "no-underline")}>
          Edit (makes version {latest.version + 1})
        </Link>
        <Link to={`/bank/exams/${exam.id}/cut-score`} className={buttonClass("secondary", "no-underline")}>
          Cut score
        </Link>
        {canPublish ? (
          <Form method="post">
            <Button type="submit" name="intent" value="publish">
              {publishLabel}
            </Button>
          </Form>
        ) : null}
        {exam.status === "published" ? (
          <AskTwice
            id="retire-exam"
            triggerLabel="Retire"
            question={`Retire this exam? No new attempts start. Past attempts and results keep their version${open.length ? `; its ${open.length} open ${open.length === 1 ? "assignment stays" : "assignments stay"} open until you cancel ${open.length === 1 ? "it" : "them"} below` : ""}. You can publish it again later.`}
            confirmLabel="Yes, retire it"
            intent="retire"
          />
        ) : null}
      </div>
      {canPublish && latestProblems.length > 0 ? (
        <p className="text-muted">Version {latest.version} cannot be published until the bank can fill its blueprint: see the warnings below.</p>
      ) : null}

      <div className="grid gap-6 lg:grid-cols-2">
        {live ? <ExamVersionCard heading={`Live: version ${live.version}`} v={live} topicName={topicName} problems={liveProblems ?? (latestIsLive ? latestProblems : [])} /> : null}
        {!latestIsLive ? <ExamVersionCard heading={`Latest: version ${latest.version} (draft)`} v={latest} topicName={topicName} problems={latestProblems} /> : null}
      </div>

      <LedgerTable caption="Version history" captionVisible maxHeight="max-h-80">
        <thead>
          <tr>
            <Th numeric>Version</Th>
            <Th numeric>Saved</Th>
            <Th numeric>Published</Th>
            <Th>State</Th>
          </tr>
        </thead>
        <tbody>
          {versions.map((v) => (
            <tr key={v.id}>
              <Td numeric>{v.version}</Td>
              <Td numeric className="whitespace-nowrap">
                {when(v.createdAt)}
              </Td>
              <Td numeric className="whitespace-nowrap">
                {v.publishedAt ? when(v.publishedAt) : <span className="text-muted">—</span>}
              </Td>
              <Td>{v.id === live?.id ? (exam.status === "retired" ? "Last live (retired)" : "Live") : v.publishedAt ? "Published earlier" : v.id === latest.id ? "Draft" : "Draft, not published"}</Td>
            </tr>
          ))}
        </tbody>
      </LedgerTable>

      {canAssign ? <ExamAssignPanel examPublished={exam.status === "published"} choices={choices} today={today} lastResult={actionData && !("step" in actionData) ? resultFor(actionData, "assign") : undefined} /> : null}

      <section aria-labelledby="open-heading" className="flex flex-col gap-3">
        <h3 id="open-heading" className="text-xl font-semibold">
          Open assignments ({open.length})
        </h3>
        {stepError && actionData && "step" in actionData && actionData.step === "cancel-assignment" ? <FormErrors id="cancel-errors" errors={stepError} /> : null}
        {open.length === 0 ? (
          <p className="text-muted">Nobody holds an open assignment for this exam.</p>
        ) : (
          <LedgerTable caption="Open assignments of this exam">
            <thead>
              <tr>
                <Th>Person</Th>
                <Th numeric>Due</Th>
                <Th>Assigned</Th>
                <Th>Answers requirement</Th>
                {canAssign ? <Th>Cancel</Th> : null}
              </tr>
            </thead>
            <tbody>
              {open.map((a) => (
                <tr key={a.id}>
                  <Td>{a.personName}</Td>
                  <Td numeric className="whitespace-nowrap">
                    <CalendarDate value={a.dueOn} />
                  </Td>
                  <Td className="text-sm">
                    {a.via}
                    {a.assignedBy ? <span className="block text-muted">by {a.assignedBy}</span> : null}
                  </Td>
                  <Td className="text-sm">{a.requirementName ?? <span className="text-muted">None</span>}</Td>
                  {canAssign ? (
                    <Td>
                      <AskTwice
                        id={`cancel-${a.id}`}
                        triggerLabel={`Cancel ${a.personName}'s assignment`}
                        question={`Cancel ${a.personName}'s assignment, due ${a.dueOn}? It leaves their plan.`}
                        confirmLabel="Yes, cancel it"
                        intent="cancel-assignment"
                        fields={{ assignmentId: a.id }}
                      />
                    </Td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        )}
      </section>

      <section aria-labelledby="attempts-heading" className="flex flex-col gap-3">
        <h3 id="attempts-heading" className="text-xl font-semibold">
          Attempts ({attempts.length})
        </h3>
        <p>
          <Link to={`/bank/exams/${exam.id}/analysis`}>Item analysis</Link> of the graded attempts (difficulty, discrimination, reliability) ·{" "}
          <a href={`/bank/exams/${exam.id}/analysis.csv`} download>
            CSV
          </a>{" "}
          ·{" "}
          <a href={`/bank/exams/${exam.id}/analysis.pdf`} download>
            PDF
          </a>
        </p>
        {attempts.length === 0 ? (
          <p className="text-muted">Nobody has sat this exam yet.</p>
        ) : (
          <LedgerTable caption="Attempts at this exam, newest first">
            <thead>
              <tr>
                <Th>Person</Th>
                <Th numeric>Version</Th>
                <Th numeric>Attempt</Th>
                <Th numeric>Started</Th>
                <Th>Ended</Th>
                <Th numeric>Score</Th>
                <Th>Result</Th>
              </tr>
            </thead>
            <tbody>
              {attempts.map((t) => (
                <tr key={t.id}>
                  <Td>{t.personName}</Td>
                  <Td numeric>{t.version}</Td>
                  <Td numeric>{t.attemptNumber}</Td>
                  <Td numeric className="whitespace-nowrap">
                    {when(t.startedAt)}
                  </Td>
                  <Td className="whitespace-nowrap">
                    {t.submittedAt === null ? (
                      <span className="text-muted">In progress</span>
                    ) : t.closedReason === "deadline" ? (
                      `Closed at the deadline, ${when(t.submittedAt)}`
                    ) : (
                      `Submitted ${when(t.submittedAt)}`
                    )}
                  </Td>
                  <Td numeric>{t.scorePercent === null ? <span className="text-muted">—</span> : `${Math.round(t.scorePercent * 10) / 10} %`}</Td>
                  <Td>
                    {t.submittedAt === null ? (
                      <span className="text-muted">—</span>
                    ) : (
                      <Link to={`/exams/attempts/${t.id}/result`}>{t.passed === null ? "Result" : t.passed ? "Passed" : "Not passed"}</Link>
                    )}
                  </Td>
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        )}
      </section>
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data: d }) => [{ title: `${d?.exam.title ?? "Exam"} · Bank · Tidemark` }];
