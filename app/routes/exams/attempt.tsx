/**
 * Taking an exam. Each answer is sent the moment it is given, through a fetcher, to the save
 * action (/exams/attempts/:attemptId/answers); the page shows quietly whether everything is
 * saved and retries what is not. The countdown only shows the server's deadline: the server
 * refuses late answers and grades the attempt at the deadline whether or not this page is open.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { data, Form, redirect, useFetcher, useLoaderData, useNavigate, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { notFound, requireViewer } from "~/auth/gate.server";
import { AnswerControl, givenFromStored, type GivenAnswer } from "~/components/exams/answer-control";
import { Button } from "~/components/ui/button";
import { finishAttempt, ownAttempt, saveView, takingView } from "~/db/queries/exam-attempts.server";
import { database } from "~/db/client.server";
import { formatDuration, IN_FLIGHT_GRACE_S, WARNINGS_S } from "~/domain/exams";
import type { Route } from "./+types/attempt";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:exams");
  const view = await takingView({ orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone }, params.attemptId);
  if (view === null) notFound("We could not find that attempt.", true);
  if (view === "closed") throw redirect(`/exams/attempts/${params.attemptId}/result`);
  return { ...view, serverNow: new Date().toISOString() };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:exams");
  const form = await request.formData();
  const intent = form.get("intent");
  const who = { orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone };
  if (intent === "view") {
    const position = Number(form.get("position"));
    const layout = form.get("layout");
    await saveView(who, params.attemptId, {
      position: Number.isInteger(position) && position >= 0 ? position : undefined,
      layout: layout === "one" || layout === "all" ? layout : undefined,
    });
    return { ok: true };
  }
  if (intent === "submit") {
    const { db } = await database();
    if (!(await ownAttempt(db, who, params.attemptId))) notFound("We could not find that attempt.", true);
    await finishAttempt(viewer.org.id, params.attemptId, "submitted");
    return redirect(`/exams/attempts/${params.attemptId}/result`);
  }
  return data({ ok: false, message: "This request was not understood." }, { status: 400 });
}

type SaveReply = { ok: true; position: number; savedAt: string } | { ok: false; message: string; closed?: boolean; offline?: boolean; signedOut?: boolean };

/**
 * Saves go to the answers action; a lost connection or an expired session comes back as a
 * reply the page keeps and retries, never as an error page that would hide the exam.
 */
export async function clientAction({ request, params, serverAction }: Route.ClientActionArgs) {
  const form = await request.clone().formData();
  if (form.get("intent") !== "save") return serverAction();
  form.delete("intent");
  try {
    const response = await fetch(`/exams/attempts/${params.attemptId}/answers`, { method: "POST", body: form, headers: { Accept: "application/json" } });
    if (response.redirected || !(response.headers.get("Content-Type") ?? "").includes("json")) {
      return { ok: false, signedOut: true, message: "You are signed out. Sign in again (in another tab) and your answers here will be saved; the exam stays open until its deadline." } satisfies SaveReply;
    }
    return (await response.json()) as SaveReply;
  } catch {
    return { ok: false, offline: true, message: "No connection. Your answer is kept on this page and sent again when the connection is back." } satisfies SaveReply;
  }
}

export function shouldRevalidate({ formData, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  const intent = formData?.get("intent");
  if (intent === "save" || intent === "view") return false;
  return defaultShouldRevalidate;
}

type Item = ReturnType<typeof useLoaderData<typeof loader>>["items"][number];
type SaveState = "saved" | "saving" | "pending" | "refused";

export default function TakeExam() {
  const view = useLoaderData<typeof loader>();
  const { attempt, exam, items } = view;
  const navigate = useNavigate();
  const viewFetcher = useFetcher({ key: `view-${attempt.id}` });
  const [layout, setLayout] = useState<"one" | "all">(attempt.layout);
  const [current, setCurrent] = useState(Math.min(attempt.lastPosition, items.length - 1));
  const [states, setStates] = useState<Record<number, SaveState>>({});
  const [answered, setAnswered] = useState<Record<number, boolean>>(() => Object.fromEntries(items.map((i) => [i.position, i.answer !== null])));
  const [flags, setFlags] = useState<Record<number, boolean>>(() => Object.fromEntries(items.map((i) => [i.position, i.flagged])));
  const [closedMessage, setClosedMessage] = useState<string | null>(null);
  const [confirming, setConfirming] = useState(false);
  const questionHeading = useRef<HTMLHeadingElement>(null);

  const report = useCallback((position: number, state: SaveState) => setStates((s) => (s[position] === state ? s : { ...s, [position]: state })), []);
  const onClosed = useCallback((message: string) => setClosedMessage(message), []);

  const go = (position: number) => {
    setCurrent(position);
    viewFetcher.submit({ intent: "view", position: String(position) }, { method: "post" });
    requestAnimationFrame(() => questionHeading.current?.focus());
  };
  const switchLayout = (next: "one" | "all") => {
    setLayout(next);
    viewFetcher.submit({ intent: "view", layout: next }, { method: "post" });
  };

  const counts = useMemo(() => {
    const values = Object.values(states);
    return {
      saving: values.filter((s) => s === "saving").length,
      pending: values.filter((s) => s === "pending").length,
      refused: values.filter((s) => s === "refused").length,
      answered: Object.values(answered).filter(Boolean).length,
      flagged: Object.values(flags).filter(Boolean).length,
    };
  }, [states, answered, flags]);

  const timeUp = () => {
    // The server closes the attempt once the deadline and the in-flight grace have passed.
    setTimeout(() => navigate(`/exams/attempts/${attempt.id}/result`, { replace: true }), (IN_FLIGHT_GRACE_S + 1) * 1000);
  };

  const shown = layout === "one" ? items.filter((i) => i.position === current) : items;
  return (
    <section aria-labelledby="exam-title" className="flex flex-col gap-4">
      <div className="sticky top-0 z-10 -mx-4 flex flex-wrap items-center justify-between gap-3 border-b border-rule bg-paper/95 px-4 py-2">
        <div>
          <h1 id="exam-title" className="text-2xl font-semibold">
            {exam.title}
          </h1>
          <p className="text-sm text-muted">
            Attempt {attempt.attemptNumber} · {counts.answered} of {items.length} answered{counts.flagged ? ` · ${counts.flagged} flagged` : ""}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-4">
          <SavedIndicator saving={counts.saving} pending={counts.pending} refused={counts.refused} />
          <Countdown deadlineAt={attempt.deadlineAt} serverNow={view.serverNow} onTimeUp={timeUp} />
        </div>
      </div>

      {closedMessage ? (
        <div role="alert" className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
          <p>{closedMessage}</p>
          <Button className="mt-2" onClick={() => navigate(`/exams/attempts/${attempt.id}/result`)}>
            See the result
          </Button>
        </div>
      ) : null}

      <div className="flex flex-wrap items-center gap-3">
        <span className="font-semibold" id="layout-label">
          Show
        </span>
        <div role="group" aria-labelledby="layout-label" className="flex gap-2">
          <Button variant={layout === "one" ? "primary" : "secondary"} aria-pressed={layout === "one"} onClick={() => switchLayout("one")}>
            One question at a time
          </Button>
          <Button variant={layout === "all" ? "primary" : "secondary"} aria-pressed={layout === "all"} onClick={() => switchLayout("all")}>
            All on one page
          </Button>
        </div>
      </div>

      <div className="flex flex-col gap-6 lg:flex-row">
        <nav aria-label="Questions" className="lg:w-56 lg:shrink-0">
          <ol className="grid grid-cols-6 gap-2 lg:grid-cols-4">
            {items.map((i) => (
              <li key={i.position}>
                <a
                  href={`#q-${i.position}`}
                  onClick={(e) => {
                    if (layout === "one") {
                      e.preventDefault();
                      go(i.position);
                    }
                  }}
                  aria-current={layout === "one" && i.position === current ? "step" : undefined}
                  className={`flex min-h-11 flex-col items-center justify-center rounded-md border text-sm ${
                    layout === "one" && i.position === current ? "border-sea bg-sea text-white" : answered[i.position] ? "border-sea bg-sea-wash" : "border-rule bg-card"
                  }`}
                  data-testid={`nav-${i.position + 1}`}
                >
                  <span className="font-semibold">{i.position + 1}</span>
                  <span className="sr-only">{answered[i.position] ? ", answered" : ", not answered"}</span>
                  {flags[i.position] ? (
                    <span className="text-xs" aria-label="flagged for review">
                      ⚑<span className="sr-only">, flagged for review</span>
                    </span>
                  ) : null}
                </a>
              </li>
            ))}
          </ol>
          <p className="mt-2 text-xs text-muted">Filled: answered. ⚑: flagged to come back to.</p>
        </nav>

        <div className="flex flex-1 flex-col gap-6">
          {shown.map((item) => (
            <Question
              key={item.position}
              attemptId={attempt.id}
              item={item}
              total={items.length}
              headingRef={layout === "one" ? questionHeading : undefined}
              disabled={closedMessage !== null}
              onState={report}
              onAnswered={(has) => setAnswered((a) => ({ ...a, [item.position]: has }))}
              flagged={flags[item.position] ?? false}
              onFlag={(f) => setFlags((x) => ({ ...x, [item.position]: f }))}
              onClosed={onClosed}
            />
          ))}
          {layout === "one" ? (
            <div className="flex gap-3">
              <Button variant="secondary" disabled={current === 0} onClick={() => go(current - 1)}>
                Previous question
              </Button>
              <Button variant="secondary" disabled={current === items.length - 1} onClick={() => go(current + 1)}>
                Next question
              </Button>
            </div>
          ) : null}

          <HandIn
            confirming={confirming}
            setConfirming={setConfirming}
            unanswered={items.length - counts.answered}
            flagged={counts.flagged}
            unsaved={counts.pending + counts.saving}
            disabled={closedMessage !== null}
          />
        </div>
      </div>
    </section>
  );
}

function Question(props: {
  attemptId: string;
  item: Item;
  total: number;
  headingRef?: React.RefObject<HTMLHeadingElement | null>;
  disabled: boolean;
  flagged: boolean;
  onState: (position: number, state: SaveState) => void;
  onAnswered: (has: boolean) => void;
  onFlag: (flagged: boolean) => void;
  onClosed: (message: string) => void;
}) {
  const { attemptId, item, total, headingRef, disabled, flagged, onState, onAnswered, onFlag, onClosed } = props;
  const fetcher = useFetcher<SaveReply>({ key: `save-${attemptId}-${item.position}` });
  const [answer, setAnswer] = useState<GivenAnswer | null>(() => givenFromStored(item.answer));
  /** The last change not yet acknowledged by the server: resent until it is. */
  const pending = useRef<{ answer?: GivenAnswer | null; flagged?: boolean } | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const refusalId = `q-${item.position}-refusal`;

  const send = useCallback(() => {
    const change = pending.current;
    if (!change) return;
    const body: Record<string, string> = { intent: "save", position: String(item.position) };
    if (change.answer !== undefined) body.answer = change.answer === null ? "" : JSON.stringify(change.answer);
    if (change.flagged !== undefined) body.flagged = String(change.flagged);
    onState(item.position, "saving");
    fetcher.submit(body, { method: "post" });
  }, [fetcher, item.position, onState]);

  // The reply to the last save.
  useEffect(() => {
    if (fetcher.state !== "idle" || !fetcher.data) return;
    const reply = fetcher.data;
    if (reply.ok) {
      pending.current = null;
      setRefusal(null);
      onState(item.position, "saved");
    } else if (reply.closed) {
      pending.current = null;
      onState(item.position, "saved");
      onClosed(reply.message);
    } else if (reply.offline || reply.signedOut) {
      onState(item.position, "pending");
    } else {
      pending.current = null;
      setRefusal(reply.message);
      onState(item.position, "refused");
    }
  }, [fetcher.state, fetcher.data, item.position, onState, onClosed]);

  // Unsaved changes are sent again every 4 s and as soon as the browser is back online.
  useEffect(() => {
    const retry = () => {
      if (pending.current && fetcher.state === "idle") send();
    };
    const timer = setInterval(retry, 4000);
    window.addEventListener("online", retry);
    return () => {
      clearInterval(timer);
      window.removeEventListener("online", retry);
    };
  }, [fetcher.state, send]);

  const change = (next: { answer?: GivenAnswer | null; flagged?: boolean }) => {
    pending.current = { ...pending.current, ...next };
    send();
  };

  return (
    <article id={`q-${item.position}`} aria-labelledby={`q-${item.position}-heading`} className="flex scroll-mt-24 flex-col gap-4 rounded-lg border border-rule bg-card p-4" data-testid="question">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`q-${item.position}-heading`} ref={headingRef} tabIndex={-1} className="text-lg font-semibold">
          Question {item.position + 1} of {total}
        </h2>
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input
            type="checkbox"
            checked={flagged}
            disabled={disabled}
            onChange={(e) => {
              onFlag(e.target.checked);
              change({ flagged: e.target.checked });
            }}
            className="h-5 w-5"
          />
          Flag to come back to
        </label>
      </div>
      <p className="whitespace-pre-line text-lg" data-testid="stem">
        {item.presented.stem}
      </p>
      <AnswerControl
        presented={item.presented}
        answer={answer}
        name={`q-${item.position}`}
        disabled={disabled}
        describedBy={refusal ? refusalId : undefined}
        onAnswer={(next) => {
          setAnswer(next);
          onAnswered(next !== null);
          change({ answer: next });
        }}
      />
      {refusal ? (
        <p id={refusalId} role="alert" className="font-semibold text-coral">
          {refusal}
        </p>
      ) : null}
    </article>
  );
}

function SavedIndicator({ saving, pending, refused }: { saving: number; pending: number; refused: number }) {
  const text =
    pending > 0
      ? `${pending} answer${pending > 1 ? "s" : ""} not saved yet — retrying`
      : refused > 0
        ? "An answer was not accepted — see the message under it"
        : saving > 0
          ? "Saving…"
          : "All answers saved";
  return (
    <p role="status" className={`text-sm ${pending > 0 || refused > 0 ? "font-semibold text-coral" : "text-muted"}`} data-testid="saved-indicator">
      {text}
    </p>
  );
}

/**
 * The time left, from the server's deadline corrected by the server clock's offset. Display
 * only. The time is announced to screen readers at the warnings (5 and 1 minute before the end),
 * not every second.
 */
function Countdown({ deadlineAt, serverNow, onTimeUp }: { deadlineAt: string | null; serverNow: string; onTimeUp: () => void }) {
  const offset = useMemo(() => new Date(serverNow).getTime() - Date.now(), [serverNow]);
  const [left, setLeft] = useState<number | null>(() => (deadlineAt ? Math.max(0, (new Date(deadlineAt).getTime() - new Date(serverNow).getTime()) / 1000) : null));
  const [warning, setWarning] = useState("");
  const warned = useRef(new Set<number>());
  const ended = useRef(false);
  useEffect(() => {
    if (!deadlineAt) return;
    const end = new Date(deadlineAt).getTime();
    const tick = () => {
      const s = Math.max(0, (end - (Date.now() + offset)) / 1000);
      setLeft(s);
      for (const w of WARNINGS_S) {
        if (s <= w && s > 0 && !warned.current.has(w)) {
          WARNINGS_S.filter((x) => x >= w).forEach((x) => warned.current.add(x));
          setWarning(`${formatDuration(Math.ceil(s))} left. Answers saved by the end are graded.`);
        }
      }
      if (s <= 0 && !ended.current) {
        ended.current = true;
        setWarning("Time is up. Your saved answers are being graded.");
        onTimeUp();
      }
    };
    tick();
    const timer = setInterval(tick, 1000);
    return () => clearInterval(timer);
  }, [deadlineAt, offset, onTimeUp]);
  if (left === null) return <p className="text-sm font-semibold">No time limit</p>;
  const m = Math.floor(left / 60);
  const s = Math.floor(left % 60);
  return (
    <div className="flex flex-col items-end">
      <p role="timer" aria-live="off" className={`text-lg font-semibold tabular-nums ${left <= 60 ? "text-coral" : ""}`} data-testid="countdown">
        <span className="sr-only">Time left: </span>
        {String(m).padStart(2, "0")}:{String(s).padStart(2, "0")}
      </p>
      <p aria-live="assertive" className={warning ? "rounded bg-coral-wash px-2 text-sm font-semibold" : "sr-only"} data-testid="time-warning">
        {warning}
      </p>
    </div>
  );
}

function HandIn(props: { confirming: boolean; setConfirming: (c: boolean) => void; unanswered: number; flagged: number; unsaved: number; disabled: boolean }) {
  const { confirming, setConfirming, unanswered, flagged, unsaved, disabled } = props;
  const navigation = useNavigation();
  if (!confirming) {
    return (
      <div>
        <Button onClick={() => setConfirming(true)} disabled={disabled}>
          Hand in the exam
        </Button>
      </div>
    );
  }
  return (
    <div role="region" aria-labelledby="hand-in-heading" className="flex flex-col gap-2 rounded-lg border border-sea bg-sea-wash p-4">
      <h2 id="hand-in-heading" className="text-lg font-semibold">
        Hand in now?
      </h2>
      <p>
        {unanswered === 0 ? "You have answered every question." : `${unanswered} question${unanswered > 1 ? "s are" : " is"} not answered.`}
        {flagged > 0 ? ` ${flagged} ${flagged > 1 ? "are" : "is"} flagged to come back to.` : ""} Once handed in, answers cannot change.
      </p>
      {unsaved > 0 ? <p className="font-semibold text-coral">Wait a moment: {unsaved} answer{unsaved > 1 ? "s are" : " is"} still being saved.</p> : null}
      <Form method="post" className="flex gap-3">
        <input type="hidden" name="intent" value="submit" />
        <Button type="submit" disabled={disabled || unsaved > 0 || navigation.state !== "idle"}>
          Yes, hand it in
        </Button>
        <Button variant="secondary" onClick={() => setConfirming(false)}>
          Keep working
        </Button>
      </Form>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.exam.title ?? "Exam"} · Exams · Tidemark` }];
