/** The record as the print view and the PDF show it, with whether each signature still holds. */
import type { RecordViewData } from "~/components/checkoffs/record-view";
import type { Viewer } from "~/auth/context";
import { signaturesHold } from "~/db/queries/checkoffs-signing.server";
import type { CheckoffRecord } from "~/db/queries/checkoffs.server";

export function recordViewData(viewer: Viewer, record: CheckoffRecord): RecordViewData {
  return {
    orgName: viewer.org.name,
    checkoff: record.checkoff,
    person: record.person,
    preceptor: record.preceptor,
    checklist: record.checklist,
    marks: record.marks,
    signatures: record.signatures,
    addenda: record.addenda,
    evidence: record.evidence,
    holds: Object.fromEntries(signaturesHold(record).map((h) => [h.signatureId, h.holds])),
  };
}
