/**
 * Alder Bay Hospital — a small second organisation that exists only to prove that
 * organisations never see each other's data (PRODUCT.md "Demo scenario"). One unit, an admin,
 * a manager, a preceptor, two educators and a few therapists with credentials. Its state licence
 * ends in the holder's birth month, so the second validity rule is exercised too.
 *
 * Every role has records of its own kind here, so the authorisation matrix
 * (tests/e2e/authorisation.spec.ts) can ask for Alder Bay's own records as well as Kestrel
 * Valley's: the same exams, bank and checklists as Kestrel Valley (under Alder Bay's ids), graded
 * sittings of the annual exam, check-offs signed by the preceptor with their certificates, and
 * credential scans.
 */
import { addBank } from "./bank";
import { addDays, addMonths, instantOn, withDay, type IsoDate } from "./calendar";
import {
  addChecklists,
  addCredentialTypes,
  addExams,
  addRegulatoryReferences,
  addTopics,
  CREDENTIAL_TYPES,
  type CredentialTypeCode,
  type CredentialTypeSpec,
  type OrgContext,
} from "./catalogue";
import { drawStatus } from "./credential-dates";
import { addSeededCertificates } from "./certificates";
import { addCredential, type CredentialOptions } from "./credential-records";
import { emptyDataset, type Dataset } from "./dataset";
import { gradedSittings, normal } from "./exam-history";
import { addSignedCheckoff } from "./orientation-checkoffs";
import { createNamer } from "./names";
import { prngFor } from "./prng";
import { addPerson, addUnits, type SeededPerson } from "./roster";
import { addSeededScan } from "./scans";
import { idsFor } from "./stable-ids";

export const ALDER_BAY = {
  name: "Alder Bay Hospital",
  slug: "alder-bay",
  domain: "alderbay.test",
  timeZone: "America/Los_Angeles",
  admin: "admin@alderbay.test",
} as const;

const THERAPISTS = 4;
const HELD: readonly CredentialTypeCode[] = ["state-licence", "board-credential", "basic-life-support", "advanced-cardiac-life-support"];

function alderBayTypes(): CredentialTypeSpec[] {
  return CREDENTIAL_TYPES.filter((t) => HELD.includes(t.code)).map((t) =>
    t.code === "state-licence" ? { ...t, name: "State respiratory care licence (birth month)", rule: { kind: "birth-month", years: 2 } } : t,
  );
}

export function buildAlderBay(options: { today: IsoDate }): { data: Dataset; orgId: string; people: SeededPerson[] } {
  const id = idsFor("ab");
  const data = emptyDataset();
  const ctx: OrgContext = { data, id, orgId: id("organisation"), today: options.today, at: instantOn(options.today) };
  data.organisations.push({
    id: ctx.orgId,
    name: ALDER_BAY.name,
    slug: ALDER_BAY.slug,
    timeZone: ALDER_BAY.timeZone,
    settings: { reminderDays: [60, 30, 7, 0], contactEmail: `education@${ALDER_BAY.domain}` },
    createdAt: ctx.at,
    updatedAt: ctx.at,
  });
  const units = addUnits(ctx, [{ key: "critical-care", name: "Critical Care", code: "CC" }] as const);
  const unit = units["critical-care"];
  const t = ctx.today;
  const hired = (months: number, day: number) => withDay(addMonths(t, -months), day);

  const admin = addPerson(
    ctx,
    { key: "admin", name: "Perpetua Lindqvist", email: ALDER_BAY.admin, employeeId: "AB-0101", title: "Systems Administrator", credentialLetters: null, hireDate: hired(64, 3), homeUnitId: unit, birthMonth: null, roles: ["admin"] },
    null,
  );
  const nextName = createNamer(prngFor("ab:names"), ALDER_BAY.domain, [ALDER_BAY.admin]);
  const managerName = nextName();
  const manager = addPerson(
    ctx,
    { key: "manager", name: managerName.name, email: managerName.email, employeeId: "AB-0102", title: "Respiratory Care Manager", credentialLetters: "RRT", hireDate: hired(150, 11), homeUnitId: unit, birthMonth: 6, roles: ["manager"], manages: [unit] },
    admin.id,
  );
  const people: SeededPerson[] = [admin, manager];
  for (let i = 1; i <= THERAPISTS; i++) {
    const prng = prngFor(`ab:person:${i}`);
    const name = nextName();
    people.push(
      addPerson(
        ctx,
        { key: i, name: name.name, email: name.email, employeeId: `AB-${1000 + i}`, title: "Respiratory Therapist", credentialLetters: "RRT", hireDate: hired(prng.int(14, 200), prng.int(1, 28)), homeUnitId: unit, birthMonth: prng.int(1, 12), roles: ["therapist"] },
        admin.id,
      ),
    );
  }

  // Drawn after the therapists, so the people seeded before these two keep their names and addresses.
  const preceptorName = nextName();
  const preceptor = addPerson(
    ctx,
    { key: "preceptor", name: preceptorName.name, email: preceptorName.email, employeeId: "AB-0103", title: "Respiratory Therapist III, Preceptor", credentialLetters: "RRT", hireDate: hired(131, 17), homeUnitId: unit, birthMonth: 2, roles: ["therapist", "preceptor"] },
    admin.id,
  );
  const educatorName = nextName();
  const educator = addPerson(
    ctx,
    { key: "educator", name: educatorName.name, email: educatorName.email, employeeId: "AB-0104", title: "Clinical Educator, Respiratory Care", credentialLetters: "RRT", hireDate: hired(97, 9), homeUnitId: unit, birthMonth: 10, roles: ["therapist", "educator"] },
    admin.id,
  );
  // A second educator: bank items are written by one educator and approved by another.
  const reviewerName = nextName();
  const reviewer = addPerson(
    ctx,
    { key: "educator-2", name: reviewerName.name, email: reviewerName.email, employeeId: "AB-0105", title: "Clinical Educator, Respiratory Care", credentialLetters: "RRT", hireDate: hired(58, 23), homeUnitId: unit, birthMonth: 7, roles: ["therapist", "educator"] },
    admin.id,
  );
  people.push(preceptor, educator, reviewer);

  addTopics(ctx);
  const references = addRegulatoryReferences(ctx, [
    { key: "competence", code: "Accreditation standard HR-01", title: "Competence assessed at hire and periodically", body: "Alder Bay's own copy of the standard's wording.", verifiedDaysAgo: 20 },
  ]);
  const types = addCredentialTypes(ctx, alderBayTypes());
  for (const code of HELD) {
    const type = types.get(code);
    ctx.data.requirements.push({
      id: ctx.id("requirement", code),
      orgId: ctx.orgId,
      name: type?.spec.name ?? code,
      kind: "credential",
      examId: null,
      checklistId: null,
      credentialTypeId: type?.id,
      recurrence: null,
      graceDays: 0,
      unitId: null,
      role: "therapist",
      regulatoryReferenceId: references.get("competence") ?? null,
      lapseLeaves: code === "advanced-cardiac-life-support" ? "supervised" : "not-cleared",
      active: true,
      createdAt: ctx.at,
      updatedAt: ctx.at,
    });
  }
  const credentialOptions: CredentialOptions = {
    issuers: { licence: "State respiratory care board", board: "National respiratory therapy credentialing board", "life-support": "Alder Bay Training Center", other: "Alder Bay Hospital" },
    verifier: manager.id,
  };
  for (const person of people.filter((p) => p.roles.includes("therapist"))) {
    const prng = prngFor(`ab:credentials:${person.key}`);
    for (const code of HELD) {
      const type = types.get(code);
      if (type) addCredential(ctx, person, type, { status: drawStatus(prng, 0.05, 0.15) }, prng, credentialOptions);
    }
  }
  addAlderBayRecords(ctx, { people, preceptor, educators: [educator, reviewer] });
  return { data, orgId: ctx.orgId, people };
}

/** Months before the demo day that the bank and exams came into use (as in Kestrel Valley). */
const BANK_IN_USE_MONTHS = 30;

/**
 * Records of every kind the authorisation matrix asks for: exams, bank and checklists written by
 * the educators; graded sittings of the annual exam (two therapists, the preceptor and the
 * educator); check-offs the preceptor observed and signed (two therapists and the educator) with
 * their certificates; and a scan of each credential holder's state licence.
 */
function addAlderBayRecords(ctx: OrgContext, who: { people: SeededPerson[]; preceptor: SeededPerson; educators: [SeededPerson, SeededPerson] }): void {
  const { preceptor } = who;
  const [educator, reviewer] = who.educators;
  const therapists = who.people.filter((p) => p.roles.length === 1 && p.roles[0] === "therapist");
  const inUseSince: OrgContext = { ...ctx, at: instantOn(addMonths(ctx.today, -BANK_IN_USE_MONTHS)) };
  const exams = addExams(inUseSince, educator.id);
  addChecklists(ctx, educator.id);
  // The two educators take turns writing and approving, as in Kestrel Valley.
  addBank(inUseSince, [educator.id, reviewer.id]);

  const annual = exams.get("annual-modes");
  if (!annual) throw new Error("Alder Bay's annual exam was not built");
  const sit = gradedSittings(ctx, { examId: annual, versionId: ctx.id("exam-version", "annual-modes", 1) }, "ab");
  [therapists[0], therapists[1], preceptor, educator].forEach((person, i) => {
    if (!person) return;
    const theta = normal(prngFor(`ab:ability:${person.key}`));
    sit(person, "this-year", 1, addDays(ctx.today, -(20 + 9 * i)), theta);
  });

  const checkoffsOf = [therapists[0], therapists[1], educator];
  checkoffsOf.forEach((hire, i) => {
    if (hire) addSignedCheckoff(ctx, { hire, preceptor, checklistKey: i === 2 ? "high-pressure-alarm" : "circuit-change", on: addDays(ctx.today, -(15 + 11 * i)), timeZone: ALDER_BAY.timeZone });
  });
  addSeededCertificates(ctx, ALDER_BAY.timeZone);

  for (const person of who.people) {
    const credentialId = ctx.id("credential", person.key, "state-licence");
    if (ctx.data.credentials.some((c) => c.id === credentialId)) addSeededScan(ctx, credentialId, `state-licence-${person.employeeId}`);
  }
}
