/**
 * Audit events about a person, in words for the person page's history table. Pure, so the
 * loader can render them once in the organisation's time zone and the page just shows text.
 */
import { ROLE_LABELS, isRole } from "~/auth/roles";

export const PERSON_FIELD_LABELS: Record<string, string> = {
  name: "name",
  email: "work e-mail",
  employeeId: "employee id",
  title: "title",
  credentialLetters: "credential letters",
  hireDate: "hire date",
  homeUnitId: "home unit",
  birthMonth: "birth month",
};

function roleWord(detail: Record<string, unknown>): string {
  return isRole(detail.role) ? ROLE_LABELS[detail.role] : String(detail.role ?? "a role");
}

export function describePersonEvent(action: string, detail: Record<string, unknown>): string {
  switch (action) {
    case "person.created":
      return "Added to Tidemark";
    case "person.updated": {
      const changed = detail.changed && typeof detail.changed === "object" ? Object.keys(detail.changed) : [];
      const words = changed.map((k) => PERSON_FIELD_LABELS[k] ?? k);
      return words.length ? `Details changed: ${words.join(", ")}` : "Details changed";
    }
    case "person.deactivated": {
      const n = typeof detail.sessionsEnded === "number" ? detail.sessionsEnded : 0;
      return `Deactivated${n > 0 ? ` (${n} open session${n === 1 ? "" : "s"} ended)` : ""}`;
    }
    case "person.reactivated":
      return "Reactivated";
    case "role.granted":
      return `Role granted: ${roleWord(detail)}`;
    case "role.removed":
      return `Role removed: ${roleWord(detail)}`;
    case "managed-unit.added":
      return `Now manages ${String(detail.unit ?? "a unit")}`;
    case "managed-unit.removed":
      return `No longer manages ${String(detail.unit ?? "a unit")}`;
    case "session.signed-in":
      return "Signed in";
    case "session.signed-out":
      return "Signed out";
    default:
      // Events of later sections (check-offs, credentials…) still show, by their own name.
      return action.replace(/[.-]/g, " ");
  }
}

/** An audit instant as the organisation reads it, e.g. "Dec 2, 2026, 9:14 AM CST". */
export function formatInstant(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", {
    timeZone,
    year: "numeric",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  }).format(new Date(iso));
}
