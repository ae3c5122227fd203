import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { CalendarDate, formatCalendarDate, formatInstantDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { FieldFrame, FormErrors, SelectField, TextField, fromConform } from "~/components/ui/field";
import {
  listAwaitingVerification,
  listCredentialsOf,
  listCredentialTypes,
  listManagedPeople,
  mayActFor,
  personOf,
  recordCredential,
  verifyCredential,
  type CredentialRow,
  type CredentialTypeOption,
} from "~/db/queries/credentials.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { heldStatus, isIsoDate } from "~/domain/status";
import { describeRule, validThroughForType } from "~/domain/validity";
import { ReinstatementNote } from "./reinstatement-note";
import { MAX_UPLOAD_BYTES } from "~/files/file-type";
import { bodyTooLarge, fileBytes } from "~/files/store.server";
import { StatusMark } from "~/components/ui/status-mark";
import { statusDetail } from "~/components/plan-table";
import { CertificateList } from "./certificate-list";
import { listCertificatesOf } from "~/db/queries/certificates.server";
import { calendarDateIn } from "~/domain/status";
import { CREDENTIAL_INTENTS, recordCredentialSchema, VERIFICATION_METHODS, verifyCredentialSchema } from "./schemas";
import type { Route } from "./+types/index";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:credentials");
  const orgId = viewer.org.id;
  const canVerify = can(viewer.roles, "credentials:verify");
  const search = new URL(request.url).searchParams;
  const requested = search.get("person");
  const subjectId = requested && requested !== viewer.person.id ? requested : viewer.person.id;
  if (!(await mayActFor(orgId, viewer.person.id, subjectId, canVerify))) notFound("We could not find that person on your units.", true);
  const [subject, types, held, managed, awaiting, options, certificates] = await Promise.all([
    personOf(orgId, subjectId),
    listCredentialTypes(orgId),
    listCredentialsOf(orgId, subjectId),
    canVerify ? listManagedPeople(orgId, viewer.person.id) : Promise.resolve([]),
    canVerify ? listAwaitingVerification(orgId, viewer.person.id) : Promise.resolve([]),
    statusOptionsFor(orgId, viewer.org.timeZone),
    listCertificatesOf(orgId, subjectId, calendarDateIn(viewer.org.timeZone, new Date())),
  ]);
  if (!subject) notFound("We could not find that person on your units.", true);
  return {
    viewerId: viewer.person.id,
    subject,
    isSelf: subject.id === viewer.person.id,
    types,
    held: held.map((c) => ({ ...c, result: heldStatus(c.validThrough, options) })),
    managed: managed.filter((p) => p.id !== viewer.person.id).map((p) => ({ id: p.id, name: p.name })),
    awaiting,
    certificates,
    canVerify,
    preselectType: types.some((t) => t.id === search.get("type")) ? search.get("type") : null,
    today: options.today,
    reminderDays: options.reminderDays,
    timeZone: viewer.org.timeZone,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:credentials");
  // A body far past the 10 MB limit is refused before it is read (memory guard); one just past it
  // is read, so the reply can keep everything typed and say what is wrong with the scan.
  if (bodyTooLarge(request, 2.5 * MAX_UPLOAD_BYTES)) {
    return data({ status: "error" as const, initialValue: null, error: { scan: ["The scan is larger than 10 MB. Scan at a lower resolution or as a PDF, then choose it again; nothing was saved."] } }, { status: 413 });
  }
  const formData = await request.formData();
  const intent = formData.get("intent");
  if (intent === CREDENTIAL_INTENTS.record) return recordIntent(viewer, formData);
  if (intent === CREDENTIAL_INTENTS.verify) return verifyIntent(viewer, formData);
  throw data({ message: "Unknown action." }, { status: 400 });
}

type ViewerArg = ReturnType<typeof requireViewer>;

async function recordIntent(viewer: ViewerArg, formData: FormData) {
  const orgId = viewer.org.id;
  const submission = parseWithZod(formData, { schema: recordCredentialSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const v = submission.value;
  if (!(await mayActFor(orgId, viewer.person.id, v.personId, can(viewer.roles, "credentials:verify")))) notFound("We could not find that person on your units.", true);
  const [subject, types] = await Promise.all([personOf(orgId, v.personId), listCredentialTypes(orgId)]);
  const type = types.find((t) => t.id === v.credentialTypeId);
  if (!type || !subject) return data(submission.reply({ fieldErrors: { credentialTypeId: ["That credential type is not one of your organisation's. Choose one from the list."] } }), { status: 400 });
  const proposed = validThroughForType(type.terms, v.issuedOn, subject.birthMonth);
  const scan = await fileBytes(formData, "scan");
  if (scan && scan.bytes.length > MAX_UPLOAD_BYTES) {
    return data(submission.reply({ fieldErrors: { scan: ["The scan is larger than 10 MB. Scan at a lower resolution or as a PDF, then choose it again; nothing was saved."] } }), { status: 400 });
  }
  const result = await recordCredential(orgId, viewer.person.id, {
    personId: subject.id,
    credentialTypeId: type.id,
    number: v.number,
    issuer: v.issuer,
    issuedOn: v.issuedOn,
    // Left blank: the type's rule decides. Typed: the card's own date wins.
    validThrough: v.validThrough ?? proposed,
    proposedValidThrough: proposed,
    scan: scan ? { bytes: scan.bytes, name: scan.name } : null,
  });
  if (!result.ok) return data(submission.reply({ fieldErrors: { [result.field]: [`${result.message} Nothing was saved; your other entries are kept.`] } }), { status: 400 });
  const target = subject.id === viewer.person.id ? "/credentials" : `/credentials?person=${encodeURIComponent(subject.id)}`;
  return redirectWithToast(target, `${type.name} recorded${scan ? " with its scan" : ""}. A manager verifies it with the issuing body.`);
}

async function verifyIntent(viewer: ViewerArg, formData: FormData) {
  if (!can(viewer.roles, "credentials:verify")) throw data({ message: "Only a manager verifies credentials.", signedIn: true }, { status: 403 });
  const submission = parseWithZod(formData, { schema: verifyCredentialSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const outcome = await verifyCredential(viewer.org.id, viewer.person.id, submission.value.credentialId, submission.value.method);
  if (outcome === "not-found") notFound("We could not find that credential on your units.", true);
  return redirectWithToast("/credentials", "Credential verified. Your name, the time and the method are recorded.");
}

export default function Credentials() {
  const { subject, isSelf, types, held, managed, awaiting, certificates, canVerify, preselectType, today, reminderDays, timeZone } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Credentials</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Licences and cards {isSelf ? "you hold" : `${subject.name} holds`}, with the date each is valid through (inclusive, in {timeZone}). Today is{" "}
        <CalendarDate value={today} long />. “Due soon” means within {reminderDays} days.
      </p>
      {canVerify && managed.length > 0 ? <PersonPicker managed={managed} subjectId={subject.id} isSelf={isSelf} /> : null}

      <section aria-labelledby="held-heading" className="mt-8">
        <h2 id="held-heading" className="text-2xl font-semibold">
          {isSelf ? "Your credentials" : `${subject.name}’s credentials`}
        </h2>
        {held.length === 0 ? <p className="mt-2">Nothing recorded yet.</p> : <CredentialTable rows={held} timeZone={timeZone} today={today} showPerson={false} />}
      </section>

      <CertificateList rows={certificates} isSelf={isSelf} subjectName={subject.name} />

      <RecordForm key={subject.id} subject={subject} types={types} isSelf={isSelf} preselectType={preselectType} />

      {canVerify ? (
        <section aria-labelledby="verify-heading" className="mt-10">
          <h2 id="verify-heading" className="text-2xl font-semibold">
            Waiting for verification on your units
          </h2>
          <p className="mt-1 max-w-3xl text-muted">Check each with the issuing body (the primary source), then record how you checked it.</p>
          {awaiting.length === 0 ? (
            <p className="mt-2">Nothing is waiting.</p>
          ) : (
            <ul className="mt-3 flex flex-col gap-3">
              {awaiting.map((c) => (
                <li key={c.id}>
                  <VerifyForm credential={c} />
                </li>
              ))}
            </ul>
          )}
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

function PersonPicker({ managed, subjectId, isSelf }: { managed: { id: string; name: string }[]; subjectId: string; isSelf: boolean }) {
  return (
    <Form method="get" className="mt-4 flex flex-wrap items-end gap-3">
      <SelectField
        id="person"
        name="person"
        label="Whose credentials"
        defaultValue={isSelf ? "" : subjectId}
        options={[{ value: "", label: "My own" }, ...managed.map((p) => ({ value: p.id, label: p.name }))]}
        className="flex min-w-64 flex-col gap-1"
      />
      <Button type="submit" variant="secondary" className="mb-6">
        Show
      </Button>
    </Form>
  );
}

type HeldRow = CredentialRow & { result: ReturnType<typeof heldStatus> };

function CredentialTable({ rows, timeZone, today, showPerson }: { rows: HeldRow[]; timeZone: string; today: string; showPerson: boolean }) {
  return (
    <table className="mt-3 w-full border-collapse text-left">
      <caption className="sr-only">Credentials with their dates, verification and scan</caption>
      <thead>
        <tr className="border-b border-rule text-sm text-muted">
          {showPerson ? <th scope="col" className="py-2 pr-4">Person</th> : null}
          <th scope="col" className="py-2 pr-4">Credential</th>
          <th scope="col" className="py-2 pr-4">Issued</th>
          <th scope="col" className="py-2 pr-4">Valid through</th>
          <th scope="col" className="py-2 pr-4">Status</th>
          <th scope="col" className="py-2 pr-4">Verified</th>
          <th scope="col" className="py-2">Scan</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((c) => (
          <tr key={c.id} className="border-b border-rule align-top">
            {showPerson ? <td className="py-2 pr-4">{c.personName}</td> : null}
            <td className="py-2 pr-4">
              <span className="font-semibold">{c.typeName}</span>
              <span className="block text-sm text-muted">
                {[c.number ? `No. ${c.number}` : null, c.issuer].filter(Boolean).join(" · ")}
              </span>
            </td>
            <td className="py-2 pr-4">
              <CalendarDate value={c.issuedOn} />
            </td>
            <td className="py-2 pr-4">{c.validThrough ? <CalendarDate value={c.validThrough} /> : "No expiry"}</td>
            <td className="py-2 pr-4">
              <StatusMark status={c.result.status} detail={statusDetail({ result: c.result, dateMeaning: "valid-through" })} />
              <ReinstatementNote status={c.result.status} validThrough={c.validThrough} reinstatementMonths={c.reinstatementMonths} today={today} />
            </td>
            <td className="py-2 pr-4 text-sm">
              {c.verifiedAt ? (
                <>
                  {c.verifiedByName ?? "A manager"}, {formatInstantDate(c.verifiedAt, timeZone)}
                  {c.verificationMethod ? <span className="block text-muted">{c.verificationMethod}</span> : null}
                </>
              ) : (
                <span className="text-muted">Not yet verified</span>
              )}
            </td>
            <td className="py-2 text-sm">
              {c.hasScan ? (
                <a href={`/credentials/${c.id}/scan`} download>
                  Download scan<span className="sr-only"> of {c.typeName}</span>
                </a>
              ) : (
                <span className="text-muted">None</span>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function RecordForm({
  subject,
  types,
  isSelf,
  preselectType,
}: {
  subject: { id: string; name: string; birthMonth: number | null };
  types: CredentialTypeOption[];
  isSelf: boolean;
  preselectType: string | null;
}) {
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "record-credential",
    lastResult: lastResult && "error" in lastResult ? lastResult : undefined,
    constraint: getZodConstraint(recordCredentialSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: recordCredentialSchema }),
  });
  const initial = (v: unknown) => (typeof v === "string" ? v : "");
  const [typeId, setTypeId] = useState(initial(fields.credentialTypeId.initialValue) || (preselectType ?? ""));
  const [issuedOn, setIssuedOn] = useState(initial(fields.issuedOn.initialValue));
  const [validThrough, setValidThrough] = useState(initial(fields.validThrough.initialValue));
  const [edited, setEdited] = useState(initial(fields.validThrough.initialValue) !== "");
  const type = types.find((t) => t.id === typeId);
  // The same rule the server applies (app/domain/validity), so the proposal matches what is saved.
  const proposed = type && isIsoDate(issuedOn) ? validThroughForType(type.terms, issuedOn, subject.birthMonth) : undefined;
  const shown = edited ? validThrough : (proposed ?? "");
  const saving = navigation.state === "submitting" && navigation.formData?.get("intent") === CREDENTIAL_INTENTS.record;
  return (
    <section aria-labelledby="record-heading" className="mt-10 max-w-3xl">
      <h2 id="record-heading" className="text-2xl font-semibold">
        {isSelf ? "Record a card or licence" : `Record a card or licence for ${subject.name}`}
      </h2>
      <Form method="post" encType="multipart/form-data" {...getFormProps(form)} className="mt-3 flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="intent" value={CREDENTIAL_INTENTS.record} />
        <input type="hidden" name="personId" value={subject.id} />
        <SelectField
          key={fields.credentialTypeId.key}
          {...fromConform(fields.credentialTypeId)}
          defaultValue={undefined}
          value={typeId}
          onChange={(e) => setTypeId(e.target.value)}
          label="Type"
          hint={type ? `Rule: ${describeRule(type.terms)}.` : undefined}
          options={[{ value: "", label: "Choose a type" }, ...types.map((t) => ({ value: t.id, label: t.name }))]}
        />
        <div className="grid gap-x-4 sm:grid-cols-2">
          <TextField key={fields.number.key} {...fromConform(fields.number)} label="Number" autoComplete="off" />
          <TextField key={fields.issuer.key} {...fromConform(fields.issuer)} label="Issuer" hint="The board, or the training centre on the card." />
          <TextField
            key={fields.issuedOn.key}
            {...fromConform(fields.issuedOn)}
            defaultValue={undefined}
            value={issuedOn}
            onChange={(e) => setIssuedOn(e.target.value)}
            label="Issue date"
            hint="YYYY-MM-DD, as printed on the card."
            inputMode="numeric"
            autoComplete="off"
          />
          <TextField
            key={fields.validThrough.key}
            {...fromConform(fields.validThrough)}
            defaultValue={undefined}
            value={shown}
            onChange={(e) => {
              setEdited(true);
              setValidThrough(e.target.value);
            }}
            label="Valid through"
            hint={proposed ? `Proposed from the type’s rule: ${formatCalendarDate(proposed)}. Change it if the card says otherwise.` : proposed === null ? "This card never expires under the type’s rule." : "Proposed from the type’s rule once the type and issue date are filled in."}
            inputMode="numeric"
            autoComplete="off"
          />
        </div>
        <FieldFrame id="scan" label="Scan of the card (optional)" hint="PNG, JPEG or PDF, 10 MB at most. Checked by its content, not its name." errors={form.allErrors.scan}>
          {(aria) => <input {...aria} type="file" name="scan" accept="image/png,image/jpeg,application/pdf" className="py-2" />}
        </FieldFrame>
        <div>
          <Button type="submit" disabled={saving}>
            {saving ? "Saving…" : "Save credential"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

function VerifyForm({ credential }: { credential: CredentialRow }) {
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({
    id: `verify-${credential.id}`,
    lastResult: lastResult && "error" in lastResult && lastResult.initialValue && (lastResult.initialValue as Record<string, unknown>).credentialId === credential.id ? lastResult : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: verifyCredentialSchema }),
    shouldValidate: "onSubmit",
  });
  const methodId = `method-${credential.id}`;
  return (
    <Form method="post" {...getFormProps(form)} className="flex flex-wrap items-end gap-4 rounded-md border border-rule bg-card p-4" aria-label={`Verify ${credential.typeName} of ${credential.personName}`}>
      <input type="hidden" name="intent" value={CREDENTIAL_INTENTS.verify} />
      <input type="hidden" name="credentialId" value={credential.id} />
      <div className="min-w-64 flex-1">
        <p className="font-semibold">
          {credential.personName}: {credential.typeName}
        </p>
        <p className="text-sm text-muted">
          {[credential.number ? `No. ${credential.number}` : null, credential.issuer, `issued ${formatCalendarDate(credential.issuedOn)}`, credential.validThrough ? `valid through ${formatCalendarDate(credential.validThrough)}` : "no expiry"]
            .filter(Boolean)
            .join(" · ")}
          {credential.hasScan ? (
            <>
              {" · "}
              <a href={`/credentials/${credential.id}/scan`} download>
                Download scan
              </a>
            </>
          ) : null}
        </p>
      </div>
      <SelectField
        id={methodId}
        name="method"
        label="How you checked it"
        errors={fields.method.errors}
        defaultValue={VERIFICATION_METHODS[0]}
        options={VERIFICATION_METHODS.map((m) => ({ value: m, label: m }))}
        className="flex min-w-72 flex-col gap-1"
      />
      <Button type="submit" className="mb-6">
        Mark verified
      </Button>
    </Form>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Credentials · Tidemark" }];
