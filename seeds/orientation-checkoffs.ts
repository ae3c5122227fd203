/**
 * The new hires' orientation check-offs that are already behind them: each checklist part whose
 * target date has passed was observed by their preceptor, judged competent, signed and
 * acknowledged on its target date. Hires who started 12, 29 and 46 days before the demo day
 * therefore stand at different stages (none, two and three check-offs signed). The signatures
 * carry the same content hash the app computes (app/domain/checkoffs/record.ts), so the record
 * pages show them as holding.
 */
import { createHash } from "node:crypto";
import { canonicalCheckoffContent, signatureMeaning, type Outcome } from "~/domain/checkoffs/record";
import { instantOn, type IsoDate } from "./calendar";
import type { OrgContext } from "./catalogue";
import { CHECKLISTS } from "./checklists";
import type { SeededPerson } from "./roster";

export function addSignedCheckoff(
  ctx: OrgContext,
  input: { hire: SeededPerson; preceptor: SeededPerson; checklistKey: string; on: IsoDate; timeZone: string },
): void {
  const spec = CHECKLISTS.find((c) => c.key === input.checklistKey);
  if (!spec) throw new Error(`unknown checklist ${input.checklistKey}`);
  const checkoffId = ctx.id("checkoff", input.hire.key, input.checklistKey);
  const versionId = ctx.id("checklist-version", spec.key, 1);
  const marks = spec.steps.map((_, stepIndex) => ({ stepIndex, result: "met" as const, comment: null }));
  const contentHash = createHash("sha256")
    .update(
      canonicalCheckoffContent({
        checkoffId,
        personId: input.hire.id,
        checklistVersionId: versionId,
        steps: spec.steps,
        marks,
        outcome: "competent",
        practicePlan: null,
        practiceBy: null,
      }),
    )
    .digest("hex");
  const signedAt = instantOn(input.on, 180);
  const acknowledgedAt = instantOn(input.on, 200);
  ctx.data.checkoffs.push({
    id: checkoffId,
    orgId: ctx.orgId,
    personId: input.hire.id,
    checklistVersionId: versionId,
    preceptorId: input.preceptor.id,
    status: "acknowledged",
    outcome: "competent",
    contentHash,
    startedAt: instantOn(input.on, 120),
    signedAt,
    acknowledgedAt,
    createdAt: instantOn(input.on, 120),
    updatedAt: acknowledgedAt,
  });
  for (const m of marks) {
    ctx.data.checkoffStepResults.push({
      id: ctx.id("checkoff-step", input.hire.key, input.checklistKey, m.stepIndex),
      orgId: ctx.orgId,
      checkoffId,
      stepIndex: m.stepIndex,
      result: m.result,
      comment: null,
      updatedAt: signedAt,
    });
  }
  const record = { checkoffId, outcome: "competent" as const, timeZone: input.timeZone, contentHash };
  pushCheckoffSignature(ctx, { ...record, id: ctx.id("signature", input.hire.key, input.checklistKey, "observer"), who: input.preceptor, role: "observer", at: signedAt });
  pushCheckoffSignature(ctx, { ...record, id: ctx.id("signature", input.hire.key, input.checklistKey, "acknowledgement"), who: input.hire, role: "acknowledgement", at: acknowledgedAt });
}

/**
 * One signature of a seeded check-off, as the app records it when signed in its own session:
 * the meaning from the record module, the signer's printed name and letters, the content hash.
 */
export function pushCheckoffSignature(
  ctx: OrgContext,
  s: { id: string; checkoffId: string; who: SeededPerson; role: "observer" | "acknowledgement"; outcome: Outcome; at: Date; timeZone: string; contentHash: string },
): void {
  ctx.data.signatures.push({
    id: s.id,
    orgId: ctx.orgId,
    signerId: s.who.id,
    recordType: "checkoff",
    recordId: s.checkoffId,
    meaning: signatureMeaning(s.role, s.outcome),
    printedName: s.who.name,
    credentialLetters: s.who.credentialLetters,
    signedAt: s.at,
    timeZone: s.timeZone,
    contentHash: s.contentHash,
    method: "own-session",
    createdAt: s.at,
  });
}
