/**
 * The survey evidence packet (issue 9 §4): for one person, or everyone on a unit, every
 * requirement with its status today (My plan's engine, `getPlan`) and the evidence behind it —
 * credentials (number, issuer, dates, who verified them and how), exam attempts (score, date),
 * check-offs (method, assessor, outcome and every signature: printed name, date and time,
 * meaning — US 21 CFR Part 11 §11.50) — and the person's certificates.
 * Only people and units inside the viewer's scope are found; anything else is null (a 404).
 */
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database } from "~/db/client.server";
import { checklists, checklistVersions, checkoffs, credentials, credentialTypes, exams, examVersions, attempts, people, requirements, signatures, units } from "~/db/schema";
import { calendarDateIn, type IsoDate, type Status, type StatusOptions } from "~/domain/status";
import { manifestSignature } from "~/domain/checkoffs/record";
import { methodLabel } from "~/domain/checkoffs/methods";
import { listCertificatesOf, type CertificateRow } from "./certificates.server";
import { onUnits } from "./credential-summary.server";
import { getPlan } from "./plan.server";
import type { ReportScope } from "./reports.server";

export type PacketTarget = { kind: "person"; id: string } | { kind: "unit"; id: string };

export type PacketCredential = { typeName: string; number: string | null; issuer: string | null; issuedOn: IsoDate; validThrough: IsoDate | null; verifiedBy: string | null; verifiedOn: IsoDate | null; verificationMethod: string | null };
export type PacketAttempt = { exam: string; version: number; on: IsoDate | null; scorePercent: number | null; passed: boolean | null };
export type PacketCheckoff = { checklist: string; version: number; method: string; assessor: string | null; status: string; outcome: string | null; signedOn: IsoDate | null; signatures: { name: string; when: string; meaning: string }[] };
export type PacketRequirement = {
  title: string;
  kind: "exam" | "checklist" | "credential";
  status: Status;
  date: IsoDate | null;
  dateMeaning: "due" | "valid-through";
  extendedTo: IsoDate | null;
  waivedThrough: IsoDate | null;
  waivers: { reason: string; endsOn: IsoDate }[];
  extensions: { reason: string; newDueOn: IsoDate }[];
  credentials: PacketCredential[];
  attempts: PacketAttempt[];
  checkoffs: PacketCheckoff[];
};
export type PacketPerson = {
  id: string;
  name: string;
  employeeId: string | null;
  title: string | null;
  credentialLetters: string | null;
  homeUnit: string | null;
  hireDate: IsoDate | null;
  active: boolean;
  requirements: PacketRequirement[];
  certificates: CertificateRow[];
};
export type Packet = { subject: string; kind: PacketTarget["kind"]; people: PacketPerson[] };

/** The people a packet covers, or null when the target is not in the viewer's organisation and scope. */
async function peopleOf(orgId: string, scope: ReportScope, target: PacketTarget): Promise<{ subject: string; ids: string[] } | null> {
  const { db } = await database();
  if (target.kind === "person") {
    const rows = await db.all<{ id: string; name: string }>(sql`select p.id, p.name from people p where p.org_id = ${orgId} and p.id = ${target.id} and ${onUnits(orgId, scope.unitIds)}`);
    return rows[0] ? { subject: rows[0].name, ids: [rows[0].id] } : null;
  }
  if (scope.unitIds !== null && !scope.unitIds.includes(target.id)) return null;
  const [unit] = await db.select({ id: units.id, name: units.name }).from(units).where(and(eq(units.orgId, orgId), eq(units.id, target.id)));
  if (!unit) return null;
  const rows = await db.all<{ id: string }>(sql`
    select p.id from people p where p.org_id = ${orgId} and p.active = 1 and ${onUnits(orgId, [unit.id])}
    order by p.name collate nocase, p.id`);
  return { subject: unit.name, ids: rows.map((r) => r.id) };
}

const verifier = alias(people, "verifier");
const assessor = alias(people, "assessor");

export async function loadPacket(orgId: string, scope: ReportScope, timeZone: string, options: Required<StatusOptions>, target: PacketTarget): Promise<Packet | null> {
  const found = await peopleOf(orgId, scope, target);
  if (!found) return null;
  const { db } = await database();
  const ids = found.ids;
  const dateOf = (d: Date | null) => (d ? calendarDateIn(timeZone, d) : null);
  const [persons, reqs, creds, tries, observed] = await Promise.all([
    ids.length === 0
      ? []
      : db
          .select({ p: people, homeUnit: units.name })
          .from(people)
          .leftJoin(units, and(eq(units.id, people.homeUnitId), eq(units.orgId, orgId)))
          .where(and(eq(people.orgId, orgId), inArray(people.id, ids))),
    db.select({ id: requirements.id, examId: requirements.examId, checklistId: requirements.checklistId, credentialTypeId: requirements.credentialTypeId }).from(requirements).where(eq(requirements.orgId, orgId)),
    ids.length === 0
      ? []
      : db
          .select({ c: credentials, typeName: credentialTypes.name, verifiedBy: verifier.name })
          .from(credentials)
          .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
          .leftJoin(verifier, and(eq(verifier.id, credentials.verifiedBy), eq(verifier.orgId, orgId)))
          .where(and(eq(credentials.orgId, orgId), inArray(credentials.personId, ids)))
          .orderBy(sql`${credentials.issuedOn} desc`),
    ids.length === 0
      ? []
      : db
          .select({ personId: attempts.personId, examId: examVersions.examId, exam: exams.title, version: examVersions.version, submittedAt: attempts.submittedAt, scorePercent: attempts.scorePercent, passed: attempts.passed })
          .from(attempts)
          .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
          .innerJoin(exams, and(eq(exams.id, examVersions.examId), eq(exams.orgId, orgId)))
          .where(and(eq(attempts.orgId, orgId), inArray(attempts.personId, ids), sql`${attempts.submittedAt} is not null`))
          .orderBy(sql`${attempts.submittedAt} desc`),
    ids.length === 0
      ? []
      : db
          .select({ id: checkoffs.id, personId: checkoffs.personId, checklistId: checklistVersions.checklistId, checklist: checklists.title, version: checklistVersions.version, method: checklistVersions.method, assessor: assessor.name, status: checkoffs.status, outcome: checkoffs.outcome, signedAt: checkoffs.signedAt })
          .from(checkoffs)
          .innerJoin(checklistVersions, and(eq(checklistVersions.id, checkoffs.checklistVersionId), eq(checklistVersions.orgId, orgId)))
          .innerJoin(checklists, and(eq(checklists.id, checklistVersions.checklistId), eq(checklists.orgId, orgId)))
          .leftJoin(assessor, and(eq(assessor.id, checkoffs.preceptorId), eq(assessor.orgId, orgId)))
          .where(and(eq(checkoffs.orgId, orgId), inArray(checkoffs.personId, ids), inArray(checkoffs.status, ["signed", "acknowledged"])))
          .orderBy(sql`${checkoffs.signedAt} desc`),
  ]);
  const checkoffIds = observed.map((c) => c.id);
  const sigs =
    checkoffIds.length === 0
      ? []
      : await db
          .select()
          .from(signatures)
          .where(and(eq(signatures.orgId, orgId), eq(signatures.recordType, "checkoff"), inArray(signatures.recordId, checkoffIds)))
          .orderBy(asc(signatures.signedAt));
  const reqById = new Map(reqs.map((r) => [r.id, r]));
  const byId = new Map(persons.map((r) => [r.p.id, r]));

  const out: PacketPerson[] = [];
  for (const id of ids) {
    const row = byId.get(id);
    if (!row) continue;
    const [plan, certificates] = await Promise.all([getPlan(orgId, id, timeZone, options), listCertificatesOf(orgId, id, options.today)]);
    const requirementsOut: PacketRequirement[] = (plan ?? []).map((r) => {
      const req = r.requirementId ? reqById.get(r.requirementId) : undefined;
      const typeId = req?.credentialTypeId ?? r.credentialTypeId ?? null;
      const evidence = r.evidence ?? [];
      return {
        title: r.title,
        kind: r.kind,
        status: r.result.status,
        date: r.result.date,
        dateMeaning: r.dateMeaning,
        extendedTo: r.extendedTo,
        waivedThrough: r.result.waivedThrough ?? null,
        waivers: evidence.flatMap((e) => (e.kind === "waiver" ? [{ reason: e.reason, endsOn: e.endsOn }] : [])),
        extensions: evidence.flatMap((e) => (e.kind === "extension" ? [{ reason: e.reason, newDueOn: e.newDueOn }] : [])),
        credentials:
          r.kind === "credential" && typeId
            ? creds
                .filter((c) => c.c.personId === id && c.c.credentialTypeId === typeId)
                .map((c) => ({
                  typeName: c.typeName,
                  number: c.c.number,
                  issuer: c.c.issuer,
                  issuedOn: c.c.issuedOn,
                  validThrough: c.c.validThrough,
                  verifiedBy: c.verifiedBy,
                  verifiedOn: dateOf(c.c.verifiedAt),
                  verificationMethod: c.c.verificationMethod,
                }))
            : [],
        attempts:
          r.kind === "exam" && req?.examId
            ? tries.filter((t) => t.personId === id && t.examId === req.examId).map((t) => ({ exam: t.exam, version: t.version, on: dateOf(t.submittedAt), scorePercent: t.scorePercent, passed: t.passed }))
            : [],
        checkoffs:
          r.kind === "checklist" && req?.checklistId
            ? observed
                .filter((c) => c.personId === id && c.checklistId === req.checklistId)
                .map((c) => ({
                  checklist: c.checklist,
                  version: c.version,
                  method: methodLabel(c.method),
                  assessor: c.assessor,
                  status: c.status,
                  outcome: c.outcome,
                  signedOn: dateOf(c.signedAt),
                  signatures: sigs.filter((s) => s.recordId === c.id).map((s) => manifestSignature(s)),
                }))
            : [],
      };
    });
    out.push({
      id,
      name: row.p.name,
      employeeId: row.p.employeeId,
      title: row.p.title,
      credentialLetters: row.p.credentialLetters,
      homeUnit: row.homeUnit,
      hireDate: row.p.hireDate,
      active: row.p.active,
      requirements: requirementsOut,
      certificates,
    });
  }
  return { subject: found.subject, kind: target.kind, people: out };
}

/** People and units the viewer may make a packet for (the packet page's choices). */
export async function packetChoices(orgId: string, scope: ReportScope, q: string): Promise<{ units: { id: string; name: string }[]; people: { id: string; name: string; employeeId: string | null; homeUnit: string | null }[]; matching: number }> {
  const { db } = await database();
  const needle = q.trim();
  const pattern = `%${needle.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  const search = needle ? sql`(p.name like ${pattern} escape '\\' or coalesce(p.employee_id, '') like ${pattern} escape '\\')` : sql`1`;
  const [unitRows, peopleRows] = await Promise.all([
    db.all<{ id: string; name: string }>(
      scope.unitIds === null
        ? sql`select id, name from units where org_id = ${orgId} and active = 1 order by name`
        : scope.unitIds.length === 0
          ? sql`select id, name from units where 0`
          : sql`select id, name from units where org_id = ${orgId} and id in (${sql.join(scope.unitIds.map((id) => sql`${id}`), sql`, `)}) order by name`,
    ),
    db.all<{ id: string; name: string; employee_id: string | null; home_unit: string | null }>(sql`
      select p.id, p.name, p.employee_id, u.name as home_unit from people p
      left join units u on u.id = p.home_unit_id and u.org_id = ${orgId}
      where p.org_id = ${orgId} and p.active = 1 and ${onUnits(orgId, scope.unitIds)} and ${search}
      order by p.name collate nocase, p.id`),
  ]);
  return {
    units: unitRows,
    people: peopleRows.slice(0, 50).map((p) => ({ id: p.id, name: p.name, employeeId: p.employee_id, homeUnit: p.home_unit })),
    matching: peopleRows.length,
  };
}
