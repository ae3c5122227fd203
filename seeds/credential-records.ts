/**
 * One person's credential (card or licence) for a scenario Dataset: an issue date chosen for a
 * wanted status on the demo day, the valid-through date from the type's rule, an invented
 * number and issuer, and who verified it.
 */
import { addDays, instantOn, type IsoDate } from "./calendar";
import type { CredentialTypeRef, OrgContext } from "./catalogue";
import { issueDateForStatus, validThroughFor, type DateStatus } from "./credential-dates";
import type { Prng } from "./prng";
import type { SeededPerson } from "./roster";

export type CredentialPlan =
  | { status: DateStatus }
  /** A fixed issue date (e.g. a board credential earned before 2002, which never expires). */
  | { issuedOn: IsoDate };

export type CredentialOptions = {
  issuers: Record<CredentialTypeRef["spec"]["category"], string>;
  /** Who verifies; null leaves the credential waiting for verification. */
  verifier: string | null;
};

const LETTERS = "ABCDEFGHJKLMNPQRSTUVWXYZ23456789";

function credentialNumber(type: CredentialTypeRef, prng: Prng): string {
  switch (type.spec.category) {
    case "licence":
      return `RC ${prng.int(100000, 999999)}`;
    case "board":
      return `BC-${prng.int(1000000, 9999999)}`;
    default:
      return Array.from({ length: 12 }, () => prng.pick(LETTERS.split(""))).join("");
  }
}

export function addCredential(
  ctx: OrgContext,
  person: SeededPerson,
  type: CredentialTypeRef,
  plan: CredentialPlan,
  prng: Prng,
  options: CredentialOptions,
): { validThrough: IsoDate | null } {
  const issuedOn = "issuedOn" in plan ? plan.issuedOn : issueDateForStatus(type.spec, plan.status, ctx.today, prng, person.birthMonth);
  const validThrough = validThroughFor(type.spec, issuedOn, person.birthMonth);
  // Verified by the manager within a few weeks of issue, never after the demo day.
  const verifiedOn = [addDays(issuedOn, prng.int(2, 20)), ctx.today].sort()[0];
  const created = instantOn([issuedOn, ctx.today].sort()[0]);
  ctx.data.credentials.push({
    id: ctx.id("credential", person.key, type.spec.code),
    orgId: ctx.orgId,
    personId: person.id,
    credentialTypeId: type.id,
    number: credentialNumber(type, prng),
    issuer: options.issuers[type.spec.category],
    issuedOn,
    validThrough,
    scanFileId: null,
    verifiedBy: options.verifier,
    verifiedAt: options.verifier ? instantOn(verifiedOn, 30) : null,
    createdAt: created,
    updatedAt: options.verifier ? instantOn(verifiedOn, 30) : created,
  });
  return { validThrough };
}
