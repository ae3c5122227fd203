/**
 * Credentials (cards and licences): what a person holds, recording a new one with its scan, a
 * manager's verification against the primary source, and who may see a scan. Organisation id
 * first, always the viewer's; every write goes through the queue with its audit event.
 */
import { and, asc, desc, eq, inArray, isNull, or, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { credentials, credentialTypes, files, people, personUnits } from "~/db/schema";
import { storeScan } from "~/files/store.server";
import { isStoredRule, type CredentialTerms } from "~/domain/validity";

export { VERIFICATION_METHODS } from "~/routes/credentials/schemas";

export type CredentialTypeOption = { id: string; name: string; category: string; terms: CredentialTerms };

export async function listCredentialTypes(orgId: string): Promise<CredentialTypeOption[]> {
  const { db } = await database();
  const rows = await db.select().from(credentialTypes).where(eq(credentialTypes.orgId, orgId)).orderBy(asc(credentialTypes.name));
  return rows
    .filter((r) => isStoredRule(r.rule))
    .map((r) => ({
      id: r.id,
      name: r.name,
      category: r.category,
      terms: { rule: r.rule as CredentialTerms["rule"], neverExpiresIfIssuedBefore: r.neverExpiresIfIssuedBefore, reinstatementMonths: r.reinstatementMonths },
    }));
}

/** Units a manager manages. */
async function managedUnitIds(orgId: string, managerId: string): Promise<string[]> {
  const { db } = await database();
  const rows = await db
    .select({ unitId: personUnits.unitId })
    .from(personUnits)
    .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, managerId), eq(personUnits.relation, "manages")));
  return rows.map((r) => r.unitId);
}

export type ManagedPerson = { id: string; name: string; birthMonth: number | null };

/** People on the units a manager manages (home unit or member), the manager excluded. */
export async function listManagedPeople(orgId: string, managerId: string): Promise<ManagedPerson[]> {
  const units = await managedUnitIds(orgId, managerId);
  if (units.length === 0) return [];
  const { db } = await database();
  const members = db
    .select({ personId: personUnits.personId })
    .from(personUnits)
    .where(and(eq(personUnits.orgId, orgId), eq(personUnits.relation, "member"), inArray(personUnits.unitId, units)));
  return db
    .select({ id: people.id, name: people.name, birthMonth: people.birthMonth })
    .from(people)
    .where(and(eq(people.orgId, orgId), eq(people.active, true), or(inArray(people.homeUnitId, units), inArray(people.id, members))))
    .orderBy(asc(people.name));
}

/** May `viewerId` act on `personId`'s credentials: themselves, or a manager of one of their units. */
export async function mayActFor(orgId: string, viewerId: string, personId: string, canVerify: boolean): Promise<boolean> {
  if (viewerId === personId) return (await personOf(orgId, personId)) !== null;
  if (!canVerify) return false;
  const managed = await listManagedPeople(orgId, viewerId);
  return managed.some((p) => p.id === personId);
}

export async function personOf(orgId: string, personId: string): Promise<ManagedPerson | null> {
  const { db } = await database();
  const [row] = await db
    .select({ id: people.id, name: people.name, birthMonth: people.birthMonth })
    .from(people)
    .where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  return row ?? null;
}

export type CredentialRow = {
  id: string;
  personId: string;
  personName: string;
  typeName: string;
  number: string | null;
  issuer: string | null;
  issuedOn: string;
  validThrough: string | null;
  hasScan: boolean;
  verifiedAt: Date | null;
  verifiedByName: string | null;
  verificationMethod: string | null;
  /** The type's reinstatement window after expiry, in months (the board credential's 6), or null. */
  reinstatementMonths: number | null;
};

const verifier = alias(people, "verifier");

function credentialSelect() {
  return {
    id: credentials.id,
    personId: credentials.personId,
    personName: people.name,
    typeName: credentialTypes.name,
    number: credentials.number,
    issuer: credentials.issuer,
    issuedOn: credentials.issuedOn,
    validThrough: credentials.validThrough,
    hasScan: sql<boolean>`${credentials.scanFileId} is not null`.mapWith(Boolean),
    verifiedAt: credentials.verifiedAt,
    verifiedByName: verifier.name,
    verificationMethod: credentials.verificationMethod,
    reinstatementMonths: credentialTypes.reinstatementMonths,
  };
}

/** A person's credentials, newest issue first. */
export async function listCredentialsOf(orgId: string, personId: string): Promise<CredentialRow[]> {
  const { db } = await database();
  return db
    .select(credentialSelect())
    .from(credentials)
    .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, credentials.personId), eq(people.orgId, orgId)))
    .leftJoin(verifier, eq(verifier.id, credentials.verifiedBy))
    .where(and(eq(credentials.orgId, orgId), eq(credentials.personId, personId)))
    .orderBy(asc(credentialTypes.name), desc(credentials.issuedOn));
}

/** Credentials on a manager's units still waiting for verification, oldest first. */
export async function listAwaitingVerification(orgId: string, managerId: string, limit = 50): Promise<CredentialRow[]> {
  const managed = await listManagedPeople(orgId, managerId);
  if (managed.length === 0) return [];
  const { db } = await database();
  return db
    .select(credentialSelect())
    .from(credentials)
    .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, credentials.personId), eq(people.orgId, orgId)))
    .leftJoin(verifier, eq(verifier.id, credentials.verifiedBy))
    .where(and(eq(credentials.orgId, orgId), isNull(credentials.verifiedAt), inArray(credentials.personId, managed.map((p) => p.id))))
    .orderBy(asc(credentials.createdAt))
    .limit(limit);
}

export type NewCredential = {
  personId: string;
  credentialTypeId: string;
  number: string | null;
  issuer: string | null;
  issuedOn: string;
  validThrough: string | null;
  /** The date the type's rule proposed, kept in the audit event when the person changed it. */
  proposedValidThrough: string | null;
  scan: { bytes: Uint8Array; name: string } | null;
};

export type RecordResult = { ok: true; credentialId: string } | { ok: false; field: "scan" | "credentialTypeId"; message: string };

/** Records a credential and its scan in one transaction (the scan's bytes are checked by content first). */
export async function recordCredential(orgId: string, actorId: string, input: NewCredential): Promise<RecordResult> {
  const { db, write } = await database();
  const [type] = await db
    .select({ id: credentialTypes.id, name: credentialTypes.name })
    .from(credentialTypes)
    .where(and(eq(credentialTypes.orgId, orgId), eq(credentialTypes.id, input.credentialTypeId)));
  if (!type) return { ok: false, field: "credentialTypeId", message: "That credential type is not one of your organisation's. Choose one from the list." };
  return write(async (tx) => {
    let scanFileId: string | null = null;
    if (input.scan) {
      const stored = await storeScan(tx, { orgId, ownerId: input.personId, purpose: "credential-scan", bytes: input.scan.bytes, originalName: input.scan.name });
      if (!stored.ok) return { ok: false as const, field: "scan" as const, message: stored.message };
      scanFileId = stored.file.id;
    }
    const [row] = await tx
      .insert(credentials)
      .values({
        orgId,
        personId: input.personId,
        credentialTypeId: type.id,
        number: input.number,
        issuer: input.issuer,
        issuedOn: input.issuedOn,
        validThrough: input.validThrough,
        scanFileId,
      })
      .returning({ id: credentials.id });
    await recordAudit(tx, {
      orgId,
      actorId,
      action: "credential.recorded",
      entityType: "credential",
      entityId: row.id,
      detail: {
        personId: input.personId,
        type: type.name,
        issuedOn: input.issuedOn,
        validThrough: input.validThrough,
        proposedValidThrough: input.proposedValidThrough,
        scanFileId,
      },
    });
    return { ok: true as const, credentialId: row.id };
  });
}

/** A manager marks a credential verified against the primary source: who, when, how. */
export async function verifyCredential(orgId: string, managerId: string, credentialId: string, method: string, now: Date = new Date()): Promise<"verified" | "not-found"> {
  const { db, write } = await database();
  const [row] = await db
    .select({ id: credentials.id, personId: credentials.personId, verifiedAt: credentials.verifiedAt })
    .from(credentials)
    .where(and(eq(credentials.orgId, orgId), eq(credentials.id, credentialId)));
  if (!row || !(await mayActFor(orgId, managerId, row.personId, true)) || row.personId === managerId) return "not-found";
  await write(async (tx) => {
    await tx
      .update(credentials)
      .set({ verifiedBy: managerId, verifiedAt: now, verificationMethod: method, updatedAt: now })
      .where(and(eq(credentials.orgId, orgId), eq(credentials.id, credentialId)));
    await recordAudit(tx, { orgId, actorId: managerId, action: "credential.verified", entityType: "credential", entityId: credentialId, detail: { personId: row.personId, method } }, now);
  });
  return "verified";
}

/** The scan's file row, only when `viewerId` is its holder or one of their managers. */
export async function scanFor(orgId: string, viewerId: string, canVerify: boolean, credentialId: string) {
  const { db } = await database();
  const [row] = await db
    .select({ personId: credentials.personId, file: files, typeName: credentialTypes.name })
    .from(credentials)
    .innerJoin(files, and(eq(files.id, credentials.scanFileId), eq(files.orgId, orgId)))
    .innerJoin(credentialTypes, eq(credentialTypes.id, credentials.credentialTypeId))
    .where(and(eq(credentials.orgId, orgId), eq(credentials.id, credentialId)));
  if (!row) return null;
  if (!(await mayActFor(orgId, viewerId, row.personId, canVerify))) return null;
  return row;
}
