import { data, Form, useActionData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { can, ROLE_LABELS } from "~/auth/roles";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField } from "~/components/ui/field";
import { applyRoster, previewRoster } from "~/db/queries/roster.server";
import { markInvisible } from "~/domain/roster/invisible";
import { OPTIONAL_COLUMNS, REQUIRED_COLUMNS, ROSTER_MAX_BYTES, type RosterProblem } from "~/domain/roster/parse";
import type { FieldChange, RosterPlan } from "~/domain/roster/plan";
import { bodyTooLarge, fileBytes } from "~/files/store.server";
import type { Route } from "./+types/roster";

const ROSTER_INTENTS = { preview: "preview-roster", apply: "apply-roster" } as const;

const MAX_MB = ROSTER_MAX_BYTES / 1024 / 1024;

type Refused = { stage: "refused"; problems: RosterProblem[]; message: string };
type Previewed = { stage: "preview"; plan: RosterPlan; planSha256: string; fileSha256: string; rowCount: number; file: string; fileName: string; deactivateMissing: boolean };

export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "people:manage");
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "people:manage");
  // The apply form carries the file back as base64 (4/3 of its size): refuse anything far past that unread.
  if (bodyTooLarge(request, 2 * ROSTER_MAX_BYTES + 256 * 1024)) {
    return data(refused([{ row: null, column: null, message: `The file is larger than ${MAX_MB} MB. Split the roster into smaller files; nothing was imported.` }]), { status: 413 });
  }
  const formData = await request.formData();
  const intent = formData.get("intent");
  const deactivateMissing = formData.get("deactivateMissing") === "yes";
  const mayGrantRoles = can(viewer.roles, "roles:grant");
  if (intent === ROSTER_INTENTS.preview) {
    const file = await fileBytes(formData, "file");
    if (!file) return data(refused([{ row: null, column: null, message: "Choose the roster file (CSV) to upload." }]), { status: 400 });
    const preview = await previewRoster(viewer.org.id, viewer.person.id, { bytes: file.bytes, deactivateMissing, mayGrantRoles });
    if (!preview.ok) return data(refused(preview.problems), { status: 400 });
    return {
      stage: "preview" as const,
      plan: preview.plan,
      planSha256: preview.planSha256,
      fileSha256: preview.fileSha256,
      rowCount: preview.rowCount,
      file: Buffer.from(file.bytes).toString("base64"),
      fileName: file.name,
      deactivateMissing,
    } satisfies Previewed;
  }
  if (intent === ROSTER_INTENTS.apply) {
    const file = formData.get("file");
    const planSha256 = formData.get("planSha256");
    if (typeof file !== "string" || typeof planSha256 !== "string") {
      return data(refused([{ row: null, column: null, message: "The confirmation lost its file. Upload the roster again." }]), { status: 400 });
    }
    const bytes = new Uint8Array(Buffer.from(file, "base64"));
    const result = await applyRoster(viewer.org.id, viewer.person.id, { bytes, deactivateMissing, mayGrantRoles, planSha256 });
    if (!result.ok && result.reason === "stale") {
      return data(refused([], "People changed in Tidemark since this preview, so it no longer says what importing would do. Upload the file again to see a fresh preview; nothing was imported."), { status: 409 });
    }
    if (!result.ok) return data(refused(result.problems), { status: 400 });
    if (result.noChanges) return redirectWithToast("/admin/roster", "No changes: your people already match this roster.");
    const { created, changed, deactivated } = result.counts;
    return redirectWithToast("/admin/roster", `Roster imported: ${created} new, ${changed} changed, ${deactivated} deactivated.`);
  }
  throw data({ message: "Unknown action." }, { status: 400 });
}

function refused(problems: RosterProblem[], message?: string): Refused {
  return {
    stage: "refused",
    problems,
    message: message ?? `${problems.length === 1 ? "1 problem" : `${problems.length} problems`} in the file. Nothing was imported; correct the file and upload it again.`,
  };
}

export default function Roster() {
  const result = useActionData<typeof action>() as Refused | Previewed | undefined;
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  return (
    <section aria-labelledby="roster-heading" className="flex max-w-6xl flex-col gap-4">
      <h2 id="roster-heading" className="text-2xl font-semibold">
        Roster import
      </h2>
      <p className="text-muted">
        Upload the HR roster as a CSV file (UTF-8, at most {MAX_MB} MB). Row 1 names the columns: {REQUIRED_COLUMNS.join(", ")} (required) and{" "}
        {OPTIONAL_COLUMNS.join(", ")} (optional). People are matched by employee id. hire_date is YYYY-MM-DD; unit is a unit's short code or name; roles are separated by
        “;” and are only added, never removed; active is yes or no. You see every change first; nothing is saved until you apply it.
      </p>
      <Form method="post" encType="multipart/form-data" className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <TextField id="roster-file" name="file" type="file" accept=".csv,text/csv" label="Roster file (CSV)" hint="Exported from the HR system, one row per person." required />
        <label className="flex min-h-11 items-center gap-2">
          <input type="checkbox" name="deactivateMissing" value="yes" className="h-5 w-5" />
          Deactivate people missing from the file (those with an employee id, never admins)
        </label>
        <div>
          <Button type="submit" name="intent" value={ROSTER_INTENTS.preview} disabled={busy}>
            Preview the import
          </Button>
        </div>
      </Form>
      {result?.stage === "refused" ? <Problems result={result} /> : null}
      {result?.stage === "preview" ? <Preview result={result} busy={busy} /> : null}
    </section>
  );
}

/** Text from HR drawn safely: React escapes markup; invisible characters are marked ⟨U+200B⟩. */
function Verbatim({ value }: { value: unknown }) {
  if (value === null || value === undefined || value === "") return <span className="text-muted">(none)</span>;
  return (
    <>
      {markInvisible(String(value)).map((p, i) =>
        p.invisible ? (
          <mark key={i} className="rounded bg-coral-wash px-0.5 font-mono text-sm" title="An invisible character in the file">
            {p.text}
          </mark>
        ) : (
          <bdi key={i}>{p.text}</bdi>
        ),
      )}
    </>
  );
}

const FIELD_LABELS: Record<string, string> = { name: "Name", email: "E-mail", hireDate: "Hire date", title: "Title", homeUnitId: "Home unit", active: "Active" };

function ChangeText({ field, change }: { field: string; change: FieldChange }) {
  const show = (v: unknown) => (field === "active" ? (v ? "yes" : "no") : v);
  return (
    <span>
      {FIELD_LABELS[field] ?? field}: <Verbatim value={show(change.before)} /> → <Verbatim value={show(change.after)} />
    </span>
  );
}

function Problems({ result }: { result: Refused }) {
  return (
    <section aria-labelledby="roster-problems-heading" className="flex flex-col gap-3">
      <h3 id="roster-problems-heading" className="text-xl font-semibold">
        Not imported
      </h3>
      <FormErrors id="roster-refused" errors={[result.message]} />
      {result.problems.length > 0 ? (
        <LedgerTable caption="Problems by row and column" captionVisible maxHeight="max-h-[50vh]">
          <thead>
            <tr>
              <Th numeric>Row</Th>
              <Th>Column</Th>
              <Th>Problem</Th>
            </tr>
          </thead>
          <tbody>
            {result.problems.map((p, i) => (
              <tr key={i}>
                <Td numeric>{p.row ?? "whole file"}</Td>
                <Td>{p.column ?? "—"}</Td>
                <Td>
                  <Verbatim value={p.message} />
                </Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
    </section>
  );
}

function Preview({ result, busy }: { result: Previewed; busy: boolean }) {
  const { plan } = result;
  const total = plan.created.length + plan.changed.length + plan.deactivated.length;
  return (
    <section aria-labelledby="roster-preview-heading" className="flex flex-col gap-3">
      <h3 id="roster-preview-heading" className="text-xl font-semibold">
        Preview of {result.fileName || "the file"}: {result.rowCount} {result.rowCount === 1 ? "person" : "people"}
      </h3>
      <p role="status">
        {total === 0
          ? "No changes: your people already match this roster."
          : `${plan.created.length} new, ${plan.changed.length} changed, ${plan.deactivated.length} to deactivate, ${plan.unchanged} unchanged. Nothing is saved until you apply.`}
      </p>
      <p className="text-sm text-muted">File SHA-256: <code className="break-all">{result.fileSha256}</code></p>
      {plan.created.length > 0 ? (
        <LedgerTable caption="New people" captionVisible maxHeight="max-h-[50vh]">
          <thead>
            <tr>
              <Th numeric>Row</Th>
              <Th>Employee id</Th>
              <Th>Name</Th>
              <Th>E-mail</Th>
              <Th>Title</Th>
              <Th>Hire date</Th>
              <Th>Roles</Th>
            </tr>
          </thead>
          <tbody>
            {plan.created.map((n) => (
              <tr key={n.employeeId}>
                <Td numeric>{n.row}</Td>
                <Td><Verbatim value={n.employeeId} /></Td>
                <Td><Verbatim value={n.values.name} /></Td>
                <Td><Verbatim value={n.values.email} /></Td>
                <Td><Verbatim value={n.values.title} /></Td>
                <Td>{n.values.hireDate}</Td>
                <Td>{n.roles.map((r) => ROLE_LABELS[r]).join(", ") || "—"}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
      {plan.changed.length > 0 ? (
        <LedgerTable caption="Changed people (old → new)" captionVisible maxHeight="max-h-[50vh]">
          <thead>
            <tr>
              <Th numeric>Row</Th>
              <Th>Employee id</Th>
              <Th>Name</Th>
              <Th>Changes</Th>
            </tr>
          </thead>
          <tbody>
            {plan.changed.map((c) => (
              <tr key={c.personId}>
                <Td numeric>{c.row}</Td>
                <Td><Verbatim value={c.employeeId} /></Td>
                <Td><Verbatim value={c.name} /></Td>
                <Td>
                  <ul>
                    {Object.entries(c.changes).map(([field, change]) => (
                      <li key={field}>
                        <ChangeText field={field} change={change} />
                      </li>
                    ))}
                    {c.rolesAdded.length > 0 ? <li>Roles added: {c.rolesAdded.map((r) => ROLE_LABELS[r]).join(", ")}</li> : null}
                  </ul>
                </Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
      {plan.deactivated.length > 0 ? (
        <LedgerTable caption="To deactivate (missing from the file)" captionVisible maxHeight="max-h-[50vh]">
          <thead>
            <tr>
              <Th>Employee id</Th>
              <Th>Name</Th>
            </tr>
          </thead>
          <tbody>
            {plan.deactivated.map((d) => (
              <tr key={d.personId}>
                <Td><Verbatim value={d.employeeId} /></Td>
                <Td><Verbatim value={d.name} /></Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
      {total > 0 ? (
        <Form method="post" encType="multipart/form-data">
          <input type="hidden" name="file" value={result.file} />
          <input type="hidden" name="planSha256" value={result.planSha256} />
          {result.deactivateMissing ? <input type="hidden" name="deactivateMissing" value="yes" /> : null}
          <Button type="submit" name="intent" value={ROSTER_INTENTS.apply} disabled={busy}>
            {busy ? "Applying…" : `Apply ${total} ${total === 1 ? "change" : "changes"}`}
          </Button>
        </Form>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Roster import · Admin · Tidemark" }];
