/**
 * Alder Bay Hospital — a small second organisation that exists only to prove that
 * organisations never see each other's data (PRODUCT.md "Demo scenario"). One unit, an admin,
 * a manager and a few therapists with credentials. Its state licence ends in the holder's
 * birth month, so the second validity rule is exercised too.
 */
import { addMonths, instantOn, withDay, type IsoDate } from "./calendar";
import {
  addCredentialTypes,
  addRegulatoryReferences,
  addTopics,
  CREDENTIAL_TYPES,
  type CredentialTypeCode,
  type CredentialTypeSpec,
  type OrgContext,
} from "./catalogue";
import { drawStatus } from "./credential-dates";
import { addCredential, type CredentialOptions } from "./credential-records";
import { emptyDataset, type Dataset } from "./dataset";
import { createNamer } from "./names";
import { prngFor } from "./prng";
import { addPerson, addUnits, type SeededPerson } from "./roster";
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
  return { data, orgId: ctx.orgId, people };
}
