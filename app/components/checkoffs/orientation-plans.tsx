import { Link } from "react-router";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CalendarDate } from "~/components/calendar-date";
import { StatusMark } from "~/components/ui/status-mark";
import type { OrientationPlanRow } from "~/db/queries/checkoffs-orientation.server";
import { outstandingStatus, type Status } from "~/domain/status";

/** An item done counts as current; otherwise it is not started until its target date passes. */
function itemStatus(item: OrientationPlanRow["items"][number], today: string): Status {
  return item.done ? "current" : outstandingStatus(item.dueOn, { today }).status;
}

/**
 * Orientation plans at a glance: each part with its target date and PRODUCT.md's status word and
 * mark. Used by the Orientation page; ready for My plan too.
 */
export function PlanList({ heading, plans, today }: { heading: string; plans: OrientationPlanRow[]; today: string }) {
  const id = heading.toLowerCase().replace(/[^a-z]+/g, "-");
  return (
    <section aria-labelledby={id} className="flex flex-col gap-4">
      <h2 id={id} className="text-2xl font-semibold">
        {heading}
      </h2>
      {plans.length === 0 ? <p className="text-muted">No active plans.</p> : null}
      {plans.map((p) => {
        const done = p.items.filter((i) => i.done).length;
        const complete = done === p.items.length;
        return (
          <div key={p.id} className="flex flex-col gap-2" data-testid="orientation-plan">
            <h3 className="text-xl font-semibold">
              {p.personName}{" "}
              <span className="text-base font-normal text-muted">
                · preceptor {p.preceptorName ?? "not assigned"} · <CalendarDate value={p.startsOn} /> to <CalendarDate value={p.endsOn} /> ·{" "}
                {complete ? "complete" : `${done} of ${p.items.length} done`}
              </span>
            </h3>
            <LedgerTable caption={`Orientation plan of ${p.personName}`} maxHeight="max-h-[50vh]">
              <thead>
                <tr>
                  <Th>Part</Th>
                  <Th>Kind</Th>
                  <Th>Target date</Th>
                  <Th>Status</Th>
                </tr>
              </thead>
              <tbody>
                {p.items.map((i) => (
                  <tr key={i.id}>
                    <Td>{i.kind === "checklist" && i.checklistId ? <Link to={`/checkoffs/checklists/${i.checklistId}`}>{i.title}</Link> : i.title}</Td>
                    <Td>{i.kind === "checklist" ? "Check-off" : i.kind === "exam" ? "Exam" : "Other"}</Td>
                    <Td>{i.dueOn ? <CalendarDate value={i.dueOn} /> : "—"}</Td>
                    <Td>
                      <StatusMark status={itemStatus(i, today)} detail={i.done ? "done" : undefined} />
                    </Td>
                  </tr>
                ))}
              </tbody>
            </LedgerTable>
          </div>
        );
      })}
    </section>
  );
}

