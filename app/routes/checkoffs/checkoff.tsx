import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useLoaderData } from "react-router";
import { canAcknowledgeCheckoff, canAddAddendum, canAttachEvidence, canObserveCheckoff, canSignCheckoff, isSigned } from "~/auth/checkoff-policy";
import type { z } from "zod";
import { redirectWithToast } from "~/auth/flash.server";
import { clientKey, hitRateLimit, peekRateLimit, WRONG_PINS_PER_CLIENT } from "~/auth/rate-limit.server";
import { requireViewer } from "~/auth/gate.server";
import { CautionFooter } from "~/components/caution";
import { CheckoffStatusMark } from "~/components/checkoffs/checkoff-status";
import { SignatureBlock } from "~/components/checkoffs/signature-block";
import { StepRow } from "~/components/checkoffs/step-row";
import { CalendarDate } from "~/components/calendar-date";
import { Button, buttonClass } from "~/components/ui/button";
import { hasSigningPin, isWrongSigner, signaturesHold, acknowledgeCheckoff, addAddendum, signCheckoff } from "~/db/queries/checkoffs-signing.server";
import { actorOf, attachEvidence, markStep, setOutcome, startRequested, type WriteResult } from "~/db/queries/checkoffs-write.server";
import { bodyTooLarge, fileBytes } from "~/files/store.server";
import { methodLabel } from "~/domain/checkoffs/methods";
import { allowedOutcomes, signingProblems, tallySteps } from "~/domain/checkoffs/record";
import { calendarDateIn } from "~/domain/status/calendar-date";
import { requireVisibleCheckoff } from "./record-access.server";
import { AddendaSection, EvidenceSection, OutcomeForm, OutcomeSummary, SignForm } from "./checkoff-sections";
import { addendumSchema, CHECKOFF_INTENTS, markStepSchema, outcomeSchema, signSchema } from "./schemas";
import type { Route } from "./+types/checkoff";

export async function loader({ context, params }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const record = await requireVisibleCheckoff(viewer, params.checkoffId);
  const actor = actorOf(viewer);
  const c = record.checkoff;
  const today = calendarDateIn(viewer.org.timeZone, new Date());
  const tally = tallySteps(record.checklist.steps, record.marks);
  const holds = new Map(signaturesHold(record).map((h) => [h.signatureId, h.holds]));
  return {
    record,
    today,
    tally,
    holds: Object.fromEntries(holds),
    problems: signingProblems(record.checklist.steps, record.marks, c, today),
    outcomes: allowedOutcomes(tally),
    viewerName: viewer.person.name,
    hasPin: await hasSigningPin(viewer.org.id, viewer.person.id),
    may: {
      observe: canObserveCheckoff(actor, c),
      sign: canSignCheckoff(actor, c),
      // On their own device the therapist acknowledges; on the preceptor's tablet, the preceptor hands it over.
      acknowledgeOwn: canAcknowledgeCheckoff(actor, c),
      acknowledgeOnTablet: c.status === "signed" && c.preceptorId === viewer.person.id,
      addendum: canAddAddendum(actor, c),
      evidence: canAttachEvidence(actor, c),
    },
  };
}

function answer(result: WriteResult<unknown>, reply: (errors: string[]) => unknown) {
  if (result.ok) return null;
  return data(reply([result.message]), { status: result.status });
}

/**
 * Every form that takes a signing PIN (sign, acknowledge, addendum): the PIN is never written
 * back into the page; a device with too many wrong PINs or unknown signers is refused before
 * the PIN is tried (WRONG_PINS_PER_CLIENT), and each new wrong one is counted against it.
 */
async function withSigningPin<S extends z.ZodType<{ pin: string; email?: string | null }>>(
  request: Request,
  formData: FormData,
  schema: S,
  sign: (value: z.infer<S>) => Promise<{ result: WriteResult<unknown>; toast: string }>,
  here: string,
) {
  const submission = parseWithZod(formData, { schema });
  if (submission.status !== "success") return data(submission.reply({ hideFields: ["pin"] }), { status: 400 });
  const key = `wrong-pin:client:${clientKey(request)}`;
  const limit = await peekRateLimit(key, WRONG_PINS_PER_CLIENT);
  if (!limit.allowed) {
    const minutes = Math.ceil(limit.retryAfterSeconds / 60);
    return data(submission.reply({ formErrors: [`Too many wrong PINs from this device. Signing here is paused for ${minutes} ${minutes === 1 ? "minute" : "minutes"}.`], hideFields: ["pin"] }), {
      status: 429,
      headers: { "Retry-After": String(limit.retryAfterSeconds) },
    });
  }
  const { result, toast } = await sign(submission.value as z.infer<S>);
  if (isWrongSigner(result)) await hitRateLimit(key, WRONG_PINS_PER_CLIENT);
  return answer(result, (formErrors) => submission.reply({ formErrors, hideFields: ["pin"] })) ?? redirectWithToast(here, toast);
}

export async function action({ request, context, params }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const checkoffId = params.checkoffId;
  const here = `/checkoffs/${checkoffId}`;
  if (bodyTooLarge(request)) {
    return data({ intent: CHECKOFF_INTENTS.evidence, message: "That file is larger than 10 MB; the limit is 10 MB. Scan at a lower resolution or as a PDF." }, { status: 413 });
  }
  // Visibility first: another organisation's check-off is a 404 whatever the intent.
  await requireVisibleCheckoff(viewer, checkoffId);
  const formData = await request.formData();
  switch (formData.get("intent")) {
    case CHECKOFF_INTENTS.start: {
      const result = await startRequested(viewer, checkoffId);
      if (!result.ok) throw data({ message: result.message }, { status: result.status });
      return redirectWithToast(here, "Check-off started. Each tap is saved as you go.");
    }
    case CHECKOFF_INTENTS.mark: {
      const parsed = markStepSchema.safeParse(Object.fromEntries(formData));
      if (!parsed.success) return data({ message: parsed.error.issues[0]?.message ?? "Choose a result." }, { status: 400 });
      const result = await markStep(viewer, checkoffId, { stepIndex: parsed.data.stepIndex, result: parsed.data.result, comment: parsed.data.comment ?? null });
      return result.ok ? { message: undefined } : data({ message: result.message }, { status: result.status });
    }
    case CHECKOFF_INTENTS.outcome: {
      const submission = parseWithZod(formData, { schema: outcomeSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const v = submission.value;
      const result = await setOutcome(viewer, checkoffId, { outcome: v.outcome, practicePlan: v.practicePlan ?? null, practiceBy: v.practiceBy ?? null });
      return answer(result, (formErrors) => submission.reply({ formErrors })) ?? submission.reply({ resetForm: false });
    }
    case CHECKOFF_INTENTS.sign:
      return withSigningPin(request, formData, signSchema, async (v) => {
        const result = await signCheckoff(viewer, checkoffId, { email: v.email ?? null, pin: v.pin });
        const repeat = result.ok && result.value.repeatId ? " A repeat check-off is scheduled." : "";
        return { result, toast: `Signed.${repeat} The therapist acknowledges next.` };
      }, here);
    case CHECKOFF_INTENTS.acknowledge:
      return withSigningPin(request, formData, signSchema, async (v) => ({
        result: await acknowledgeCheckoff(viewer, checkoffId, { email: v.email ?? null, pin: v.pin }),
        toast: "Acknowledged. The record is complete.",
      }), here);
    case CHECKOFF_INTENTS.addendum:
      return withSigningPin(request, formData, addendumSchema, async (v) => ({
        result: await addAddendum(viewer, checkoffId, v.text, { email: v.email ?? null, pin: v.pin }),
        toast: "Addendum signed and added beside the record.",
      }), here);
    case CHECKOFF_INTENTS.evidence: {
      const upload = await fileBytes(formData, "file");
      const result = await attachEvidence(viewer, checkoffId, upload);
      if (!result.ok) return data({ intent: CHECKOFF_INTENTS.evidence, message: result.message }, { status: result.status });
      return redirectWithToast(here, `Evidence attached: ${upload?.name ?? "file"}.`);
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

export default function CheckoffPage() {
  const d = useLoaderData<typeof loader>();
  const { record, tally, may } = d;
  const c = record.checkoff;
  const marks = new Map(record.marks.map((m) => [m.stepIndex, m]));
  const observerSigs = record.signatures;
  return (
    <article aria-labelledby="checkoff-title" className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <p className="text-muted">
          <Link to="/checkoffs">Check-offs</Link> › {record.person.name}
        </p>
        <h1 id="checkoff-title" className="text-3xl font-semibold">
          {record.checklist.title}
        </h1>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          <dt className="text-muted">Therapist</dt>
          <dd>{record.person.name}</dd>
          <dt className="text-muted">Preceptor</dt>
          <dd>{record.preceptor?.name ?? "Not yet taken"}</dd>
          <dt className="text-muted">Status</dt>
          <dd data-testid="checkoff-status">
            <CheckoffStatusMark status={c.status} />
          </dd>
          <dt className="text-muted">Method</dt>
          <dd>
            {methodLabel(record.checklist.method)} · version {record.checklist.version} · skill “{record.checklist.skill}”
          </dd>
          {c.practiceBy && !isSigned(c) && c.status === "requested" ? (
            <>
              <dt className="text-muted">Repeat due by</dt>
              <dd>
                <CalendarDate value={c.practiceBy} />
              </dd>
            </>
          ) : null}
        </dl>
        <p className="flex flex-wrap gap-2 print:hidden">
          <Link className={buttonClass("secondary")} to={`/checkoffs/${c.id}/print`}>
            Print view
          </Link>
          <a className={buttonClass("secondary")} href={`/checkoffs/${c.id}/record.pdf`} download>
            Download PDF
          </a>
        </p>
      </header>

      {isSigned(c) ? (
        <p className="rounded-md border-l-4 border-sea bg-sea-wash px-4 py-3" role="note">
          This check-off is signed and cannot be edited. Corrections are added below as signed addenda.
        </p>
      ) : null}

      {c.status === "requested" && may.observe ? (
        <Form method="post" className="rounded-md border border-rule bg-card p-4">
          <p className="mb-2">{record.person.name} asked for this check-off. Start when you are at the bedside; each tap is saved.</p>
          <Button type="submit" name="intent" value={CHECKOFF_INTENTS.start}>
            Start the check-off
          </Button>
        </Form>
      ) : null}

      <section aria-labelledby="steps-heading" className="flex flex-col gap-3">
        <h2 id="steps-heading" className="text-2xl font-semibold">
          Steps
        </h2>
        <p aria-live="polite" data-testid="progress">
          {tally.marked} of {tally.total} steps marked · {tally.met} met · {tally.notMet} not met · {tally.notApplicable} not applicable
          {tally.criticalNotMet.length > 0 ? <strong className="ml-1 font-semibold text-coral">· a critical step was not met</strong> : null}
        </p>
        <ol className="flex flex-col gap-3">
          {record.checklist.steps.map((step, i) => (
            <StepRow
              // Keyed by the saved mark, so a reload or another device's change redraws the comment.
              key={`${i}:${marks.get(i)?.result ?? ""}:${marks.get(i)?.comment ?? ""}`}
              index={i}
              step={step}
              mark={marks.get(i)}
              editable={may.observe}
              intent={CHECKOFF_INTENTS.mark}
            />
          ))}
        </ol>
      </section>

      {may.observe ? <OutcomeForm d={d} /> : <OutcomeSummary d={d} />}

      <section aria-labelledby="signatures-heading" className="flex flex-col gap-3">
        <h2 id="signatures-heading" className="text-2xl font-semibold">
          Signatures
        </h2>
        {observerSigs.length === 0 ? <p className="text-muted">Not signed yet.</p> : null}
        {observerSigs.map((s) => (
          <SignatureBlock key={s.id} signature={s} holds={d.holds[s.id]} />
        ))}
        {may.sign ? (
          <SignForm
            d={d}
            intent={CHECKOFF_INTENTS.sign}
            heading="Sign as the observer"
            submitLabel="Sign the check-off"
            emailHint={`Leave empty to sign as yourself (${d.viewerName}). On a shared tablet, the preceptor who observed types their own e-mail.`}
            disabled={d.problems.length > 0}
          />
        ) : null}
        {may.acknowledgeOwn || may.acknowledgeOnTablet ? (
          <SignForm
            d={d}
            intent={CHECKOFF_INTENTS.acknowledge}
            heading="Therapist's acknowledgement"
            submitLabel="Acknowledge"
            emailHint={
              may.acknowledgeOwn
                ? "Leave empty to acknowledge as yourself."
                : `Hand the tablet to ${record.person.name}: they type their own e-mail and signing PIN.`
            }
            emailRequired={!may.acknowledgeOwn}
          />
        ) : null}
      </section>

      <AddendaSection d={d} />
      <EvidenceSection d={d} />
      <CautionFooter />
    </article>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.record.checklist.title ?? "Check-off"} · Check-offs · Tidemark` }];
