import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { PanelSection, percentText } from "~/components/bank/angoff-panel";
import { Button } from "~/components/ui/button";
import { FormErrors, fromConform, resultFor, TextField } from "~/components/ui/field";
import { adoptPanelCut } from "~/db/queries/angoff-adopt.server";
import { angoffPage, itemDifficulties, saveRatings } from "~/db/queries/angoff.server";
import { ADOPT_INTENT, adoptedPercent, RATE_INTENT, ratingFormSchema, readPercent, type AngoffRound } from "./angoff-form";
import type { Route } from "./+types/exam-cut-score";

const NOT_FOUND = "We could not find that exam in your organisation's bank.";
const INTENTS = [RATE_INTENT, ADOPT_INTENT] as const;

function roundFrom(request: Request): AngoffRound {
  return new URL(request.url).searchParams.get("round") === "2" ? 2 : 1;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:bank");
  const page = await angoffPage(viewer.org.id, params.examId, viewer.person.id);
  if (!page) notFound(NOT_FOUND, true);
  const round = roundFrom(request);
  const canWrite = can(viewer.roles, "bank:write");
  const statistics = round === 2 && canWrite ? await itemDifficulties(viewer.org.id, params.examId) : null;
  return { ...page, round, canWrite, statistics, timeZone: viewer.org.timeZone };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  if (!(INTENTS as readonly string[]).includes(intent)) throw data({ message: "Unknown action." }, { status: 400 });
  const orgId = viewer.org.id;
  const examId = params.examId;
  if (intent === RATE_INTENT) {
    const submission = parseWithZod(form, { schema: ratingFormSchema });
    if (submission.status !== "success") return data(submission.reply(), { status: 400 });
    const result = await saveRatings(orgId, viewer.person.id, examId, submission.value);
    if (!result.ok && result.reason === "not-found") notFound(NOT_FOUND, true);
    if (!result.ok) return data(submission.reply({ formErrors: [result.message] }), { status: 409 });
    const { round } = submission.value;
    const cleared = result.cleared ? ` ${result.cleared} earlier ${result.cleared === 1 ? "rating was" : "ratings were"} cleared.` : "";
    return redirectWithToast(`/bank/exams/${examId}/cut-score?round=${round}`, `Saved ${result.rated} ${result.rated === 1 ? "rating" : "ratings"} for round ${round}.${cleared}`);
  }
  if (form.get("confirm") !== "yes") throw data({ message: "Adopting a cut score needs a confirmation." }, { status: 400 });
  const expected = readPercent(String(form.get("percent") ?? ""));
  const result = await adoptPanelCut(orgId, viewer.person.id, examId, expected === null || Number.isNaN(expected) ? null : expected);
  if (!result.ok && result.reason === "not-found") notFound(NOT_FOUND, true);
  // In conform's reply shape, so the in-place confirmation (AskTwice) shows it.
  if (!result.ok) return data({ step: ADOPT_INTENT, error: { "": [result.message] } }, { status: 409 });
  return redirectWithToast(`/bank/exams/${examId}/cut-score`, `Pass mark set to ${result.passMarkPercent} %: version ${result.version} is live.`);
}


export default function CutScorePage() {
  const page = useLoaderData<typeof loader>();
  const { exam, live, round, canWrite, final, round1, hasRound2, forms } = page;
  const adoptable = final.panel ? adoptedPercent(final.panel.cutPercent) : null;
  const when = new Intl.DateTimeFormat("en-GB", { timeZone: page.timeZone, dateStyle: "medium", timeStyle: "short" });
  return (
    <section aria-labelledby="cut-heading" className="flex max-w-5xl flex-col gap-6">
      <p>
        <Link to={`/bank/exams/${exam.id}`}>← Back to the exam</Link>
      </p>
      <h2 id="cut-heading" className="text-2xl font-semibold">
        Cut score: {exam.title}
      </h2>

      <section aria-labelledby="method-heading" className="flex flex-col gap-2">
        <h3 id="method-heading" className="text-xl font-semibold">
          How the panel sets a pass mark
        </h3>
        <p>
          This is a modified Angoff panel (Livingston and Zieky, <cite>Passing Scores</cite>, Educational Testing Service, 1982). Picture a therapist who is
          only just competent — good enough to pass, no better. For each item, each educator on the panel (a judge) estimates the chance, from 0 to 100 %,
          that such a therapist answers it correctly. A judge&apos;s cut is the sum of their estimates: the number of items that therapist would be expected
          to get right. The panel&apos;s cut is the mean of the judges&apos; cuts, and as a percent of the items it can be adopted as the pass mark.
        </p>
        <p>
          Round 1 is rated without looking at any results. In round 2 a judge may revise their estimates after looking at the item statistics; each
          round-2 rating replaces the same judge&apos;s round-1 rating of that item, and items they did not re-rate keep their round-1 rating. Only judges
          who rated every item are in the panel, because a judge&apos;s cut is a sum over every item; nothing is filled in for a missing rating.
        </p>
        <p>
          The items are those version {page.basisVersion}
          {live && live.version === page.basisVersion ? " (live)" : " (the newest draft; the exam has not been published)"} can draw: every published item
          of the topics its blueprint asks for, plus its fixed items ({page.items.length} in all).
          {page.ignoredRatings > 0 ? ` ${page.ignoredRatings} earlier ${page.ignoredRatings === 1 ? "rating is" : "ratings are"} of items the blueprint no longer draws and ${page.ignoredRatings === 1 ? "is" : "are"} not counted.` : ""}
        </p>
      </section>

      <PanelSection heading={hasRound2 ? "The panel after round 2" : "The panel"} id="final" result={final} itemCount={page.items.length} />
      {hasRound2 ? <PanelSection heading="The panel in round 1 alone" id="round1" result={round1} itemCount={page.items.length} /> : null}

      <section aria-labelledby="adopt-heading" className="flex flex-col gap-2">
        <h3 id="adopt-heading" className="text-xl font-semibold">
          Adopting the panel&apos;s cut
        </h3>
        <p>
          Current pass mark: <strong>{live ? `${live.passMarkPercent} % (version ${live.version})` : "none — the exam has not been published"}</strong>.
          {adoptable !== null ? (
            <>
              {" "}
              The panel&apos;s cut is {final.panel!.cutPercent.toFixed(2)} %, adopted rounded to one decimal: <strong>{adoptable} %</strong>.
            </>
          ) : null}
        </p>
        <p className="text-sm text-muted">
          Adopting saves a new version of the exam identical to the live one except its pass mark, and publishes it. Attempts already taken keep the pass
          mark of the version they sat.
        </p>
        {page.newerDraft !== null ? (
          <p>Version {page.newerDraft} is a saved draft newer than the live version: publish it first, then adopt the cut.</p>
        ) : null}
        {canWrite && adoptable !== null && live ? (
          <AskTwice
            id="adopt-cut"
            triggerLabel={`Adopt ${adoptable} % as the pass mark`}
            question={`Change the pass mark from ${live.passMarkPercent} % to ${adoptable} %? This publishes version ${live.version + 1} with the new pass mark; every new attempt is graded against it.`}
            confirmLabel={`Yes, adopt ${adoptable} %`}
            intent={ADOPT_INTENT}
            fields={{ percent: String(adoptable) }}
          />
        ) : null}
      </section>

      {canWrite ? <RatingForm round={round} /> : <p className="text-muted">Rating items and adopting a cut are for educators.</p>}

      <section aria-labelledby="forms-heading" className="flex flex-col gap-3">
        <h3 id="forms-heading" className="text-xl font-semibold">
          Each drawn form has its own cut
        </h3>
        <p>
          Every attempt draws its own form at random from the blueprint, so no two therapists need sit the same items, and each drawn form has its own
          Angoff cut: the panel&apos;s estimates of the items actually on it, summed per judge and averaged (Coscarelli and colleagues, 2006). Tidemark grades
          every form against the adopted pass mark, a percent; the form&apos;s own cut is shown below for the committee&apos;s judgement. A form far from the
          pass mark is a reason to look at the blueprint&apos;s balance of easy and hard items, not to change one person&apos;s result.
        </p>
        {forms.length === 0 ? (
          <p className="text-muted">Nobody has sat this exam yet.</p>
        ) : (
          <LedgerTable caption="The most recent attempts, each with its form's own Angoff cut">
            <thead>
              <tr>
                <Th numeric>Started</Th>
                <Th>Person</Th>
                <Th numeric>Version</Th>
                <Th numeric>Items</Th>
                <Th numeric>Score</Th>
                <Th numeric>Pass mark</Th>
                <Th numeric>Form&apos;s own cut</Th>
                <Th>Against the form&apos;s cut</Th>
              </tr>
            </thead>
            <tbody>
              {forms.map((f) => (
                <tr key={f.attemptId}>
                  <Td numeric className="whitespace-nowrap">
                    {when.format(new Date(f.startedAt))}
                  </Td>
                  <Td>{f.personName}</Td>
                  <Td numeric>{f.version}</Td>
                  <Td numeric>{f.items}</Td>
                  <Td numeric>{f.scorePercent === null ? <span className="text-muted">{f.submittedAt ? "—" : "In progress"}</span> : percentText(f.scorePercent)}</Td>
                  <Td numeric>{`${f.passMarkPercent} %`}</Td>
                  <Td numeric>
                    {f.cutPercent === null ? <span className="text-muted">—</span> : percentText(f.cutPercent)}
                    {f.cutPercent !== null ? (
                      <span className="block text-sm text-muted">
                        {f.judges} {f.judges === 1 ? "judge" : "judges"}
                        {f.excludedJudges ? `, ${f.excludedJudges} left out` : ""}
                      </span>
                    ) : null}
                  </Td>
                  <Td className="text-sm">
                    {f.reason ?? (f.scorePercent === null || f.cutPercent === null ? "—" : f.scorePercent >= f.cutPercent ? "At or above it" : "Below it")}
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

function RatingForm({ round }: { round: AngoffRound }) {
  const page = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const mine = page.mine;
  // Round 2 starts from the judge's round-1 ratings, so they change only what the statistics move them to.
  const start = (itemId: string) => {
    const v = round === 2 ? (mine[2][itemId] ?? mine[1][itemId]) : mine[1][itemId];
    return v === undefined ? "" : String(v);
  };
  const [form, fields] = useForm({
    id: `angoff-${page.exam.id}-round-${round}`,
    lastResult: resultFor(lastResult && !("step" in lastResult) ? lastResult : undefined, RATE_INTENT),
    defaultValue: { intent: RATE_INTENT, round: String(round), rating: Object.fromEntries(page.items.map((i) => [i.itemId, start(i.itemId)])) },
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ratingFormSchema }),
  });
  const ratingFields = fields.rating.getFieldset();
  return (
    <section aria-labelledby="rate-heading" className="flex flex-col gap-3">
      <h3 id="rate-heading" className="text-xl font-semibold">
        Your ratings
      </h3>
      <nav aria-label="Round" className="flex gap-4">
        {([1, 2] as const).map((r) => (
          <Link key={r} to={`?round=${r}`} aria-current={r === round ? "page" : undefined} className={r === round ? "font-semibold no-underline" : undefined}>
            Round {r}
            {r === 2 ? " (after the item statistics)" : ""}
          </Link>
        ))}
      </nav>
      {round === 2 ? (
        <p>
          Round 2 is rated after looking at the item statistics: open the <Link to={`/bank/exams/${page.exam.id}/analysis`}>item analysis</Link> to see how
          often each item was answered correctly.
          {page.statistics
            ? ` Beside each item below: p, the share of the ${page.statistics.examinees} examinees of version ${page.statistics.version} (first sittings) who answered it correctly.`
            : " No item statistics are shown beside the items yet (nobody's attempt has been analysed)."}{" "}
          The form starts from your round-1 ratings; change the ones you now see differently.
        </p>
      ) : (
        <p>Round 1 is rated without looking at any results.</p>
      )}
      <p className="text-sm text-muted">
        For each item: the chance, from 0 to 100 %, that a minimally competent therapist answers it correctly. Leave an item blank to leave it unrated (a
        blank clears an earlier rating of this round). Your cut counts in the panel once you have rated every item.
      </p>
      <Form method="post" {...getFormProps(form)} key={form.id} className="flex flex-col gap-3 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={RATE_INTENT} />
        <input type="hidden" name={fields.round.name} value={String(round)} />
        <div className="grid gap-x-6 sm:grid-cols-2">
          {page.items.map((item, i) => {
            const meta = ratingFields[item.itemId];
            const stat = round === 2 ? page.statistics?.byItem[item.itemId] : undefined;
            return (
              <TextField
                key={meta.key ?? item.itemId}
                {...fromConform(meta)}
                label={`Item ${i + 1} (%): ${item.stem}`}
                hint={`${item.topics.join(", ")}${item.fixed ? " · always asked" : ""}${stat ? ` · p = ${stat.p.toFixed(2)} (seen by ${stat.seenBy})` : round === 2 && page.statistics ? " · not seen in the analysed attempts" : ""}`}
                inputMode="decimal"
                autoComplete="off"
              />
            );
          })}
        </div>
        <div>
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Saving…" : `Save my round-${round} ratings`}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data: d }) => [{ title: `Cut score · ${d?.exam.title ?? "Exam"} · Bank · Tidemark` }];
