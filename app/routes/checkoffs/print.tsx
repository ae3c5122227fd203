import { Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { RecordView } from "~/components/checkoffs/record-view";
import { Button, buttonClass } from "~/components/ui/button";
import { recordViewData } from "./record-data.server";
import { requireVisibleCheckoff } from "./record-access.server";
import type { Route } from "./+types/print";

export async function loader({ context, params }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const record = await requireVisibleCheckoff(viewer, params.checkoffId);
  return { d: recordViewData(viewer, record), id: record.checkoff.id };
}

/** The record for paper: no top bar, the browser's print dialog one tap away. */
export default function PrintRecord() {
  const { d, id } = useLoaderData<typeof loader>();
  return (
    <main id="main" className="mx-auto max-w-4xl px-6 py-6 print:max-w-none print:p-0">
      <p className="mb-4 flex flex-wrap gap-2 print:hidden">
        <Link className={buttonClass("secondary")} to={`/checkoffs/${id}`}>
          Back to the check-off
        </Link>
        <Button onClick={() => window.print()}>Print</Button>
        <a className={buttonClass("secondary")} href={`/checkoffs/${id}/record.pdf`} download>
          Download PDF
        </a>
      </p>
      <RecordView d={d} />
    </main>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Check-off record: ${data?.d.checklist.title ?? ""} · Tidemark` }];
