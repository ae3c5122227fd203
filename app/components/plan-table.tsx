/**
 * A person's plan rows as a ledger: what it is, its kind, the date that matters (due or valid
 * through) and the status mark with how long ago or how soon. Used by My plan and Today.
 */
import type { ReactNode } from "react";
import { StatusMark } from "~/components/ui/status-mark";
import type { PlanRow, WorkKind } from "~/domain/status/plan";
import { CalendarDate, formatCalendarDate, formatDayCount } from "./calendar-date";

export const KIND_LABELS: Record<WorkKind, string> = { exam: "Exam", checklist: "Check-off", credential: "Credential" };

/** The words beside a status mark: how long ago something lapsed, how soon it falls due. */
export function statusDetail(row: Pick<PlanRow, "result" | "dateMeaning">): string | undefined {
  const { status, daysLeft, daysLapsed, waivedThrough } = row.result;
  switch (status) {
    case "lapsed":
      return daysLapsed === null ? undefined : `${formatDayCount(daysLapsed)} ago`;
    case "due-soon":
      return daysLeft === 0 ? "ends today" : daysLeft === null ? undefined : `in ${formatDayCount(daysLeft)}`;
    case "not-started":
      if (daysLeft === null) return undefined;
      return daysLeft === 0 ? "due today" : `due in ${formatDayCount(daysLeft)}`;
    case "waived":
      return waivedThrough ? `through ${formatCalendarDate(waivedThrough)}` : undefined;
    case "current":
      return undefined;
  }
}

/** `labelled`: say "Due" or "Valid through" in the cell, for tables that mix both. */
function DateCell({ row, labelled }: { row: PlanRow; labelled: boolean }) {
  const { date } = row.result;
  if (date === null) return <span className="text-muted">{row.dateMeaning === "due" ? "No due date set" : "No expiry"}</span>;
  return (
    <>
      {labelled ? <span className="text-muted">{row.dateMeaning === "due" ? "Due " : "Valid through "}</span> : null}
      <CalendarDate value={date} />
    </>
  );
}

function WhatCell({ row }: { row: PlanRow }) {
  const notes: ReactNode[] = [];
  if (row.credential?.number) notes.push(<span key="n">No. {row.credential.number}</span>);
  if (row.credential && !row.credential.verified) notes.push(<span key="v">Awaiting verification by your manager</span>);
  if (row.extendedTo) notes.push(<span key="e">Extended to {formatCalendarDate(row.extendedTo)}</span>);
  if (row.kind === "credential" && !row.credential) notes.push(<span key="m">Nothing on file yet</span>);
  return (
    <>
      <span className="font-semibold">{row.title}</span>
      {notes.length > 0 ? <span className="block text-sm text-muted">{notes.flatMap((n, i) => (i === 0 ? [n] : [" · ", n]))}</span> : null}
    </>
  );
}

type PlanTableProps = {
  rows: PlanRow[];
  caption: string;
  captionHidden?: boolean;
  /** Off where every row is of one kind (Today's credentials). */
  showKind?: boolean;
  dateHeader?: string;
};

const MIXED_DATES = "Due or valid through";

export function PlanTable({ rows, caption, captionHidden = false, showKind = true, dateHeader = MIXED_DATES }: PlanTableProps) {
  return (
    <table className="w-full border-collapse text-left">
      <caption className={captionHidden ? "sr-only" : "pb-2 text-left text-sm text-muted"}>{caption}</caption>
      <thead className="sticky top-0 bg-card">
        <tr className="border-b border-rule text-sm text-muted">
          <th scope="col" className="py-2 pr-4 font-semibold">What</th>
          {showKind ? <th scope="col" className="py-2 pr-4 font-semibold">Kind</th> : null}
          <th scope="col" className="py-2 pr-4 font-semibold">{dateHeader}</th>
          <th scope="col" className="py-2 font-semibold">Status</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => (
          <tr key={row.key} className="border-b border-rule align-top" data-status={row.result.status}>
            <td className="py-3 pr-4">
              <WhatCell row={row} />
            </td>
            {showKind ? <td className="py-3 pr-4 whitespace-nowrap">{KIND_LABELS[row.kind]}</td> : null}
            <td className="py-3 pr-4 whitespace-nowrap">
              <DateCell row={row} labelled={dateHeader === MIXED_DATES} />
            </td>
            <td className="py-3">
              <StatusMark status={row.result.status} detail={statusDetail(row)} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
