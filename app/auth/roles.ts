/**
 * Tidemark's five fixed roles, the sections of the site and the role → permission map.
 * Pure: used by the server (gates, actions) and by components (what to show).
 */
export const ROLES = ["therapist", "preceptor", "educator", "manager", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  therapist: "Therapist",
  preceptor: "Preceptor",
  educator: "Educator",
  manager: "Manager",
  admin: "Admin",
};

export const PERMISSIONS = [
  "section:today",
  "section:plan",
  "section:exams",
  "section:bench",
  "section:checkoffs",
  "section:credentials",
  "section:clearance",
  "section:bank",
  "section:team",
  "section:reports",
  "section:admin",
  /** Observe others and sign their check-offs. */
  "checkoffs:observe",
  /** Write checklists. */
  "checklists:write",
  /** Write items and exams, review statistics, set cut scores. */
  "bank:write",
  /** Assign work to people, units or roles. */
  "assignments:write",
  /** See people of their units. */
  "team:read",
  /** Waivers, extensions, verifying credentials. */
  "team:manage",
  /** Extra time or an untimed exam sitting (WCAG 2.2.1), with a reason. */
  "exams:accommodate",
  "credentials:verify",
  "reports:read",
  "org:settings",
  "people:manage",
  "roles:grant",
  "api-tokens:manage",
] as const;
export type Permission = (typeof PERMISSIONS)[number];

/** Sections every clinical role uses (PRODUCT.md's table: therapist through manager). */
const STAFF: readonly Permission[] = [
  "section:today",
  "section:plan",
  "section:exams",
  "section:bench",
  "section:checkoffs",
  "section:credentials",
  "section:clearance",
];

/** PRODUCT.md, "Sections, their addresses and who sees them", plus the actions each role takes. */
export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  therapist: STAFF,
  preceptor: [...STAFF, "checkoffs:observe"],
  educator: [
    ...STAFF,
    "section:bank",
    "section:team",
    "section:reports",
    "checklists:write",
    "bank:write",
    "assignments:write",
    "team:read",
    "reports:read",
    "exams:accommodate",
  ],
  manager: [
    ...STAFF,
    "section:team",
    "section:reports",
    "assignments:write",
    "team:read",
    "team:manage",
    "credentials:verify",
    "reports:read",
    "exams:accommodate",
  ],
  admin: ["section:today", "section:bench", "section:admin", "org:settings", "people:manage", "roles:grant", "api-tokens:manage"],
};

export function can(roles: readonly Role[], permission: Permission): boolean {
  return roles.some((role) => ROLE_PERMISSIONS[role].includes(permission));
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

export type SectionId =
  | "today"
  | "plan"
  | "exams"
  | "bench"
  | "checkoffs"
  | "credentials"
  | "clearance"
  | "bank"
  | "team"
  | "reports"
  | "admin";

/** `built` is false for sections that a later release opens; the strip shows only built ones. */
export type Section = { id: SectionId; label: string; path: `/${string}`; permission: Permission; built: boolean };

/** The section strip, in reading order. Labels are Tidemark's own (PRODUCT.md). */
export const SECTIONS: readonly Section[] = [
  { id: "today", label: "Today", path: "/today", permission: "section:today", built: true },
  { id: "plan", label: "My plan", path: "/plan", permission: "section:plan", built: true },
  { id: "exams", label: "Exams", path: "/exams", permission: "section:exams", built: true },
  { id: "bench", label: "Bench", path: "/bench", permission: "section:bench", built: true },
  { id: "checkoffs", label: "Check-offs", path: "/checkoffs", permission: "section:checkoffs", built: true },
  { id: "credentials", label: "Credentials", path: "/credentials", permission: "section:credentials", built: true },
  { id: "clearance", label: "Clearance board", path: "/clearance", permission: "section:clearance", built: true },
  { id: "bank", label: "Bank", path: "/bank", permission: "section:bank", built: true },
  { id: "team", label: "Team", path: "/team", permission: "section:team", built: true },
  { id: "reports", label: "Reports", path: "/reports", permission: "section:reports", built: true },
  { id: "admin", label: "Admin", path: "/admin", permission: "section:admin", built: true },
];

export function sectionsFor(roles: readonly Role[]): Section[] {
  return SECTIONS.filter((s) => can(roles, s.permission));
}
