import { data, Form, Link, useActionData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField } from "~/components/ui/field";
import { importItems } from "~/db/queries/bank-write.server";
import { detectFormat, MAX_IMPORT_BYTES, parseImport, parseJsonImport, type RowError } from "~/domain/bank/interchange";
import type { ItemContent } from "~/domain/bank/item-content";
import type { Route } from "./+types/import";

const INTENTS = { check: "check-file", importValid: "import-valid" } as const;

type CheckResult = {
  stage: "checked";
  fileName: string;
  total: number;
  valid: number;
  errors: RowError[];
  /** The valid rows, re-sent (and re-checked) if the educator chooses to import them. */
  payload: string;
};
type FileProblem = { stage: "refused"; message: string };

export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "bank:write");
  return { maxBytes: MAX_IMPORT_BYTES };
}

function refuse(message: string, status = 400) {
  return data<FileProblem>({ stage: "refused", message }, { status });
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  // Refuse an oversized upload before reading it (OWASP ASVS 4.0.3 V12.1.1).
  const length = Number(request.headers.get("Content-Length") ?? "0");
  // The second step re-sends the checked rows as JSON, which can be larger than the file was.
  if (length > MAX_IMPORT_BYTES * 3) return refuse(`The file is too large: import at most ${MAX_IMPORT_BYTES / 1_000_000} MB at a time.`, 413);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  if (intent === INTENTS.check) {
    const file = form.get("file");
    if (!(file instanceof File) || file.size === 0 || !file.name) return refuse("Choose a CSV or JSON file of items.");
    if (file.size > MAX_IMPORT_BYTES) return refuse(`${file.name} is ${(file.size / 1_000_000).toFixed(1)} MB: import at most ${MAX_IMPORT_BYTES / 1_000_000} MB at a time.`, 413);
    const text = await file.text();
    const format = detectFormat(file.name, text.slice(0, 200));
    if (!format) return refuse(`${file.name} is not a CSV or JSON file of items. Export the bank to see the expected format.`, 415);
    const parsed = parseImport(format, text);
    if (parsed.fileError) return refuse(`${file.name}: ${parsed.fileError}`);
    const valid = parsed.rows.filter((r) => r.content).map((r) => r.content as ItemContent);
    return data<CheckResult>({ stage: "checked", fileName: file.name, total: parsed.rows.length, valid: valid.length, errors: parsed.errors, payload: JSON.stringify(valid) });
  }
  if (intent === INTENTS.importValid) {
    // Checked again: the payload came back from the browser.
    const parsed = parseJsonImport(String(form.get("payload") ?? ""));
    const fileName = String(form.get("fileName") ?? "file").slice(0, 200);
    if (parsed.fileError || parsed.errors.length || parsed.rows.length === 0) return refuse("The rows to import did not pass the check again. Upload the file once more.");
    const ids = await importItems(viewer.org.id, viewer.person.id, parsed.rows.map((r) => r.content!), fileName);
    return redirectWithToast("/bank?status=draft", `${ids.length} ${ids.length === 1 ? "item" : "items"} imported from ${fileName} as drafts.`);
  }
  throw data({ message: "Unknown action." }, { status: 400 });
}

export default function ImportItems() {
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  return (
    <section aria-labelledby="import-heading" className="flex max-w-5xl flex-col gap-4">
      <h2 id="import-heading" className="text-2xl font-semibold">
        Import items
      </h2>
      <p className="text-muted">
        A CSV or JSON file in the format of the bank's export, at most 1 MB and 500 items. Every row is checked first; nothing is saved until you choose. Imported items are drafts.
      </p>
      <Form method="post" encType="multipart/form-data" className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        {result?.stage === "refused" ? <FormErrors id="import-file-error" errors={[result.message]} /> : null}
        <TextField id="import-file" name="file" type="file" accept=".csv,.json,text/csv,application/json" label="File of items" hint="CSV columns: type, topics (separated by |), stem, body and scenario (JSON), rationale, reference — as the export writes them." required />
        <div>
          <Button type="submit" name="intent" value={INTENTS.check} disabled={busy}>
            Check the file
          </Button>
        </div>
      </Form>
      {result?.stage === "checked" ? <CheckReport result={result} busy={busy} /> : null}
    </section>
  );
}

function CheckReport({ result, busy }: { result: CheckResult; busy: boolean }) {
  const bad = result.total - result.valid;
  return (
    <section aria-labelledby="check-heading" className="flex flex-col gap-3">
      <h3 id="check-heading" className="text-xl font-semibold">
        {result.fileName}: {result.valid} of {result.total} rows are ready
      </h3>
      <p role="status">{bad === 0 ? "Every row passed. Nothing is saved until you import." : `${bad} ${bad === 1 ? "row has" : "rows have"} errors. Nothing has been saved.`}</p>
      {result.errors.length > 0 ? (
        <LedgerTable caption="Errors by row and field" captionVisible maxHeight="max-h-[50vh]">
          <thead>
            <tr>
              <Th numeric>Row</Th>
              <Th>Field</Th>
              <Th>Problem</Th>
            </tr>
          </thead>
          <tbody>
            {result.errors.map((e, i) => (
              <tr key={`${e.row}-${e.field}-${i}`}>
                <Td numeric>{e.row}</Td>
                <Td>{e.field}</Td>
                <Td>{e.message}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        {result.valid > 0 ? (
          <Form method="post">
            <input type="hidden" name="payload" value={result.payload} />
            <input type="hidden" name="fileName" value={result.fileName} />
            <Button type="submit" name="intent" value={INTENTS.importValid} disabled={busy}>
              {bad === 0 ? `Import all ${result.valid} rows` : `Import only the ${result.valid} valid rows`}
            </Button>
          </Form>
        ) : null}
        <Link to="/bank/import">Fix the file and check it again</Link>
      </div>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Import items · Bank · Tidemark" }];
