import type { Status } from "~/components/ui/status-mark";
import { StatusMark } from "~/components/ui/status-mark";

export type CheckoffStatus = "requested" | "in-progress" | "signed" | "acknowledged" | "cancelled";

const WORDS: Record<CheckoffStatus, string> = {
  requested: "Requested",
  "in-progress": "In progress",
  signed: "Signed",
  acknowledged: "Signed and acknowledged",
  cancelled: "Cancelled",
};

/**
 * A check-off's stage as a word, with PRODUCT.md's mark for what it means for the person's
 * record: a signed check-off counts (filled circle), open ones are not started yet (dotted ring).
 */
const MARK: Record<CheckoffStatus, Status> = {
  requested: "not-started",
  "in-progress": "not-started",
  signed: "current",
  acknowledged: "current",
  cancelled: "waived",
};

export function CheckoffStatusMark({ status }: { status: CheckoffStatus }) {
  return <StatusMark status={MARK[status]} detail={WORDS[status]} />;
}

export function checkoffStatusWord(status: CheckoffStatus): string {
  return WORDS[status];
}
