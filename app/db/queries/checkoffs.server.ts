/**
 * Reading check-offs: one record with everything a page or a printout shows, and the lists of
 * the Check-offs page. Every query takes the viewer's organisation id first.
 */
import { and, asc, desc, eq, inArray, ne, or } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { Mark, Outcome, Step } from "~/domain/checkoffs/record";
import { database, type DbOrTx } from "../client.server";
import { addenda, checklists, checklistVersions, checkoffEvidence, checkoffs, checkoffStepResults, files, people, personRoles, signatures, type Checkoff, type Signature } from "../schema";

export type EvidenceRow = { id: string; fileId: string; name: string; mimeType: string; sizeBytes: number; uploadedBy: string; createdAt: Date };
export type AddendumRow = { id: string; text: string; authorName: string; createdAt: Date; signature: Signature | null };

export type CheckoffRecord = {
  checkoff: Checkoff;
  person: { id: string; name: string; credentialLetters: string | null };
  preceptor: { id: string; name: string; credentialLetters: string | null } | null;
  checklist: { id: string; title: string; skill: string; versionId: string; version: number; method: string; references: string; steps: Step[] };
  marks: Mark[];
  signatures: Signature[];
  addenda: AddendumRow[];
  evidence: EvidenceRow[];
};

/** The check-off with its checklist version, marks, signatures, addenda and evidence; null when not this organisation's. */
export async function getCheckoffRecord(orgId: string, checkoffId: string, db?: DbOrTx): Promise<CheckoffRecord | null> {
  const conn = db ?? (await database()).db;
  const person = alias(people, "person");
  const preceptor = alias(people, "preceptor");
  const [row] = await conn
    .select({ checkoff: checkoffs, person, preceptor, version: checklistVersions, checklist: checklists })
    .from(checkoffs)
    .innerJoin(person, and(eq(person.id, checkoffs.personId), eq(person.orgId, orgId)))
    .leftJoin(preceptor, and(eq(preceptor.id, checkoffs.preceptorId), eq(preceptor.orgId, orgId)))
    .innerJoin(checklistVersions, and(eq(checklistVersions.id, checkoffs.checklistVersionId), eq(checklistVersions.orgId, orgId)))
    .innerJoin(checklists, and(eq(checklists.id, checklistVersions.checklistId), eq(checklists.orgId, orgId)))
    .where(and(eq(checkoffs.orgId, orgId), eq(checkoffs.id, checkoffId)))
    .limit(1);
  if (!row) return null;
  const [marks, sigs, adds, evidence] = await Promise.all([
    conn
      .select({ stepIndex: checkoffStepResults.stepIndex, result: checkoffStepResults.result, comment: checkoffStepResults.comment })
      .from(checkoffStepResults)
      .where(and(eq(checkoffStepResults.orgId, orgId), eq(checkoffStepResults.checkoffId, checkoffId)))
      .orderBy(asc(checkoffStepResults.stepIndex)),
    conn
      .select()
      .from(signatures)
      .where(and(eq(signatures.orgId, orgId), eq(signatures.recordType, "checkoff"), eq(signatures.recordId, checkoffId)))
      .orderBy(asc(signatures.signedAt)),
    conn
      .select({ id: addenda.id, text: addenda.text, authorName: people.name, createdAt: addenda.createdAt })
      .from(addenda)
      .innerJoin(people, eq(people.id, addenda.authorId))
      .where(and(eq(addenda.orgId, orgId), eq(addenda.recordType, "checkoff"), eq(addenda.recordId, checkoffId)))
      .orderBy(asc(addenda.createdAt)),
    conn
      .select({
        id: checkoffEvidence.id,
        fileId: checkoffEvidence.fileId,
        name: files.originalName,
        mimeType: files.mimeType,
        sizeBytes: files.sizeBytes,
        uploadedBy: people.name,
        createdAt: checkoffEvidence.createdAt,
      })
      .from(checkoffEvidence)
      .innerJoin(files, and(eq(files.id, checkoffEvidence.fileId), eq(files.orgId, orgId)))
      .innerJoin(people, eq(people.id, checkoffEvidence.uploadedBy))
      .where(and(eq(checkoffEvidence.orgId, orgId), eq(checkoffEvidence.checkoffId, checkoffId)))
      .orderBy(asc(checkoffEvidence.createdAt)),
  ]);
  const addendumSigs =
    adds.length === 0
      ? []
      : await conn
          .select()
          .from(signatures)
          .where(and(eq(signatures.orgId, orgId), eq(signatures.recordType, "addendum"), inArray(signatures.recordId, adds.map((a) => a.id))));
  return {
    checkoff: row.checkoff,
    person: { id: row.person.id, name: row.person.name, credentialLetters: row.person.credentialLetters },
    preceptor: row.preceptor ? { id: row.preceptor.id, name: row.preceptor.name, credentialLetters: row.preceptor.credentialLetters } : null,
    checklist: {
      id: row.checklist.id,
      title: row.checklist.title,
      skill: row.checklist.skill,
      versionId: row.version.id,
      version: row.version.version,
      method: row.version.method,
      references: row.version.references,
      steps: row.version.steps,
    },
    marks,
    signatures: sigs,
    addenda: adds.map((a) => ({ ...a, signature: addendumSigs.find((s) => s.recordId === a.id) ?? null })),
    evidence: evidence.map((e) => ({ ...e, name: e.name ?? "evidence" })),
  };
}

export type CheckoffListRow = {
  id: string;
  personId: string;
  personName: string;
  checklistTitle: string;
  status: Checkoff["status"];
  outcome: Outcome | null;
  preceptorName: string | null;
  practiceBy: string | null;
  updatedAt: Date;
};

async function listWhere(orgId: string, where: ReturnType<typeof and>, limit = 100): Promise<CheckoffListRow[]> {
  const { db } = await database();
  const person = alias(people, "person");
  const preceptor = alias(people, "preceptor");
  return db
    .select({
      id: checkoffs.id,
      personId: checkoffs.personId,
      personName: person.name,
      checklistTitle: checklists.title,
      status: checkoffs.status,
      outcome: checkoffs.outcome,
      preceptorName: preceptor.name,
      practiceBy: checkoffs.practiceBy,
      updatedAt: checkoffs.updatedAt,
    })
    .from(checkoffs)
    .innerJoin(person, and(eq(person.id, checkoffs.personId), eq(person.orgId, orgId)))
    .leftJoin(preceptor, and(eq(preceptor.id, checkoffs.preceptorId), eq(preceptor.orgId, orgId)))
    .innerJoin(checklistVersions, eq(checklistVersions.id, checkoffs.checklistVersionId))
    .innerJoin(checklists, eq(checklists.id, checklistVersions.checklistId))
    .where(and(eq(checkoffs.orgId, orgId), where))
    .orderBy(desc(checkoffs.updatedAt))
    .limit(limit);
}

/** The person's own check-offs, newest first. */
export function listOwnCheckoffs(orgId: string, personId: string) {
  return listWhere(orgId, and(eq(checkoffs.personId, personId)));
}

/** Open check-offs of others a preceptor may pick up: requested by anyone, or in progress with them. */
export function listToObserve(orgId: string, preceptorId: string) {
  return listWhere(
    orgId,
    and(
      ne(checkoffs.personId, preceptorId),
      or(eq(checkoffs.status, "requested"), and(eq(checkoffs.status, "in-progress"), eq(checkoffs.preceptorId, preceptorId))),
    ),
  );
}

/** Everyone's recent check-offs, for educators and managers (read). */
export function listRecentCheckoffs(orgId: string) {
  return listWhere(orgId, and(ne(checkoffs.status, "cancelled")), 50);
}

export type PersonOption = { id: string; name: string };

/** Active people of the organisation holding the therapist role, except one (the preceptor). */
export async function listTherapists(orgId: string, exceptId: string): Promise<PersonOption[]> {
  const { db } = await database();
  return db
    .selectDistinct({ id: people.id, name: people.name })
    .from(people)
    .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.orgId, orgId), eq(personRoles.role, "therapist")))
    .where(and(eq(people.orgId, orgId), eq(people.active, true), ne(people.id, exceptId)))
    .orderBy(asc(people.name));
}

export type ChecklistOption = { id: string; title: string; versionId: string };

/** Published checklists with their current version: what a check-off can be of. */
export async function listPublishedChecklists(orgId: string): Promise<ChecklistOption[]> {
  const { db } = await database();
  const rows = await db
    .select({ id: checklists.id, title: checklists.title, versionId: checklists.currentVersionId })
    .from(checklists)
    .where(and(eq(checklists.orgId, orgId), eq(checklists.status, "published")))
    .orderBy(asc(checklists.title));
  return rows.filter((r): r is ChecklistOption => !!r.versionId);
}
