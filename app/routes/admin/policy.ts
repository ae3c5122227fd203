import type { Role } from "~/auth/roles";

/**
 * Admin policy, pure: the person page's action refuses with these and its component hides the
 * button with the same functions (STYLE.md "one policy function per entity").
 */

export const OWN_ADMIN_ROLE_MESSAGE =
  "You cannot remove your own Admin role. Ask another admin to do it, so the organisation is never left without one.";

export const OWN_DEACTIVATION_MESSAGE =
  "You cannot deactivate your own account: you would be signed out and could not undo it. Ask another admin.";

/** Why an admin may not remove this role from this person, or null when they may. */
export function roleRemovalRefusal(actorId: string, personId: string, role: Role): string | null {
  if (role === "admin" && actorId === personId) return OWN_ADMIN_ROLE_MESSAGE;
  return null;
}

/** Why an admin may not deactivate this person, or null when they may. */
export function deactivationRefusal(actorId: string, personId: string): string | null {
  return actorId === personId ? OWN_DEACTIVATION_MESSAGE : null;
}
