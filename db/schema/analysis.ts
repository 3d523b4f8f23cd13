import {
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
import { CALLS, campaigns } from "./campaigns";

/**
 * One row per campaign and day: every statistic of lib/sequential's campaign analysis for the
 * cumulative counts up to that day. `detail` keeps the full per-arm result as the engine returned it.
 */
export const analysisDays = pgTable(
  "analysis_days",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    day: date("day").notNull(),
    daysRun: integer("days_run").notNull(),
    call: text("call", { enum: CALLS }).notNull(),
    liftAbsolute: doublePrecision("lift_absolute"),
    liftRelative: doublePrecision("lift_relative"),
    sequenceLow: doublePrecision("sequence_low"),
    sequenceHigh: doublePrecision("sequence_high"),
    intervalLow: doublePrecision("interval_low"),
    intervalHigh: doublePrecision("interval_high"),
    fixedZ: doublePrecision("fixed_z"),
    fixedP: doublePrecision("fixed_p"),
    sequentialP: doublePrecision("sequential_p"),
    srmP: doublePrecision("srm_p"),
    srmSequentialP: doublePrecision("srm_sequential_p"),
    peekingCost: doublePrecision("peeking_cost"),
    health: jsonb("health").$type<{ issues: { code: string; message: string }[] }>().notNull(),
    detail: jsonb("detail").notNull(),
    inputsHash: text("inputs_hash").notNull(),
    computedAt: timestamp("computed_at", { withTimezone: true }).defaultNow().notNull(),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("analysis_days_campaign_id_day_uidx").on(table.campaignId, table.day),
    index("analysis_days_campaign_id_idx").on(table.campaignId),
  ],
);

export type AnalysisDay = typeof analysisDays.$inferSelect;
export type NewAnalysisDay = typeof analysisDays.$inferInsert;
