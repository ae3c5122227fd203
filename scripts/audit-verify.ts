/** `npm run audit:verify`: walks the audit chain; exit 1 and the first broken event when broken. */
import { openDatabase } from "../app/db/client.server";
import { verifyAuditChain } from "../app/db/audit.server";

const { db, close } = await openDatabase(process.env.DATABASE_URL ?? "file:./data/tidemark.db");
const verdict = await verifyAuditChain(db);
close();
if (verdict.whole) {
  console.log(`Audit chain is whole: ${verdict.count} events checked.`);
} else {
  const e = verdict.brokenAt;
  console.error(`Audit chain is broken at event #${e.seq} (${e.action} on ${e.entityType} ${e.entityId ?? ""}, ${e.at}): ${verdict.reason}.`);
  process.exit(1);
}
