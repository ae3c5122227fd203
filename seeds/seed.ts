/**
 * The demo scenario builder's entry point: builds Kestrel Valley and Alder Bay in memory and
 * writes both in one write transaction. Deterministic (seeded generator, ids from stable keys,
 * timestamps from the demo day) and idempotent (each organisation's rows are replaced, and the
 * audit event "seed.applied" is recorded only when what was seeded changed).
 */
import { createHash } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import type { Role } from "../app/auth/roles";
import { recordAudit } from "../app/db/audit.server";
import type { Database } from "../app/db/client.server";
import { auditEvents } from "../app/db/schema";
import { buildAlderBay } from "./alder-bay";
import { insertDataset, resetOrganisation } from "./apply";
import { instantOn, isIsoDate, todayIn, type IsoDate } from "./calendar";
import { dateStatus, type DateStatus } from "./credential-dates";
import { countRows, type Dataset } from "./dataset";
import { buildKestrelValley, DEMO_ACCOUNTS, KESTREL_VALLEY } from "./kestrel-valley";
import { writeSeededFiles } from "./scans";

export type SeedOptions = {
  /** The demo day, YYYY-MM-DD in Kestrel Valley's time zone; statuses are relative to it. */
  today: IsoDate;
  /** Kestrel Valley's head count (default 42); larger values build a benchmark hospital. */
  people?: number;
  /**
   * Where uploads live (DATA_DIR/files): the seeded scans' bytes are written there after the
   * database. Without it only their rows are written (tests that never open a scan).
   */
  filesDir?: string;
};

export type OrganisationSummary = {
  name: string;
  slug: string;
  orgId: string;
  contentHash: string;
  /** True when this run recorded a "seed.applied" audit event (the content changed). */
  audited: boolean;
  rows: Record<keyof Dataset, number>;
  roles: Record<Role, number>;
  credentialStatus: Record<DateStatus, number>;
};

export type SeedSummary = {
  today: IsoDate;
  organisations: OrganisationSummary[];
  demoAccounts: { email: string; name: string; roles: Role[] }[];
};

/** The default demo day: today in Kestrel Valley's time zone. */
export function defaultSeedDate(now: Date = new Date()): IsoDate {
  return todayIn(KESTREL_VALLEY.timeZone, now);
}

/** SHA-256 of the dataset's canonical JSON (builders emit keys in a fixed order). */
export function contentHashOf(data: Dataset): string {
  return createHash("sha256").update(JSON.stringify(data)).digest("hex");
}

function summarise(name: string, slug: string, orgId: string, data: Dataset, today: IsoDate): Omit<OrganisationSummary, "audited" | "contentHash"> {
  const roles: Record<Role, number> = { therapist: 0, preceptor: 0, educator: 0, manager: 0, admin: 0 };
  for (const r of data.personRoles) roles[r.role] += 1;
  const credentialStatus: Record<DateStatus, number> = { current: 0, "due-soon": 0, lapsed: 0 };
  for (const c of data.credentials) credentialStatus[dateStatus(c.validThrough ?? null, today)] += 1;
  return { name, slug, orgId, rows: countRows(data), roles, credentialStatus };
}

export async function seed(database: Pick<Database, "write">, options: SeedOptions): Promise<SeedSummary> {
  if (!isIsoDate(options.today)) throw new RangeError(`today must be a YYYY-MM-DD date, got ${options.today}`);
  const kv = buildKestrelValley({ today: options.today, people: options.people });
  const ab = buildAlderBay({ today: options.today });
  const orgs = [
    { ...summarise(KESTREL_VALLEY.name, KESTREL_VALLEY.slug, kv.orgId, kv.data, options.today), data: kv.data },
    { ...summarise(ab.data.organisations[0].name, ab.data.organisations[0].slug, ab.orgId, ab.data, options.today), data: ab.data },
  ];

  const summaries = await database.write(async (tx) => {
    const out: OrganisationSummary[] = [];
    for (const { data, ...org } of orgs) {
      const contentHash = contentHashOf(data);
      const [last] = await tx
        .select({ detail: auditEvents.detail })
        .from(auditEvents)
        .where(and(eq(auditEvents.orgId, org.orgId), eq(auditEvents.action, "seed.applied")))
        .orderBy(desc(auditEvents.seq))
        .limit(1);
      const previousHash = last ? (JSON.parse(last.detail) as { contentHash?: string }).contentHash : undefined;
      await resetOrganisation(tx, org.orgId);
      await insertDataset(tx, data);
      const audited = previousHash !== contentHash;
      if (audited) {
        // The instant comes from the demo day, not the clock, so equal runs build equal databases.
        await recordAudit(
          tx,
          { orgId: org.orgId, actorId: null, action: "seed.applied", entityType: "organisation", entityId: org.orgId, detail: { contentHash, today: options.today, rows: org.rows } },
          instantOn(options.today),
        );
      }
      out.push({ ...org, contentHash, audited });
    }
    return out;
  });

  if (options.filesDir) await writeSeededFiles(options.filesDir, [kv.data, ab.data]);

  const demoAccounts = Object.values(DEMO_ACCOUNTS).map((email) => {
    const person = kv.data.people.find((p) => p.email === email);
    if (!person?.id) throw new Error(`demo account ${email} was not built`);
    const roles = kv.data.personRoles.filter((r) => r.personId === person.id).map((r) => r.role);
    return { email, name: person.name, roles };
  });
  return { today: options.today, organisations: summaries, demoAccounts };
}
