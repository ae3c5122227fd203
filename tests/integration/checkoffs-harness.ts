/** Shared steps of the check-off tests: a seeded viewer with a PIN, and a check-off taken to signing. */
import { eq } from "drizzle-orm";
import type { Viewer } from "~/auth/context";
import { database } from "~/db/client.server";
import { setSigningPin, signCheckoff } from "~/db/queries/checkoffs-signing.server";
import { listPublishedChecklists } from "~/db/queries/checkoffs.server";
import { markStep, requestCheckoff, setOutcome } from "~/db/queries/checkoffs-write.server";
import { checklistVersions } from "~/db/schema";

export const PINS = { therapist: "482913", preceptor: "730415", educator: "915062" } as const;

export async function givePin(viewer: Viewer, pin: string) {
  const result = await setSigningPin(viewer, pin);
  if (!result.ok && result.status !== 409) throw new Error(result.message);
}

/** A check-off the therapist asked for, of the first published checklist. */
export async function requested(therapist: Viewer): Promise<{ id: string; steps: number }> {
  const [checklist] = await listPublishedChecklists(therapist.org.id);
  const result = await requestCheckoff(therapist, checklist.id);
  if (!result.ok) throw new Error(result.message);
  const { db } = await database();
  const [v] = await db.select().from(checklistVersions).where(eq(checklistVersions.id, checklist.versionId));
  return { id: result.value, steps: v.steps.length };
}

/** Marks every step met and chooses competent: ready to sign. */
export async function observedCompetent(preceptor: Viewer, checkoffId: string, steps: number) {
  for (let i = 0; i < steps; i++) {
    const r = await markStep(preceptor, checkoffId, { stepIndex: i, result: "met", comment: i === 0 ? "Two identifiers checked" : null });
    if (!r.ok) throw new Error(r.message);
  }
  const o = await setOutcome(preceptor, checkoffId, { outcome: "competent", practicePlan: null, practiceBy: null });
  if (!o.ok) throw new Error(o.message);
}

export async function signedCheckoff(therapist: Viewer, preceptor: Viewer): Promise<string> {
  const { id, steps } = await requested(therapist);
  await observedCompetent(preceptor, id, steps);
  const signed = await signCheckoff(preceptor, id, { email: null, pin: PINS.preceptor });
  if (!signed.ok) throw new Error(signed.message);
  return id;
}
