/**
 * My plan's ledger: each row with its date, status, when the status next changes on its own, and
 * what to do next (issue 8 §5: take the exam, ask for a check-off, upload a renewed card).
 */
import { Link } from "react-router";
import { CalendarDate, formatCalendarDate } from "~/components/calendar-date";
import { KIND_LABELS, statusDetail } from "~/components/plan-table";
import { STATUS_WORDS, StatusMark } from "~/components/ui/status-mark";
import type { NextStep, PlanRow } from "~/domain/status/plan";

const STEP_TEXT: Record<Exclude<NextStep, "none">, string> = {
  "take-exam": "Take the exam",
  "ask-for-checkoff": "Ask a preceptor for a check-off",
  "upload-card": "Upload the card",
  "upload-renewed-card": "Upload the renewed card",
  "await-verification": "Nothing for you: your manager verifies the card",
};

function stepHref(row: PlanRow): string | null {
  switch (row.nextStep) {
    case "take-exam":
      // The Exams page lists the exam with Start or Resume and the attempts left.
      return "/exams";
    case "ask-for-checkoff":
      return "/checkoffs";
    case "upload-card":
    case "upload-renewed-card":
      return row.credentialTypeId ? `/credentials?type=${encodeURIComponent(row.credentialTypeId)}#record-heading` : "/credentials#record-heading";
    default:
      return null;
  }
}

function NextStepCell({ row }: { row: PlanRow }) {
  if (!row.nextStep || row.nextStep === "none") return <span className="text-muted">Nothing to do</span>;
  const href = stepHref(row);
  const text = STEP_TEXT[row.nextStep];
  return href ? (
    <Link to={href} className="font-semibold">
      {text}
      <span className="sr-only">: {row.title}</span>
    </Link>
  ) : (
    <span>{text}</span>
  );
}

export function PlanLedger({ rows }: { rows: PlanRow[] }) {
  return (
    <table className="w-full border-collapse text-left">
      <caption className="sr-only">Your plan in due-date order, overdue and soonest first, with what to do next</caption>
      <thead className="sticky top-0 bg-card">
        <tr className="border-b border-rule text-sm text-muted">
          <th scope="col" className="py-2 pr-4 font-semibold">What</th>
          <th scope="col" className="py-2 pr-4 font-semibold">Kind</th>
          <th scope="col" className="py-2 pr-4 font-semibold">Due or valid through</th>
          <th scope="col" className="py-2 pr-4 font-semibold">Status</th>
          <th scope="col" className="py-2 font-semibold">Next step</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => (
          <tr key={row.key} className="border-b border-rule align-top" data-status={row.result.status} data-testid="plan-row">
            <td className="py-3 pr-4">
              <span className="font-semibold">{row.title}</span>
              <span className="block text-sm text-muted">
                {[
                  row.credential?.number ? `No. ${row.credential.number}` : null,
                  row.credential && !row.credential.verified ? "Awaiting verification by your manager" : null,
                  row.extendedTo ? `Extended to ${formatCalendarDate(row.extendedTo)}` : null,
                  row.kind === "credential" && !row.credential ? "Nothing on file yet" : null,
                ]
                  .filter(Boolean)
                  .join(" · ")}
              </span>
            </td>
            <td className="py-3 pr-4 whitespace-nowrap">{KIND_LABELS[row.kind]}</td>
            <td className="py-3 pr-4 whitespace-nowrap">
              {row.result.date === null ? (
                <span className="text-muted">{row.dateMeaning === "due" ? "No due date set" : "No expiry"}</span>
              ) : (
                <>
                  <span className="text-muted">{row.dateMeaning === "due" ? "Due " : "Valid through "}</span>
                  <CalendarDate value={row.result.date} />
                </>
              )}
            </td>
            <td className="py-3 pr-4">
              <StatusMark status={row.result.status} detail={statusDetail(row)} />
              {row.nextChangeOn && row.nextStatus ? (
                <span className="block text-sm text-muted">
                  {STATUS_WORDS[row.nextStatus]} from {formatCalendarDate(row.nextChangeOn)}
                </span>
              ) : null}
            </td>
            <td className="py-3">
              <NextStepCell row={row} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
