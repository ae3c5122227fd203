/**
 * The certificates the demo's signed competent check-offs would have been issued (as
 * app/db/queries/certificates.server.ts issues them): the preceptor signs, the date is the
 * signing's calendar date in the organisation's time zone, the valid-through date follows the
 * requirement the checklist meets (none: no expiry). Codes are derived from the check-off's id,
 * so every seed of the same demo day prints the same codes; real codes are random.
 */
import { createHash } from "node:crypto";
import { certificateCodeFrom, checkoffCertificateTitle } from "~/domain/certificates/certificate";
import { calendarDateIn } from "~/domain/status/calendar-date";
import { validThroughAfter } from "~/domain/status/plan";
import type { OrgContext } from "./catalogue";

/** A seeded certificate's code: stable for the check-off it stands for. */
export function seededCertificateCode(checkoffId: string): string {
  return certificateCodeFrom(createHash("sha256").update(`tidemark-seed-certificate:${checkoffId}`).digest());
}

export function addSeededCertificates(ctx: OrgContext, timeZone: string): void {
  const versions = new Map(ctx.data.checklistVersions.map((v) => [v.id, v.checklistId]));
  const checklists = new Map(ctx.data.checklists.map((c) => [c.id, c]));
  const people = new Map(ctx.data.people.map((p) => [p.id, p]));
  for (const checkoff of ctx.data.checkoffs) {
    if (checkoff.outcome !== "competent" || !checkoff.signedAt || !checkoff.preceptorId || !checkoff.id) continue;
    const checklistId = versions.get(checkoff.checklistVersionId);
    const checklist = checklistId ? checklists.get(checklistId) : undefined;
    const preceptor = people.get(checkoff.preceptorId);
    if (!checklist || !preceptor) throw new Error(`seeded check-off ${checkoff.id} has no checklist or preceptor`);
    const requirement = ctx.data.requirements.find((r) => r.checklistId === checklistId && r.active !== false);
    const issuedOn = calendarDateIn(timeZone, checkoff.signedAt);
    ctx.data.certificates.push({
      id: ctx.id("certificate", checkoff.id),
      orgId: ctx.orgId,
      personId: checkoff.personId,
      requirementId: requirement?.id ?? null,
      sourceType: "checkoff",
      sourceId: checkoff.id,
      title: checkoffCertificateTitle(checklist.title),
      code: seededCertificateCode(checkoff.id),
      issuedOn,
      validThrough: validThroughAfter(issuedOn, requirement?.recurrence ?? null),
      signerName: preceptor.credentialLetters ? `${preceptor.name}, ${preceptor.credentialLetters}` : preceptor.name,
      createdAt: checkoff.signedAt,
    });
  }
}
