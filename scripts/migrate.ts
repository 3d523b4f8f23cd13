import { migrateDatabase } from "./lib/migrate";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("DATABASE_URL is not set (npm start sets it for the local cluster)");
  process.exit(2);
}
await migrateDatabase(url);
console.error("[migrate] database is up to date");
