import { sql } from "drizzle-orm";
import {
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { timestamps } from "./columns";
import { apikeys, organizations, users } from "./auth";
import { arms, campaigns } from "./campaigns";

export const COUNT_SOURCES = ["api", "csv", "manual", "seed"] as const;
export type CountSource = (typeof COUNT_SOURCES)[number];

export const ingestBatches = pgTable(
  "ingest_batches",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: text("workspace_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    apiKeyId: text("api_key_id").references(() => apikeys.id, { onDelete: "set null" }),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    source: text("source", { enum: COUNT_SOURCES }).notNull(),
    idempotencyKey: text("idempotency_key").notNull(),
    /** SHA-256 of the canonical request body: the same key with another body is a conflict. */
    requestHash: text("request_hash").notNull(),
    receivedAt: timestamp("received_at", { withTimezone: true }).defaultNow().notNull(),
    rowCount: integer("row_count").notNull(),
    accepted: integer("accepted").notNull().default(0),
    replaced: integer("replaced").notNull().default(0),
    unchanged: integer("unchanged").notNull().default(0),
    outcome: text("outcome", { enum: ["accepted", "rejected"] }).notNull(),
    responseStatus: integer("response_status").notNull(),
    responseBody: jsonb("response_body").notNull(),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("ingest_batches_workspace_id_idempotency_key_uidx").on(table.workspaceId, table.idempotencyKey),
    index("ingest_batches_workspace_id_idx").on(table.workspaceId),
    index("ingest_batches_api_key_id_idx").on(table.apiKeyId),
    index("ingest_batches_user_id_idx").on(table.userId),
  ],
);

/** One day of new counts for one arm: `units`, `sum` and `sumSquares` of the outcome (conversions: sum = sumSquares). */
export const dailyCounts = pgTable(
  "daily_counts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    armId: uuid("arm_id")
      .notNull()
      .references(() => arms.id, { onDelete: "cascade" }),
    day: date("day").notNull(),
    units: integer("units").notNull(),
    sum: doublePrecision("sum").notNull(),
    sumSquares: doublePrecision("sum_squares").notNull(),
    source: text("source", { enum: COUNT_SOURCES }).notNull(),
    /** The batch that wrote these values; no foreign key (see the comment on the table). */
    batchId: uuid("batch_id"),
    revision: integer("revision").notNull().default(0),
    ...timestamps,
  },
  // No index on a column a replace writes, so a replaced count is a HOT update (fillfactor in 0002). The
  // unique (arm_id, day) index serves arm_id lookups. batch_id is provenance only: a batch is deleted
  // only with its workspace, whose campaigns take these rows with it; a key there would need an index.
  (table) => [
    uniqueIndex("daily_counts_arm_id_day_uidx").on(table.armId, table.day),
    index("daily_counts_campaign_id_idx").on(table.campaignId, table.day),
    check("daily_counts_units_check", sql`${table.units} >= 0`),
    check("daily_counts_sum_squares_check", sql`${table.sumSquares} >= 0`),
  ],
);

/**
 * The values a resend replaced: nothing acknowledged is ever lost. A revision belongs to a real count
 * (and goes with it); campaign, arm and batches are copies of that count's, kept without keys or indexes
 * because nothing reads revisions by them and each key costs a check per row and an index for deletes.
 */
export const dailyCountRevisions = pgTable(
  "daily_count_revisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    dailyCountId: uuid("daily_count_id")
      .notNull()
      .references(() => dailyCounts.id, { onDelete: "cascade" }),
    campaignId: uuid("campaign_id").notNull(),
    armId: uuid("arm_id").notNull(),
    day: date("day").notNull(),
    revision: integer("revision").notNull(),
    units: integer("units").notNull(),
    sum: doublePrecision("sum").notNull(),
    sumSquares: doublePrecision("sum_squares").notNull(),
    source: text("source", { enum: COUNT_SOURCES }).notNull(),
    batchId: uuid("batch_id"),
    replacedByBatchId: uuid("replaced_by_batch_id"),
    replacedAt: timestamp("replaced_at", { withTimezone: true }).defaultNow().notNull(),
    ...timestamps,
  },
  (table) => [index("daily_count_revisions_daily_count_id_idx").on(table.dailyCountId)],
);

export type IngestBatch = typeof ingestBatches.$inferSelect;
export type DailyCount = typeof dailyCounts.$inferSelect;
export type NewDailyCount = typeof dailyCounts.$inferInsert;
export type DailyCountRevision = typeof dailyCountRevisions.$inferSelect;
