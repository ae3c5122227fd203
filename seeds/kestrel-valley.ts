/**
 * Kestrel Valley Medical Center — the invented demo hospital of PRODUCT.md "Demo scenario":
 * four units, about forty therapists (six preceptors, two educators, three new hires in
 * orientation), one manager, one admin, and the five demo addresses. With `people` set it
 * builds a larger hospital with the same role mix, for benchmarks.
 */
import { addBank } from "./bank";
import type { Role } from "../app/auth/roles";
import { addDays, addMonths, instantOn, withDay, type IsoDate } from "./calendar";
import {
  addChecklists,
  addCredentialTypes,
  addExams,
  addRegulatoryReferences,
  addTopics,
  CREDENTIAL_TYPES,
  REGULATORY_REFERENCES,
  type OrgContext,
} from "./catalogue";
import { emptyDataset, type Dataset } from "./dataset";
import { addExamHistory } from "./exam-history";
import { addKvRecords } from "./kestrel-valley-records";
import { createNamer } from "./names";
import { prngFor, type Prng } from "./prng";
import { addPerson, addUnits, type PersonSpec, type SeededPerson } from "./roster";
import { idsFor } from "./stable-ids";

export const KESTREL_VALLEY = {
  name: "Kestrel Valley Medical Center",
  slug: "kestrel-valley",
  domain: "kestrelvalley.test",
  timeZone: "America/Chicago",
} as const;

/** 40 therapists (6 preceptors, 2 educators, 3 new hires among them), 1 manager, 1 admin. */
export const KV_DEFAULT_PEOPLE = 42;
/** How long the question bank and the exams have been in use (their versions' dates). */
const BANK_IN_USE_MONTHS = 38;
/** The five demo accounts need room around them. */
export const KV_MIN_PEOPLE = 12;

export const DEMO_ACCOUNTS = {
  therapist: "therapist@kestrelvalley.test",
  preceptor: "preceptor@kestrelvalley.test",
  educator: "educator@kestrelvalley.test",
  manager: "manager@kestrelvalley.test",
  admin: "admin@kestrelvalley.test",
} as const;

export type KvUnitKey = "adult-icu" | "neonatal-icu" | "emergency" | "adult-floors";
export type KvPerson = SeededPerson & { unit: KvUnitKey };

export type RoleMix = { admins: number; managers: number; therapists: number; preceptors: number; educators: number; newHires: number };

/** The default hospital's ratios, scaled to `total` people (at least one of each). */
export function roleMix(total: number): RoleMix {
  if (!Number.isInteger(total) || total < KV_MIN_PEOPLE) throw new RangeError(`people must be a whole number of at least ${KV_MIN_PEOPLE}`);
  const scale = total / KV_DEFAULT_PEOPLE;
  const admins = Math.max(1, Math.round(scale));
  const managers = Math.max(1, Math.round(scale));
  const therapists = total - admins - managers;
  const share = (n: number) => Math.max(1, Math.round((therapists * n) / 40));
  return { admins, managers, therapists, preceptors: share(6), educators: share(2), newHires: share(3) };
}

/** Home units of generated therapists, in a 20-long cycle: 35 % Adult ICU, 20 % Neonatal ICU, 20 % Emergency, 25 % Adult Floors. */
const UNIT_CYCLE: readonly KvUnitKey[] = [
  "adult-icu", "adult-floors", "neonatal-icu", "adult-icu", "emergency",
  "adult-icu", "adult-floors", "neonatal-icu", "emergency", "adult-icu",
  "adult-floors", "adult-icu", "neonatal-icu", "emergency", "adult-icu",
  "adult-floors", "neonatal-icu", "emergency", "adult-icu", "adult-floors",
];
const NEW_HIRE_UNITS: readonly KvUnitKey[] = ["neonatal-icu", "emergency", "adult-icu", "adult-floors"];
const UNIT_ORDER: readonly KvUnitKey[] = ["adult-icu", "neonatal-icu", "emergency", "adult-floors"];

export type KvRoster = {
  units: Record<KvUnitKey, string>;
  demo: Record<keyof typeof DEMO_ACCOUNTS, KvPerson>;
  /** Everyone holding the therapist role, demo accounts first. */
  therapists: KvPerson[];
  preceptors: KvPerson[];
  newHires: KvPerson[];
  /** Generated staff therapists with no other role, not in orientation. */
  staff: KvPerson[];
  managers: KvPerson[];
};

const monthsAgo = (today: IsoDate, months: number, day: number) => withDay(addMonths(today, -months), day);

function buildRoster(ctx: OrgContext, total: number): KvRoster {
  const mix = roleMix(total);
  const units = addUnits(ctx, [
    { key: "adult-icu", name: "Adult ICU", code: "AICU" },
    { key: "neonatal-icu", name: "Neonatal ICU", code: "NICU" },
    { key: "emergency", name: "Emergency", code: "ED" },
    { key: "adult-floors", name: "Adult Floors", code: "FLR" },
  ] as const);
  const t = ctx.today;
  const everyone: KvPerson[] = [];
  const add = (spec: Omit<PersonSpec, "homeUnitId"> & { unit: KvUnitKey }, grantedBy: string | null): KvPerson => {
    const person = { ...addPerson(ctx, { ...spec, homeUnitId: units[spec.unit] }, grantedBy), unit: spec.unit };
    everyone.push(person);
    return person;
  };

  // The admin grants everyone's roles, so the admin comes first.
  const admin = add(
    {
      key: "demo-admin", name: "Quentin Abernathy", email: DEMO_ACCOUNTS.admin, employeeId: "KV-07714",
      title: "Clinical Applications Administrator", credentialLetters: null, hireDate: monthsAgo(t, 110, 8),
      unit: "adult-floors", birthMonth: null, roles: ["admin"],
    },
    null,
  );
  const by = admin.id;
  const manager = add(
    {
      key: "demo-manager", name: "Harriet Valdivia", email: DEMO_ACCOUNTS.manager, employeeId: "KV-05560",
      title: "Manager, Respiratory Care", credentialLetters: "RRT", hireDate: monthsAgo(t, 302, 14),
      unit: "adult-icu", birthMonth: 9, roles: ["manager"], manages: UNIT_ORDER.map((u) => units[u]),
    },
    by,
  );
  const therapist = add(
    {
      key: "demo-therapist", name: "Marisol Ellingsen", email: DEMO_ACCOUNTS.therapist,
      employeeId: "KV-20417", title: "Respiratory Therapist II", credentialLetters: "RRT",
      hireDate: monthsAgo(t, 79, 16), unit: "adult-icu", birthMonth: 4, roles: ["therapist"],
    },
    by,
  );
  const preceptor = add(
    {
      key: "demo-preceptor", name: "Desmond Achterberg", email: DEMO_ACCOUNTS.preceptor,
      employeeId: "KV-11872", title: "Respiratory Therapist III, Preceptor", credentialLetters: "RRT",
      hireDate: monthsAgo(t, 158, 5), unit: "neonatal-icu", birthMonth: 11, roles: ["therapist", "preceptor"],
      memberOf: [units.emergency],
    },
    by,
  );
  const educator = add(
    {
      key: "demo-educator", name: "Leonie Okonkwo", email: DEMO_ACCOUNTS.educator, employeeId: "KV-09133",
      title: "Clinical Educator, Respiratory Care", credentialLetters: "RRT", hireDate: monthsAgo(t, 193, 21),
      unit: "adult-icu", birthMonth: null, roles: ["therapist", "educator"],
      memberOf: [units["neonatal-icu"]],
    },
    by,
  );

  const nextName = createNamer(prngFor("kv:names"), KESTREL_VALLEY.domain, Object.values(DEMO_ACCOUNTS));
  let seq = 0;
  let cycle = 0;
  const generated = (roles: readonly Role[], make: (p: Prng) => { title: string; hireDate: IsoDate; unit: KvUnitKey; extra?: Partial<PersonSpec> }): KvPerson => {
    seq += 1;
    const prng = prngFor(`kv:person:${seq}`);
    const name = nextName();
    const { extra, ...shape } = make(prng);
    return add(
      {
        key: seq,
        name: name.name,
        email: name.email,
        employeeId: `KV-${30000 + seq}`,
        credentialLetters: prng.chance(0.85) ? "RRT" : "CRT",
        birthMonth: prng.chance(0.6) ? prng.int(1, 12) : null,
        roles,
        ...shape,
        ...extra,
      },
      by,
    );
  };
  const nextUnit = () => UNIT_CYCLE[cycle++ % UNIT_CYCLE.length];
  const staffTitle = (months: number) => (months < 30 ? "Respiratory Therapist I" : months < 100 ? "Respiratory Therapist II" : "Respiratory Therapist III");

  const preceptors = [preceptor];
  for (let i = 1; i < mix.preceptors; i++) {
    preceptors.push(generated(["therapist", "preceptor"], (p) => ({ title: "Respiratory Therapist III, Preceptor", hireDate: monthsAgo(t, p.int(62, 300), p.int(1, 28)), unit: nextUnit() })));
  }
  for (let i = 1; i < mix.educators; i++) {
    generated(["therapist", "educator"], (p) => ({ title: "Clinical Educator, Respiratory Care", hireDate: monthsAgo(t, p.int(90, 260), p.int(1, 28)), unit: UNIT_ORDER[i % 4] }));
  }
  const managers = [manager];
  for (let i = 1; i < mix.managers; i++) {
    const unit = UNIT_ORDER[i % 4];
    managers.push(generated(["manager"], (p) => ({ title: "Assistant Manager, Respiratory Care", hireDate: monthsAgo(t, p.int(120, 280), p.int(1, 28)), unit, extra: { manages: [units[unit]] } })));
  }
  for (let i = 1; i < mix.admins; i++) {
    generated(["admin"], (p) => ({ title: "Clinical Applications Analyst", hireDate: monthsAgo(t, p.int(12, 120), p.int(1, 28)), unit: "adult-floors", extra: { credentialLetters: null } }));
  }
  const newHires: KvPerson[] = [];
  for (let i = 0; i < mix.newHires; i++) {
    // Started 12, 29 and 46 days before the demo day (and so on), so orientation is under way.
    const hireDate = addDays(t, -(12 + 17 * (i % 5)));
    newHires.push(generated(["therapist"], () => ({ title: "Respiratory Therapist I", hireDate, unit: NEW_HIRE_UNITS[i % NEW_HIRE_UNITS.length] })));
  }
  const staff: KvPerson[] = [];
  const staffCount = mix.therapists - 3 - (mix.preceptors - 1) - (mix.educators - 1) - mix.newHires;
  for (let i = 0; i < staffCount; i++) {
    const floatsTo = i % 9 === 4 ? UNIT_ORDER[(i + 1) % 4] : null;
    staff.push(
      generated(["therapist"], (p) => {
        // Skewed toward recent hires (a power curve), up to about 28 years of service.
        const months = 14 + Math.floor(Math.pow(p.next(), 1.5) * 320);
        const unit = nextUnit();
        return { title: staffTitle(months), hireDate: monthsAgo(t, months, p.int(1, 28)), unit, extra: floatsTo && floatsTo !== unit ? { memberOf: [units[floatsTo]] } : {} };
      }),
    );
  }
  return {
    units,
    demo: { therapist, preceptor, educator, manager, admin },
    therapists: everyone.filter((p) => p.roles.includes("therapist")),
    preceptors,
    newHires,
    staff,
    managers,
  };
}

export type BuildOptions = { today: IsoDate; people?: number };

/** Builds the whole Kestrel Valley scenario in memory; nothing is written. */
export function buildKestrelValley(options: BuildOptions): { data: Dataset; roster: KvRoster; orgId: string } {
  const id = idsFor("kv");
  const data = emptyDataset();
  const ctx: OrgContext = { data, id, orgId: id("organisation"), today: options.today, at: instantOn(options.today) };
  data.organisations.push({
    id: ctx.orgId,
    name: KESTREL_VALLEY.name,
    slug: KESTREL_VALLEY.slug,
    timeZone: KESTREL_VALLEY.timeZone,
    settings: { reminderDays: [90, 60, 30, 14, 7, 0], contactEmail: `respiratory.education@${KESTREL_VALLEY.domain}` },
    createdAt: ctx.at,
    updatedAt: ctx.at,
  });
  const roster = buildRoster(ctx, options.people ?? KV_DEFAULT_PEOPLE);
  data.organisations[0].settings = { ...data.organisations[0].settings, educationLeadName: roster.demo.educator.name };
  addTopics(ctx);
  const references = addRegulatoryReferences(ctx, REGULATORY_REFERENCES);
  const types = addCredentialTypes(ctx, CREDENTIAL_TYPES);
  // The annual exam and the bank have been in use for three years, so their past sittings
  // (seeds/exam-history.ts) come after the versions they sat.
  const inUseSince: OrgContext = { ...ctx, at: instantOn(addMonths(ctx.today, -BANK_IN_USE_MONTHS)) };
  const exams = addExams(inUseSince, roster.demo.educator.id);
  const checklists = addChecklists(ctx, roster.demo.educator.id);
  // The question bank: written and approved by the two educators in turn (seeds/bank/).
  const secondEducator = data.personRoles.find((r) => r.role === "educator" && r.personId !== roster.demo.educator.id)?.personId ?? roster.demo.educator.id;
  addBank(inUseSince, [roster.demo.educator.id, secondEducator]);
  addKvRecords(ctx, roster, { references, types, exams, checklists });
  addExamHistory(ctx, roster, { examId: exams.get("annual-modes")!, versionId: ctx.id("exam-version", "annual-modes", 1) });
  return { data, roster, orgId: ctx.orgId };
}
