/** The one place a check-off route turns an id into a record the viewer may see (404 otherwise). */
import { canViewCheckoff } from "~/auth/checkoff-policy";
import type { Viewer } from "~/auth/context";
import { notFound } from "~/auth/gate.server";
import { getCheckoffRecord, type CheckoffRecord } from "~/db/queries/checkoffs.server";
import { actorOf } from "~/db/queries/checkoffs-write.server";

/**
 * Another organisation's check-off, or one the viewer may not see, answers exactly as a missing
 * one does, so ids cannot be probed (OWASP ASVS 4.0.3 V4.2.1).
 */
export async function requireVisibleCheckoff(viewer: Viewer, checkoffId: string | undefined): Promise<CheckoffRecord> {
  const record = checkoffId ? await getCheckoffRecord(viewer.org.id, checkoffId) : null;
  if (!record || !canViewCheckoff(actorOf(viewer), record.checkoff)) notFound("We could not find that check-off.", true);
  return record;
}
