/**
 * Who may do what with a check-off. Pure, one function per decision, used by the actions
 * (which refuse) and by the components (which hide the button) — STYLE.md "Roles and
 * permissions". A "signer" is whoever signs: the signed-in person, or a person who typed their
 * e-mail on a shared tablet; either way their own roles decide.
 */
import { can, type Role } from "./roles";

export type Actor = { id: string; orgId: string; roles: readonly Role[] };
export type CheckoffFacts = { orgId: string; personId: string; preceptorId: string | null; status: "requested" | "in-progress" | "signed" | "acknowledged" | "cancelled" };

const sameOrg = (a: Actor, c: CheckoffFacts) => a.orgId === c.orgId;
const isOwn = (a: Actor, c: CheckoffFacts) => a.id === c.personId;
export const isSigned = (c: Pick<CheckoffFacts, "status">) => c.status === "signed" || c.status === "acknowledged";
const isOpen = (c: Pick<CheckoffFacts, "status">) => c.status === "requested" || c.status === "in-progress";

/** PRODUCT.md: therapists see their own; preceptors their own and those they observe; educators and managers read. */
export function canViewCheckoff(a: Actor, c: CheckoffFacts): boolean {
  if (!sameOrg(a, c)) return false;
  return isOwn(a, c) || can(a.roles, "checkoffs:observe") || can(a.roles, "checklists:write") || can(a.roles, "team:read");
}

/** Marking steps and choosing the outcome: a preceptor, never on their own check-off, only while open. */
export function canObserveCheckoff(a: Actor, c: CheckoffFacts): boolean {
  return sameOrg(a, c) && can(a.roles, "checkoffs:observe") && !isOwn(a, c) && isOpen(c);
}

/** Signing as the observer: the same rule — a person cannot sign their own check-off. */
export function canSignCheckoff(a: Actor, c: CheckoffFacts): boolean {
  return canObserveCheckoff(a, c) && c.status === "in-progress";
}

/** The therapist observed acknowledges the signed record, and only they. */
export function canAcknowledgeCheckoff(a: Actor, c: CheckoffFacts): boolean {
  return sameOrg(a, c) && isOwn(a, c) && c.status === "signed";
}

/** Corrections to a signed record: the preceptor who signed it, or an educator — never the therapist observed. */
export function canAddAddendum(a: Actor, c: CheckoffFacts): boolean {
  if (!sameOrg(a, c) || !isSigned(c) || isOwn(a, c)) return false;
  return a.id === c.preceptorId || can(a.roles, "checklists:write");
}

/** Evidence: the therapist (their own) or a preceptor or educator; managers read only. */
export function canAttachEvidence(a: Actor, c: CheckoffFacts): boolean {
  if (!sameOrg(a, c) || c.status === "cancelled") return false;
  return isOwn(a, c) || can(a.roles, "checkoffs:observe") || can(a.roles, "checklists:write");
}

/** Starting a check-off for someone else: a preceptor. */
export function canStartCheckoffFor(a: Actor, personId: string): boolean {
  return can(a.roles, "checkoffs:observe") && a.id !== personId;
}

/** Asking for one's own check-off: anyone who does bedside work (the therapist role). */
export function canRequestCheckoff(a: Actor): boolean {
  return a.roles.includes("therapist");
}

/** Writing checklists: educators. */
export function canWriteChecklists(a: Pick<Actor, "roles">): boolean {
  return can(a.roles, "checklists:write");
}
