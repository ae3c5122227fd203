import { describe, expect, it } from "vitest";
import { can, ROLE_PERMISSIONS, ROLES, sectionsFor, type Role } from "./roles";

// PRODUCT.md, "Sections, their addresses and who sees them": the table this map must reproduce.
const PRODUCT_TABLE: Record<string, Role[]> = {
  today: ["therapist", "preceptor", "educator", "manager", "admin"],
  plan: ["therapist", "preceptor", "educator", "manager"],
  exams: ["therapist", "preceptor", "educator", "manager"],
  bench: ["therapist", "preceptor", "educator", "manager", "admin"],
  checkoffs: ["therapist", "preceptor", "educator", "manager"],
  credentials: ["therapist", "preceptor", "educator", "manager"],
  clearance: ["therapist", "preceptor", "educator", "manager"],
  bank: ["educator"],
  team: ["educator", "manager"],
  reports: ["educator", "manager"],
  admin: ["admin"],
};

describe("role → permission map", () => {
  it.each(Object.entries(PRODUCT_TABLE))("section %s is seen by exactly the roles in PRODUCT.md", (section, roles) => {
    const seenBy = ROLES.filter((r) => sectionsFor([r]).some((s) => s.id === section));
    expect(seenBy).toEqual(roles);
  });

  it("a person with several roles sees the union of their sections", () => {
    const union = sectionsFor(["therapist", "admin"]).map((s) => s.id);
    expect(union).toEqual(["today", "plan", "exams", "bench", "checkoffs", "credentials", "clearance", "admin"]);
  });

  it("denies by default: no roles, no permissions", () => {
    expect(can([], "section:today")).toBe(false);
    expect(sectionsFor([])).toEqual([]);
  });

  it("only preceptors observe and sign others' check-offs; only admins manage people and roles", () => {
    expect(ROLES.filter((r) => can([r], "checkoffs:observe"))).toEqual(["preceptor"]);
    expect(ROLES.filter((r) => can([r], "people:manage"))).toEqual(["admin"]);
    expect(ROLES.filter((r) => can([r], "roles:grant"))).toEqual(["admin"]);
    expect(ROLES.filter((r) => can([r], "credentials:verify"))).toEqual(["manager"]);
  });

  it("every role's permissions are unique (no accidental duplicates)", () => {
    for (const role of ROLES) expect(new Set(ROLE_PERMISSIONS[role]).size).toBe(ROLE_PERMISSIONS[role].length);
  });
});
