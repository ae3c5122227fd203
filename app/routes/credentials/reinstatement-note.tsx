import { formatCalendarDate } from "~/components/calendar-date";
import type { Status } from "~/domain/status";
import { reinstatableThrough, standingOn } from "~/domain/validity";

/**
 * After expiry some credentials can still be reinstated for a while — the board credential for
 * 6 months (NBRC, "Credential Maintenance & State License Renewal"); after that a new exam is needed.
 */
export function ReinstatementNote(props: { status: Status; validThrough: string | null; reinstatementMonths: number | null; today: string }) {
  if (props.status !== "lapsed" || !props.reinstatementMonths) return null;
  const standing = standingOn(props.validThrough, props.reinstatementMonths, props.today);
  const through = reinstatableThrough(props.validThrough, props.reinstatementMonths);
  if (standing === "reinstatable" && through) {
    return <span className="block text-sm">Can still be reinstated through {formatCalendarDate(through)}.</span>;
  }
  if (standing === "expired") return <span className="block text-sm">Past its reinstatement window: a new exam is needed.</span>;
  return null;
}
