import { Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { ExamStatusMark } from "~/components/bank/exam-status-mark";
import { buttonClass } from "~/components/ui/button";
import { listExams } from "~/db/queries/exams-authoring.server";
import type { Route } from "./+types/exams";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  return { rows: await listExams(viewer.org.id) };
}

export default function ExamsIndex() {
  const { rows } = useLoaderData<typeof loader>();
  return (
    <section aria-labelledby="exams-heading" className="flex flex-col gap-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="exams-heading" className="text-2xl font-semibold">
          Exams
        </h2>
        <Link to="/bank/exams/new" className={buttonClass("primary", "no-underline")}>
          Write an exam
        </Link>
      </div>
      <p className="max-w-3xl text-muted">
        Each exam draws its items from the bank by its blueprint. Editing makes a new version; attempts keep the version they sat.
      </p>
      <p role="status" className="text-muted">
        {rows.length === 0 ? "No exams yet. Write the first one." : `${rows.length} ${rows.length === 1 ? "exam" : "exams"}.`}
      </p>
      {rows.length > 0 ? (
        <LedgerTable caption="Exams of the bank">
          <thead>
            <tr>
              <Th>Title</Th>
              <Th>Status</Th>
              <Th numeric>Live version</Th>
              <Th numeric>Time limit</Th>
              <Th numeric>Pass mark</Th>
              <Th numeric>Items</Th>
              <Th numeric>Open assignments</Th>
              <Th numeric>Attempts</Th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <Td className="max-w-md">
                  <Link to={`/bank/exams/${r.id}`} className="font-semibold">
                    {r.title}
                  </Link>
                </Td>
                <Td>
                  <ExamStatusMark status={r.status} detail={r.liveVersion !== null && r.latestVersion !== r.liveVersion ? `draft v${r.latestVersion}` : undefined} />
                </Td>
                <Td numeric>{r.liveVersion ?? <span className="text-muted">—</span>}</Td>
                <Td numeric>{r.timeLimitMinutes === null ? "Untimed" : `${r.timeLimitMinutes} min`}</Td>
                <Td numeric>{r.passMarkPercent} %</Td>
                <Td numeric>{r.items}</Td>
                <Td numeric>{r.openAssignments}</Td>
                <Td numeric>{r.attempts}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Exams · Bank · Tidemark" }];
