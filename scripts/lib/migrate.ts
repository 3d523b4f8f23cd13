import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";

/** Advisory lock key of the migrator: one process migrates at a time (drizzle's migrate takes no lock). */
const MIGRATION_LOCK = 7_305_001;

/** Applies every migration of `drizzle/` under an advisory lock. */
export async function migrateDatabase(url: string, migrationsFolder = path.resolve("drizzle")): Promise<void> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query("select pg_advisory_lock($1)", [MIGRATION_LOCK]);
    await migrate(drizzle(client), { migrationsFolder });
  } finally {
    await client.query("select pg_advisory_unlock($1)", [MIGRATION_LOCK]).catch(() => undefined);
    await client.end();
  }
}
