/**
 * Writing a scenario: every row the organisation owns is removed (children before parents,
 * because foreign keys are enforced) and the Dataset is inserted, inside the caller's write
 * transaction. Audit events are append-only and are never removed.
 */
import { eq, inArray, is, sql } from "drizzle-orm";
import { getTableConfig, SQLiteTable, type SQLiteInsertValue } from "drizzle-orm/sqlite-core";
import type { Tx } from "../app/db/client.server";
import { liftImmutability, restoreImmutability } from "../app/db/immutability";
import * as schema from "../app/db/schema";
import type { Dataset } from "./dataset";

/**
 * Organisation-owned tables in deletion order (each before the tables it references).
 * Tables without an org_id column are handled by the joins in `resetOrganisation`.
 */
const OWNED_IN_DELETE_ORDER = [
  schema.angoffRatings,
  schema.domainEvents,
  schema.responses,
  schema.attempts,
  schema.accommodations,
  schema.checkoffEvidence,
  schema.checkoffStepResults,
  schema.signatures,
  schema.addenda,
  schema.checkoffs,
  schema.orientationPlanItems,
  schema.orientationPlans,
  schema.clearances,
  schema.certificates,
  schema.reminders,
  schema.managerDigests,
  schema.reminderRuns,
  schema.waivers,
  schema.extensions,
  schema.credentials,
  schema.assignments,
  schema.requirements,
  schema.files,
  schema.apiTokens,
  schema.calendarFeeds,
  schema.sessions,
  schema.checklistVersions,
  schema.checklists,
  schema.examVersions,
  schema.exams,
  schema.itemVersions,
  schema.items,
  schema.topics,
  schema.regulatoryReferences,
  schema.credentialTypes,
  schema.personUnits,
  schema.personRoles,
  schema.people,
  schema.units,
] as const;

/** Append-only: kept across re-seeds. */
const KEPT = new Set(["audit_events"]);

/**
 * Fails loudly when the schema gains an organisation-owned table this file does not know,
 * rather than leaving rows behind that would break the next re-seed's foreign keys.
 */
export function assertResetCoversSchema(): void {
  const known = new Set<string>(OWNED_IN_DELETE_ORDER.map((t) => getTableConfig(t).name));
  for (const value of Object.values(schema)) {
    if (!is(value, SQLiteTable)) continue;
    const config = getTableConfig(value);
    if (config.columns.some((c) => c.name === "org_id") && !known.has(config.name) && config.name !== "organisations" && !KEPT.has(config.name)) {
      throw new Error(`seeds/apply.ts does not know the organisation-owned table ${config.name}: add it to OWNED_IN_DELETE_ORDER`);
    }
  }
}

/** Removes every row of one organisation except its audit events. */
export async function resetOrganisation(tx: Tx, orgId: string): Promise<void> {
  assertResetCoversSchema();
  // Signed rows refuse DELETE (app/db/immutability.ts); wiping a whole demo organisation is the
  // one exception, and the triggers come back in this same transaction.
  const runner = { run: (statement: string) => tx.run(sql.raw(statement)) };
  await liftImmutability(runner);
  // Rows without an org_id of their own, reached through their parents.
  const orgItemVersions = tx.select({ id: schema.itemVersions.id }).from(schema.itemVersions).where(eq(schema.itemVersions.orgId, orgId));
  await tx.delete(schema.itemVersionTopics).where(inArray(schema.itemVersionTopics.itemVersionId, orgItemVersions));
  const orgPeople = tx.select({ id: schema.people.id }).from(schema.people).where(eq(schema.people.orgId, orgId));
  await tx.delete(schema.signInCodes).where(inArray(schema.signInCodes.personId, orgPeople));
  for (const table of OWNED_IN_DELETE_ORDER) {
    await tx.delete(table).where(eq(table.orgId, orgId));
  }
  await tx.delete(schema.organisations).where(eq(schema.organisations.id, orgId));
  await restoreImmutability(runner);
}

/** SQLite allows 32,766 bound parameters per statement (SQLite "Limits In SQLite", since 3.32.0); stay well under. */
const MAX_PARAMETERS = 10_000;

async function insertRows<T extends SQLiteTable>(tx: Tx, table: T, rows: SQLiteInsertValue<T>[]): Promise<void> {
  if (rows.length === 0) return;
  const perRow = Object.keys(getTableConfig(table).columns).length || 1;
  const size = Math.max(1, Math.floor(MAX_PARAMETERS / perRow));
  for (let i = 0; i < rows.length; i += size) {
    await tx.insert(table).values(rows.slice(i, i + size));
  }
}

/** Inserts a Dataset, parents before children. */
export async function insertDataset(tx: Tx, data: Dataset): Promise<void> {
  await insertRows(tx, schema.organisations, data.organisations);
  await insertRows(tx, schema.units, data.units);
  await insertRows(tx, schema.people, data.people);
  await insertRows(tx, schema.personRoles, data.personRoles);
  await insertRows(tx, schema.personUnits, data.personUnits);
  await insertRows(tx, schema.topics, data.topics);
  await insertRows(tx, schema.regulatoryReferences, data.regulatoryReferences);
  await insertRows(tx, schema.credentialTypes, data.credentialTypes);
  await insertRows(tx, schema.items, data.items);
  await insertRows(tx, schema.itemVersions, data.itemVersions);
  await insertRows(tx, schema.itemVersionTopics, data.itemVersionTopics);
  await insertRows(tx, schema.exams, data.exams);
  await insertRows(tx, schema.examVersions, data.examVersions);
  await insertRows(tx, schema.checklists, data.checklists);
  await insertRows(tx, schema.checklistVersions, data.checklistVersions);
  await insertRows(tx, schema.requirements, data.requirements);
  await insertRows(tx, schema.files, data.files);
  await insertRows(tx, schema.credentials, data.credentials);
  await insertRows(tx, schema.waivers, data.waivers);
  await insertRows(tx, schema.assignments, data.assignments);
  await insertRows(tx, schema.attempts, data.attempts);
  await insertRows(tx, schema.responses, data.responses);
  await insertRows(tx, schema.orientationPlans, data.orientationPlans);
  await insertRows(tx, schema.orientationPlanItems, data.orientationPlanItems);
  // Seeded check-offs arrive already signed, and the triggers refuse step results for a signed
  // check-off; like the reset above, the seed is the one writer that may lift them, in its own
  // transaction.
  const runner = { run: (statement: string) => tx.run(sql.raw(statement)) };
  await liftImmutability(runner);
  await insertRows(tx, schema.checkoffs, data.checkoffs);
  await insertRows(tx, schema.checkoffStepResults, data.checkoffStepResults);
  await insertRows(tx, schema.signatures, data.signatures);
  await restoreImmutability(runner);
  await insertRows(tx, schema.certificates, data.certificates);
}
