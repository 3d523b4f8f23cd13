import { randomUUID } from "node:crypto";
import pg from "pg";
import { describe, expect, inject, it } from "vitest";
import { migrateDatabase } from "../../scripts/lib/migrate";

describe("migrations", () => {
  it("apply to an empty database, twice without error, and create every product table", async () => {
    const name = `migrate_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
    const adminUrl = inject("databaseUrl");
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    await admin.query(`create database ${name}`);
    const url = adminUrl.replace(/\/[^/]+$/, `/${name}`);
    try {
      await migrateDatabase(url);
      await migrateDatabase(url);
      const client = new pg.Client({ connectionString: url });
      await client.connect();
      const tables = await client.query<{ table_name: string }>(
        "select table_name from information_schema.tables where table_schema = 'public' order by 1",
      );
      await client.end();
      expect(tables.rows.map((row) => row.table_name)).toEqual(
        expect.arrayContaining([
          "campaigns", "arms", "daily_counts", "daily_count_revisions", "ingest_batches", "analysis_days",
          "alerts", "alert_deliveries", "subscriptions", "decisions", "audit_events", "alert_rules",
          "users", "sessions", "accounts", "verifications", "organizations", "members", "invitations", "apikeys",
        ]),
      );
    } finally {
      await admin.query(`drop database if exists ${name} with (force)`);
      await admin.end();
    }
  });
});
