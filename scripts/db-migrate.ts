/** `npm run db:migrate`: applies the committed migrations in drizzle/ to DATABASE_URL. */
import { openDatabase } from "../app/db/client.server";

const url = process.env.DATABASE_URL ?? "file:./data/tidemark.db";
const { close } = await openDatabase(url);
close();
console.log(`Migrated ${url}`);
