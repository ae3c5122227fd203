/** The person's orientation plan on Today: each step, its due date, and whether it is done. */
import { CalendarDate, formatInstantDate } from "~/components/calendar-date";
import { KIND_LABELS, statusDetail } from "~/components/plan-table";
import { StatusMark } from "~/components/ui/status-mark";
import type { TodayData } from "./index";

const ITEM_KIND = { exam: KIND_LABELS.exam, checklist: KIND_LABELS.checklist, other: "Session" } as const;

export function OrientationSection({ plan, timeZone }: { plan: NonNullable<TodayData["orientation"]>; timeZone: string }) {
  const done = plan.items.filter((i) => i.completedAt).length;
  return (
    <section aria-labelledby="today-orientation" className="rounded-lg border border-rule bg-card px-4 py-4">
      <h2 id="today-orientation" className="text-xl font-semibold">
        Your orientation
      </h2>
      <p className="mt-1 text-muted">
        <CalendarDate value={plan.startsOn} /> to <CalendarDate value={plan.endsOn} />
        {plan.preceptorName ? <> · your preceptor is {plan.preceptorName}</> : null} · {done} of {plan.items.length} steps done
      </p>
      <table className="mt-2 w-full border-collapse text-left">
        <caption className="sr-only">Orientation steps in order</caption>
        <thead className="sticky top-0 bg-card">
          <tr className="border-b border-rule text-sm text-muted">
            <th scope="col" className="py-2 pr-4 font-semibold">Step</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Kind</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Due</th>
            <th scope="col" className="py-2 font-semibold">Progress</th>
          </tr>
        </thead>
        <tbody>
          {plan.items.map((item) => (
            <tr key={item.id} className="border-b border-rule align-top">
              <td className="py-2 pr-4">{item.title}</td>
              <td className="py-2 pr-4 whitespace-nowrap">{ITEM_KIND[item.kind]}</td>
              <td className="py-2 pr-4 whitespace-nowrap">{item.dueOn ? <CalendarDate value={item.dueOn} /> : <span className="text-muted">No date</span>}</td>
              <td className="py-2">
                {item.completedAt ? (
                  <span>Done {formatInstantDate(item.completedAt, timeZone)}</span>
                ) : item.status ? (
                  <StatusMark status={item.status.status} detail={statusDetail({ result: item.status, dateMeaning: "due" })} />
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
