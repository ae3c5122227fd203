/**
 * Signed rows are protected by the database itself, not only by the app: these triggers abort
 * an UPDATE or DELETE of a signature, an addendum, evidence, a signed check-off or the step
 * results of a signed check-off (design reference: US 21 CFR Part 11 §11.10(e) audit trails
 * and §11.70 signature/record linking — a signed record is corrected by an addendum, never
 * edited). The one change a signed check-off may still take is the therapist's
 * acknowledgement: status signed → acknowledged with its time, every other column unchanged.
 *
 * The migration drizzle/0002_signed-rows-immutable.sql holds this exact text (a test compares
 * them). The demo seed, which wipes a whole organisation, is the only caller of
 * `liftImmutability`/`restoreImmutability`, inside its one write transaction (SQLite DDL is
 * transactional, so the triggers are back before anything commits).
 */
const refuse = (message: string) => `SELECT RAISE(ABORT, '${message}');`;
const SIGNED = "a signed record cannot be changed: add a signed addendum instead";

/** Columns of checkoffs that must stay as they were when a signed check-off is acknowledged. */
const FROZEN_CHECKOFF_COLUMNS = [
  "id",
  "org_id",
  "person_id",
  "checklist_version_id",
  "preceptor_id",
  "assignment_id",
  "outcome",
  "practice_plan",
  "practice_by",
  "content_hash",
  "started_at",
  "signed_at",
  "created_at",
];

const acknowledgementOnly = [
  "OLD.status = 'signed'",
  "NEW.status = 'acknowledged'",
  "OLD.acknowledged_at IS NULL",
  "NEW.acknowledged_at IS NOT NULL",
  ...FROZEN_CHECKOFF_COLUMNS.map((c) => `NEW.${c} IS OLD.${c}`),
].join(" AND ");

const signedCheckoff = (ref: "NEW" | "OLD") => `(SELECT signed_at FROM checkoffs WHERE id = ${ref}.checkoff_id) IS NOT NULL`;

export const IMMUTABILITY_TRIGGERS: readonly { name: string; sql: string }[] = [
  { name: "signatures_no_update", sql: `CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures BEGIN ${refuse("a signature cannot be changed")} END` },
  { name: "signatures_no_delete", sql: `CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures BEGIN ${refuse("a signature cannot be removed")} END` },
  { name: "addenda_no_update", sql: `CREATE TRIGGER addenda_no_update BEFORE UPDATE ON addenda BEGIN ${refuse("an addendum cannot be changed")} END` },
  { name: "addenda_no_delete", sql: `CREATE TRIGGER addenda_no_delete BEFORE DELETE ON addenda BEGIN ${refuse("an addendum cannot be removed")} END` },
  { name: "checkoff_evidence_no_update", sql: `CREATE TRIGGER checkoff_evidence_no_update BEFORE UPDATE ON checkoff_evidence BEGIN ${refuse("evidence cannot be changed")} END` },
  { name: "checkoff_evidence_no_delete", sql: `CREATE TRIGGER checkoff_evidence_no_delete BEFORE DELETE ON checkoff_evidence BEGIN ${refuse("evidence cannot be removed")} END` },
  {
    name: "checkoffs_signed_no_update",
    sql: `CREATE TRIGGER checkoffs_signed_no_update BEFORE UPDATE ON checkoffs WHEN OLD.signed_at IS NOT NULL AND NOT (${acknowledgementOnly}) BEGIN ${refuse(SIGNED)} END`,
  },
  { name: "checkoffs_signed_no_delete", sql: `CREATE TRIGGER checkoffs_signed_no_delete BEFORE DELETE ON checkoffs WHEN OLD.signed_at IS NOT NULL BEGIN ${refuse(SIGNED)} END` },
  { name: "checkoff_steps_signed_no_insert", sql: `CREATE TRIGGER checkoff_steps_signed_no_insert BEFORE INSERT ON checkoff_step_results WHEN ${signedCheckoff("NEW")} BEGIN ${refuse(SIGNED)} END` },
  { name: "checkoff_steps_signed_no_update", sql: `CREATE TRIGGER checkoff_steps_signed_no_update BEFORE UPDATE ON checkoff_step_results WHEN ${signedCheckoff("OLD")} BEGIN ${refuse(SIGNED)} END` },
  { name: "checkoff_steps_signed_no_delete", sql: `CREATE TRIGGER checkoff_steps_signed_no_delete BEFORE DELETE ON checkoff_step_results WHEN ${signedCheckoff("OLD")} BEGIN ${refuse(SIGNED)} END` },
];

/** The migration's text: one statement per breakpoint, as drizzle's migrator runs them. */
export function immutabilityMigrationSql(): string {
  return `${IMMUTABILITY_TRIGGERS.map((t) => `${t.sql};`).join("\n--> statement-breakpoint\n")}\n`;
}

type Runner = { run: (statement: string) => Promise<unknown> };

/** Seed only: drop the triggers inside the caller's transaction before wiping an organisation. */
export async function liftImmutability(runner: Runner): Promise<void> {
  for (const t of IMMUTABILITY_TRIGGERS) await runner.run(`DROP TRIGGER IF EXISTS ${t.name}`);
}

/** Seed only: put them back in the same transaction. */
export async function restoreImmutability(runner: Runner): Promise<void> {
  for (const t of IMMUTABILITY_TRIGGERS) await runner.run(t.sql);
}
