import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool, types } from "pg";
import { getEnv } from "@/lib/env";
import * as schema from "./schema";

// int8 (count(*), bigint sums) as numbers: every count we keep is far below 2^53.
types.setTypeParser(20, (value) => Number.parseInt(value, 10));
// numeric as numbers: product columns of type numeric hold rates and statistics.
types.setTypeParser(1700, (value) => Number.parseFloat(value));

export type Database = NodePgDatabase<typeof schema>;

const globalForDb = globalThis as unknown as { peeksafePool?: Pool; peeksafeDb?: Database };

function createPool(): Pool {
  const pool = new Pool({ connectionString: getEnv().DATABASE_URL, max: 10 });
  pool.on("error", (error) => {
    console.error("postgres pool error", error.message);
  });
  // The pool listens only to idle clients: a checked-out one between two queries has no one to hand a
  // dropped connection to, and an unheard "error" ends the process (the worker, mid-pass).
  pool.on("connect", (client) => {
    client.on("error", (error) => console.error("postgres connection lost", error.message));
  });
  return pool;
}

export function getPool(): Pool {
  globalForDb.peeksafePool ??= createPool();
  return globalForDb.peeksafePool;
}

export function getDb(): Database {
  globalForDb.peeksafeDb ??= drizzle(getPool(), { schema });
  return globalForDb.peeksafeDb;
}

/** Closes the shared pool (scripts and tests call this before exiting). */
export async function closeDb(): Promise<void> {
  const pool = globalForDb.peeksafePool;
  globalForDb.peeksafePool = undefined;
  globalForDb.peeksafeDb = undefined;
  await pool?.end();
}
