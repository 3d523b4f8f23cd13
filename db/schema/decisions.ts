import { index, jsonb, pgTable, text, uuid } from "drizzle-orm/pg-core";
import { timestamps } from "./columns";
import { apikeys, organizations, users } from "./auth";
import { CALLS, campaigns } from "./campaigns";

export const DECISION_OUTCOMES = ["ship", "roll_back", "extend", "stop"] as const;
export type DecisionOutcome = (typeof DECISION_OUTCOMES)[number];

/** Who decided what, when and why; the call shown at that moment is kept beside it. */
export const decisions = pgTable(
  "decisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    outcome: text("outcome", { enum: DECISION_OUTCOMES }).notNull(),
    note: text("note").notNull(),
    callAtDecision: text("call_at_decision", { enum: CALLS }).notNull(),
    ...timestamps,
  },
  (table) => [
    index("decisions_campaign_id_idx").on(table.campaignId),
    index("decisions_user_id_idx").on(table.userId),
  ],
);

/** Append-only record of changes that matter: plan edits, lifecycle moves, keys, roles. */
export const auditEvents = pgTable(
  "audit_events",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: text("workspace_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    actorUserId: text("actor_user_id").references(() => users.id, { onDelete: "set null" }),
    actorApiKeyId: text("actor_api_key_id").references(() => apikeys.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    targetType: text("target_type").notNull(),
    targetId: text("target_id").notNull(),
    reason: text("reason"),
    detail: jsonb("detail").notNull().default({}),
    ...timestamps,
  },
  (table) => [
    index("audit_events_workspace_id_idx").on(table.workspaceId, table.createdAt),
    index("audit_events_actor_user_id_idx").on(table.actorUserId),
    index("audit_events_actor_api_key_id_idx").on(table.actorApiKeyId),
  ],
);

export type Decision = typeof decisions.$inferSelect;
export type AuditEvent = typeof auditEvents.$inferSelect;
