/** The date range of a report (GET, so the address holds the report): errors next to the field they concern. */
import { Form } from "react-router";
import { Button } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";

export function RangeForm({ raw, range, error }: { raw: { from: string; to: string }; range: { from: string; to: string } | null; error: { field: "from" | "to"; message: string } | null }) {
  return (
    <Form method="get" className="mt-6 flex max-w-2xl flex-wrap items-start gap-3" aria-label="Choose the dates">
      <TextField
        id="report-from"
        name="from"
        type="date"
        label="From"
        defaultValue={raw.from || range?.from || ""}
        errors={error?.field === "from" ? [error.message] : null}
        className="flex min-w-48 flex-1 flex-col gap-1"
      />
      <TextField
        id="report-to"
        name="to"
        type="date"
        label="To (inclusive)"
        defaultValue={raw.to || range?.to || ""}
        errors={error?.field === "to" ? [error.message] : null}
        className="flex min-w-48 flex-1 flex-col gap-1"
      />
      <div className="pt-8">
        <Button type="submit">Show</Button>
      </div>
    </Form>
  );
}
