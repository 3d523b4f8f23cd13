import {
  boolean,
  date,
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
import { organizations, users } from "./auth";
import { CALLS, campaigns } from "./campaigns";

/** The outbox: one row per change of a campaign's call, unique per transition so a re-run never queues it twice. */
export const alerts = pgTable(
  "alerts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: CALLS }).notNull(),
    fromCall: text("from_call", { enum: CALLS }).notNull(),
    /** The analysis day on which the call changed. */
    day: date("day").notNull(),
    /** `<from>→<to>@<day>`: identifies the crossing. */
    transition: text("transition").notNull(),
    snapshot: jsonb("snapshot").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }).defaultNow().notNull(),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("alerts_campaign_id_transition_uidx").on(table.campaignId, table.transition),
    index("alerts_campaign_id_idx").on(table.campaignId),
    index("alerts_pending_idx").on(table.sentAt, table.nextAttemptAt),
  ],
);

/** One message of one alert to one recipient; its id makes the stable Message-ID. */
export const alertDeliveries = pgTable(
  "alert_deliveries",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    alertId: uuid("alert_id")
      .notNull()
      .references(() => alerts.id, { onDelete: "cascade" }),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    email: text("email").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }).defaultNow().notNull(),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("alert_deliveries_alert_id_email_uidx").on(table.alertId, table.email),
    index("alert_deliveries_alert_id_idx").on(table.alertId),
    index("alert_deliveries_user_id_idx").on(table.userId),
  ],
);

/** A person's choice to get (or, with `active = false`, not get) a campaign's alerts. */
export const subscriptions = pgTable(
  "subscriptions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    active: boolean("active").notNull().default(true),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("subscriptions_campaign_id_user_id_uidx").on(table.campaignId, table.userId),
    index("subscriptions_campaign_id_idx").on(table.campaignId),
    index("subscriptions_user_id_idx").on(table.userId),
  ],
);

/** Per workspace: which calls alert, and who gets every campaign's alerts besides subscribers. */
export const alertRules = pgTable(
  "alert_rules",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: text("workspace_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    calls: text("calls").array().notNull().default(["lift", "harm", "flat", "horizon", "suspect", "collecting"]),
    defaultRecipientRoles: text("default_recipient_roles").array().notNull().default(["admin", "lead"]),
    extraRecipients: text("extra_recipients").array().notNull().default([]),
    dailyDigest: boolean("daily_digest").notNull().default(false),
    ...timestamps,
  },
  (table) => [uniqueIndex("alert_rules_workspace_id_uidx").on(table.workspaceId)],
);

export type Alert = typeof alerts.$inferSelect;
export type AlertDelivery = typeof alertDeliveries.$inferSelect;
export type Subscription = typeof subscriptions.$inferSelect;
export type AlertRule = typeof alertRules.$inferSelect;

/** One daily digest sent to one person for one workspace and day: a re-run of the digest job sends nothing twice. */
export const digestDeliveries = pgTable(
  "digest_deliveries",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: text("workspace_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** The workspace-local day the digest covers. */
    day: date("day").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    ...timestamps,
  },
  (table) => [
    uniqueIndex("digest_deliveries_workspace_id_user_id_day_uidx").on(table.workspaceId, table.userId, table.day),
    index("digest_deliveries_workspace_id_idx").on(table.workspaceId),
    index("digest_deliveries_user_id_idx").on(table.userId),
  ],
);

export type DigestDelivery = typeof digestDeliveries.$inferSelect;
