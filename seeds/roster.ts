/**
 * Adding one person with their roles and unit relations to a scenario Dataset.
 */
import type { Role } from "../app/auth/roles";
import type { IsoDate } from "./calendar";
import type { OrgContext } from "./catalogue";

export type PersonSpec = {
  /** Stable key part: "demo-therapist", or a sequence number. */
  key: string | number;
  name: string;
  email: string;
  employeeId: string;
  title: string;
  credentialLetters: string | null;
  hireDate: IsoDate;
  homeUnitId: string;
  birthMonth: number | null;
  roles: readonly Role[];
  /** Units worked beyond the home unit. */
  memberOf?: readonly string[];
  /** Units a manager manages. */
  manages?: readonly string[];
};

export type SeededPerson = PersonSpec & { id: string };

/** Appends the person, their roles (granted by `grantedBy`, the admin) and unit relations. */
export function addPerson(ctx: OrgContext, spec: PersonSpec, grantedBy: string | null): SeededPerson {
  const id = ctx.id("person", spec.key);
  ctx.data.people.push({
    id,
    orgId: ctx.orgId,
    email: spec.email.toLowerCase(),
    name: spec.name,
    employeeId: spec.employeeId,
    title: spec.title,
    credentialLetters: spec.credentialLetters,
    hireDate: spec.hireDate,
    homeUnitId: spec.homeUnitId,
    birthMonth: spec.birthMonth,
    active: true,
    signingPinHash: null,
    signingPinFailures: 0,
    createdAt: ctx.at,
    updatedAt: ctx.at,
  });
  for (const role of spec.roles) {
    ctx.data.personRoles.push({ personId: id, orgId: ctx.orgId, role, grantedBy: grantedBy === id ? null : grantedBy, createdAt: ctx.at });
  }
  for (const unitId of spec.memberOf ?? []) {
    if (unitId !== spec.homeUnitId) ctx.data.personUnits.push({ personId: id, unitId, orgId: ctx.orgId, relation: "member" });
  }
  for (const unitId of spec.manages ?? []) {
    ctx.data.personUnits.push({ personId: id, unitId, orgId: ctx.orgId, relation: "manages" });
  }
  return { ...spec, id };
}

export type UnitSpec = { key: string; name: string; code: string };

export function addUnits<K extends string>(ctx: OrgContext, specs: readonly (UnitSpec & { key: K })[]): Record<K, string> {
  const ids = {} as Record<K, string>;
  for (const spec of specs) {
    const id = ctx.id("unit", spec.key);
    ctx.data.units.push({ id, orgId: ctx.orgId, name: spec.name, code: spec.code, active: true, createdAt: ctx.at, updatedAt: ctx.at });
    ids[spec.key] = id;
  }
  return ids;
}
