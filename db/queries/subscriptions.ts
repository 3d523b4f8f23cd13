import { and, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { campaigns, members, subscriptions } from "@/db/schema";
import { getAlertRule } from "./alert-rules";

export interface SubscriptionState {
  campaignId: string;
  /** Whether this person gets the campaign's alerts. */
  subscribed: boolean;
  /** Why: their own choice, being the campaign's creator, a default recipient by role, or nothing. */
  reason: "subscribed" | "unsubscribed" | "creator" | "default-recipient" | "none";
}

/**
 * Whether a user gets a campaign's alerts: an explicit choice wins; otherwise the creator and the
 * workspace's default recipient roles are subscribed. Null when the campaign is not in the workspace.
 */
export async function getSubscriptionState(workspaceId: string, campaignId: string, userId: string): Promise<SubscriptionState | null> {
  const rows = await getDb()
    .select({ createdBy: campaigns.createdBy, active: subscriptions.active, role: members.role })
    .from(campaigns)
    .leftJoin(subscriptions, and(eq(subscriptions.campaignId, campaigns.id), eq(subscriptions.userId, userId)))
    .leftJoin(members, and(eq(members.organizationId, campaigns.workspaceId), eq(members.userId, userId)))
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(campaigns.id, campaignId)))
    .limit(1);
  const row = rows[0];
  if (!row) return null;
  if (row.active !== null) return { campaignId, subscribed: row.active, reason: row.active ? "subscribed" : "unsubscribed" };
  if (row.createdBy === userId) return { campaignId, subscribed: true, reason: "creator" };
  const rule = await getAlertRule(workspaceId);
  if (row.role !== null && rule.defaultRecipientRoles.includes(row.role)) return { campaignId, subscribed: true, reason: "default-recipient" };
  return { campaignId, subscribed: false, reason: "none" };
}

/** Records a person's choice for one campaign's alerts (subscribe or unsubscribe); idempotent. */
export async function setSubscription(campaignId: string, userId: string, active: boolean): Promise<void> {
  await getDb()
    .insert(subscriptions)
    .values({ campaignId, userId, active })
    .onConflictDoUpdate({ target: [subscriptions.campaignId, subscriptions.userId], set: { active, updatedAt: new Date() } });
}

/** The campaign's name and workspace, for the unsubscribe page; null when it does not exist. */
export async function getSubscriptionCampaign(campaignId: string): Promise<{ id: string; name: string; workspaceId: string } | null> {
  const rows = await getDb()
    .select({ id: campaigns.id, name: campaigns.name, workspaceId: campaigns.workspaceId })
    .from(campaigns)
    .where(eq(campaigns.id, campaignId))
    .limit(1);
  return rows[0] ?? null;
}
