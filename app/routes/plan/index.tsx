import { Link, useLoaderData } from "react-router";
import { notFound, requireViewer } from "~/auth/gate.server";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { PlanList } from "~/components/checkoffs/orientation-plans";
import { listOrientationPlans } from "~/db/queries/checkoffs-orientation.server";
import { getPlan } from "~/db/queries/plan.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { countStatuses } from "~/domain/status";
import { PlanLedger } from "./plan-ledger";
import type { Route } from "./+types/index";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:plan");
  const options = await statusOptionsFor(viewer.org.id, viewer.org.timeZone);
  const rows = await getPlan(viewer.org.id, viewer.person.id, viewer.org.timeZone, options);
  if (!rows) notFound("We could not find your record in this organisation.");
  const notStarted = rows.filter((r) => r.result.status === "not-started").length;
  // A new hire's orientation plan belongs in their plan too (issue 7, item 5).
  const orientation = await listOrientationPlans(viewer.org.id, { kind: "person", personId: viewer.person.id });
  return {
    today: options.today,
    reminderDays: options.reminderDays,
    timeZone: viewer.org.timeZone,
    rows,
    orientation,
    counts: { ...countStatuses(rows.map((r) => r.result)), notStarted },
  };
}

export default function MyPlan() {
  const { today, reminderDays, timeZone, rows, orientation, counts } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">My plan</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Your exams, check-offs and credentials, soonest first — anything overdue is at the top. Today is{" "}
        <CalendarDate value={today} long /> ({timeZone}). “Due soon” means within {reminderDays} days.
      </p>
      <p className="mt-2"><Link to="/plan/calendar" className="underline">Put these dates in your calendar app</Link> · <Link to="/plan/reminders" className="underline">Reminder e-mails</Link></p>

      {orientation.length > 0 ? (
        <div className="mt-6">
          <PlanList heading="My orientation plan" plans={orientation} today={today} />
        </div>
      ) : null}

      {rows.length === 0 ? (
        <section aria-labelledby="plan-empty" className="mt-8 max-w-2xl rounded-lg border border-rule bg-card px-6 py-8">
          <h2 id="plan-empty" className="text-xl font-semibold">
            Nothing is due
          </h2>
          <p className="mt-2">
            When your educator assigns an exam or a check-off, it appears here with its due date. Licences and cards your
            manager records appear here too, with the date they are valid through.
          </p>
        </section>
      ) : (
        <>
          <p className="mt-6" data-testid="plan-summary">
            {summaryLine(counts)}
          </p>
          <div className="mt-4 rounded-lg border border-rule bg-card px-4 pt-2">
            <PlanLedger rows={rows} />
          </div>
        </>
      )}
      <CautionFooter />
    </>
  );
}

function summaryLine(c: { lapsed: number; dueSoon: number; notStarted: number; current: number; waived: number }): string {
  const parts = [
    c.lapsed > 0 ? `${c.lapsed} lapsed` : null,
    c.dueSoon > 0 ? `${c.dueSoon} due soon` : null,
    c.notStarted > 0 ? `${c.notStarted} not started` : null,
    c.current > 0 ? `${c.current} current` : null,
    c.waived > 0 ? `${c.waived} waived` : null,
  ].filter(Boolean);
  return parts.length > 0 ? `${parts.join(", ")}.` : "";
}

export const meta: Route.MetaFunction = () => [{ title: "My plan · Tidemark" }];
