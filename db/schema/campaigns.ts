import { sql } from "drizzle-orm";
import {
  boolean,
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { timestamps } from "./columns";
import { organizations, users } from "./auth";

export const CAMPAIGN_STATUSES = ["draft", "running", "paused", "ended", "archived"] as const;
export type CampaignStatus = (typeof CAMPAIGN_STATUSES)[number];
export const METRIC_KINDS = ["conversion", "mean"] as const;
export const CALLS = ["collecting", "lift", "harm", "flat", "horizon", "suspect"] as const;
export type CallName = (typeof CALLS)[number];

export const campaigns = pgTable(
  "campaigns",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: text("workspace_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    slug: text("slug").notNull(),
    hypothesis: text("hypothesis").notNull().default(""),
    metricKind: text("metric_kind", { enum: METRIC_KINDS }).notNull(),
    metricName: text("metric_name").notNull(),
    metricUnit: text("metric_unit"),
    /** Conversion rate of the holdout expected before launch (conversion metric). */
    baselineRate: doublePrecision("baseline_rate"),
    /** Planned mean and standard deviation per unit (mean metric). */
    baselineMean: doublePrecision("baseline_mean"),
    baselineSd: doublePrecision("baseline_sd"),
    /** Smallest relative lift worth detecting, 0.05 = +5 %. */
    minimumLift: doublePrecision("minimum_lift").notNull(),
    alpha: doublePrecision("alpha").notNull(),
    power: doublePrecision("power").notNull(),
    sides: smallint("sides").notNull(),
    startDate: date("start_date").notNull(),
    maxDays: integer("max_days").notNull(),
    dailyUnits: integer("daily_units"),
    /** Mixture scale of the mSPRT, fixed when the plan is registered. */
    tau: doublePrecision("tau").notNull(),
    /** Fixed-horizon plan: units per arm, total and days, from lib/sequential. */
    plan: jsonb("plan").$type<{ perArm: Record<string, number>; total: number; days: number | null }>().notNull(),
    status: text("status", { enum: CAMPAIGN_STATUSES }).notNull().default("draft"),
    planChangedAt: timestamp("plan_changed_at", { withTimezone: true }),
    currentCall: text("current_call", { enum: CALLS }).notNull().default("collecting"),
    countsChangedAt: timestamp("counts_changed_at", { withTimezone: true }),
    analyzedAt: timestamp("analyzed_at", { withTimezone: true }),
    analysisInputsHash: text("analysis_inputs_hash"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("campaigns_workspace_id_slug_uidx").on(table.workspaceId, table.slug),
    index("campaigns_workspace_id_idx").on(table.workspaceId),
    index("campaigns_created_by_idx").on(table.createdBy),
    check("campaigns_alpha_check", sql`${table.alpha} > 0 and ${table.alpha} < 1`),
    check("campaigns_power_check", sql`${table.power} > 0 and ${table.power} < 1`),
    check("campaigns_sides_check", sql`${table.sides} in (1, 2)`),
    check("campaigns_max_days_check", sql`${table.maxDays} > 0`),
    check("campaigns_tau_check", sql`${table.tau} > 0`),
  ],
);

export const arms = pgTable(
  "arms",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    key: text("key").notNull(),
    name: text("name").notNull(),
    plannedShare: doublePrecision("planned_share").notNull(),
    isHoldout: boolean("is_holdout").notNull().default(false),
    position: smallint("position").notNull().default(0),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("arms_campaign_id_key_uidx").on(table.campaignId, table.key),
    index("arms_campaign_id_idx").on(table.campaignId),
    check("arms_planned_share_check", sql`${table.plannedShare} > 0 and ${table.plannedShare} < 1`),
  ],
);

export type Campaign = typeof campaigns.$inferSelect;
export type NewCampaign = typeof campaigns.$inferInsert;
export type Arm = typeof arms.$inferSelect;
export type NewArm = typeof arms.$inferInsert;
