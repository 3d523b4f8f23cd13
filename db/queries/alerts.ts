import { and, asc, eq, inArray, isNull, lte, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { alertDeliveries, alerts, campaigns, digestDeliveries, members, subscriptions, users, type CallName } from "@/db/schema";
import type { AlertSnapshot } from "@/lib/alerts/snapshot";
import type { Transaction } from "./analysis";

/** Queues one alert for a change of call; a second queue of the same transition is a no-op. Returns the new id or null. */
export async function queueAlert(
  tx: Transaction,
  values: { campaignId: string; kind: CallName; fromCall: CallName; day: string; snapshot: AlertSnapshot },
): Promise<string | null> {
  const transition = `${values.fromCall}→${values.kind}@${values.day}`;
  const rows = await tx
    .insert(alerts)
    .values({ ...values, transition })
    .onConflictDoNothing({ target: [alerts.campaignId, alerts.transition] })
    .returning({ id: alerts.id });
  return rows[0]?.id ?? null;
}

export interface PendingAlert {
  id: string;
  campaignId: string;
  workspaceId: string;
  createdBy: string | null;
  kind: CallName;
}

/** Alerts not yet fully delivered, oldest first; `workspaceIds` narrows them to those workspaces. */
export async function listUnsentAlerts(limit = 200, workspaceIds?: string[]): Promise<PendingAlert[]> {
  return getDb()
    .select({ id: alerts.id, campaignId: alerts.campaignId, workspaceId: campaigns.workspaceId, createdBy: campaigns.createdBy, kind: alerts.kind })
    .from(alerts)
    .innerJoin(campaigns, eq(campaigns.id, alerts.campaignId))
    .where(and(isNull(alerts.sentAt), workspaceIds ? inArray(campaigns.workspaceId, workspaceIds) : undefined))
    .orderBy(asc(alerts.createdAt))
    .limit(limit);
}

export interface Recipient {
  userId: string | null;
  email: string;
}

/**
 * Who gets a campaign's alerts: members of its workspace who subscribed, plus (unless they
 * unsubscribed) its creator and the members holding a default recipient role, plus the rule's extra
 * addresses. Anyone who left the workspace gets nothing.
 */
export async function listAlertRecipients(
  campaign: { campaignId: string; workspaceId: string; createdBy: string | null },
  rule: { defaultRecipientRoles: string[]; extraRecipients: string[] },
): Promise<Recipient[]> {
  const choice = sql`(select ${subscriptions.active} from ${subscriptions} where ${subscriptions.campaignId} = ${campaign.campaignId} and ${subscriptions.userId} = ${users.id})`;
  const roles = rule.defaultRecipientRoles.length > 0 ? inArray(members.role, rule.defaultRecipientRoles) : sql`false`;
  const creator = campaign.createdBy ? eq(users.id, campaign.createdBy) : sql`false`;
  const rows = await getDb()
    .select({ userId: users.id, email: users.email })
    .from(members)
    .innerJoin(users, eq(users.id, members.userId))
    .where(
      and(
        eq(members.organizationId, campaign.workspaceId),
        sql`coalesce(${choice}, (${creator}) or (${roles}))`,
      ),
    )
    .orderBy(asc(users.email));
  const seen = new Set(rows.map((row) => row.email.toLowerCase()));
  const extras: Recipient[] = [];
  for (const email of rule.extraRecipients) {
    if (seen.has(email.toLowerCase())) continue;
    seen.add(email.toLowerCase());
    extras.push({ userId: null, email });
  }
  return [...rows, ...extras];
}

/** Creates the missing delivery rows of an alert (one per recipient; existing ones are kept). */
export async function ensureDeliveries(alertId: string, recipients: Recipient[]): Promise<void> {
  if (recipients.length === 0) return;
  const createdAt = new Date();
  await getDb()
    .insert(alertDeliveries)
    .values(recipients.map((recipient) => ({ alertId, userId: recipient.userId, email: recipient.email, nextAttemptAt: createdAt })))
    .onConflictDoNothing({ target: [alertDeliveries.alertId, alertDeliveries.email] });
}

export interface DueDelivery {
  id: string;
  alertId: string;
  userId: string | null;
  email: string;
  attempts: number;
  campaignId: string;
  kind: CallName;
  snapshot: AlertSnapshot;
}

/** Unsent deliveries whose next attempt is due at `now`, oldest alert first; `workspaceIds` narrows them. */
export async function listDueDeliveries(now: Date, limit = 500, workspaceIds?: string[]): Promise<DueDelivery[]> {
  const rows = await getDb()
    .select({
      id: alertDeliveries.id,
      alertId: alertDeliveries.alertId,
      userId: alertDeliveries.userId,
      email: alertDeliveries.email,
      attempts: alertDeliveries.attempts,
      campaignId: alerts.campaignId,
      kind: alerts.kind,
      snapshot: alerts.snapshot,
    })
    .from(alertDeliveries)
    .innerJoin(alerts, eq(alerts.id, alertDeliveries.alertId))
    .innerJoin(campaigns, eq(campaigns.id, alerts.campaignId))
    .where(
      and(
        isNull(alertDeliveries.sentAt),
        lte(alertDeliveries.nextAttemptAt, now),
        workspaceIds ? inArray(campaigns.workspaceId, workspaceIds) : undefined,
      ),
    )
    .orderBy(asc(alerts.createdAt), asc(alertDeliveries.email))
    .limit(limit);
  return rows.map((row) => ({ ...row, snapshot: row.snapshot as AlertSnapshot }));
}

export async function markDeliverySent(deliveryId: string): Promise<void> {
  await getDb()
    .update(alertDeliveries)
    .set({ sentAt: new Date(), attempts: sql`${alertDeliveries.attempts} + 1`, lastError: null })
    .where(eq(alertDeliveries.id, deliveryId));
}

export async function markDeliveryFailed(deliveryId: string, error: string, nextAttemptAt: Date): Promise<void> {
  await getDb()
    .update(alertDeliveries)
    .set({ attempts: sql`${alertDeliveries.attempts} + 1`, lastError: error.slice(0, 1000), nextAttemptAt })
    .where(eq(alertDeliveries.id, deliveryId));
}

/**
 * Rolls the deliveries up into the alert: attempts (the most any delivery took), the last error,
 * and `sent_at` once no delivery is left unsent. Returns whether the alert is now closed.
 */
export async function settleAlert(alertId: string): Promise<boolean> {
  const [summary] = await getDb()
    .select({
      unsent: sql<number>`count(*) filter (where ${alertDeliveries.sentAt} is null)`.mapWith(Number),
      attempts: sql<number>`coalesce(max(${alertDeliveries.attempts}), 0)`.mapWith(Number),
      lastError: sql<string | null>`(array_agg(${alertDeliveries.lastError} order by ${alertDeliveries.updatedAt} desc) filter (where ${alertDeliveries.lastError} is not null))[1]`,
      nextAttemptAt: sql<string | null>`min(${alertDeliveries.nextAttemptAt}) filter (where ${alertDeliveries.sentAt} is null)`,
    })
    .from(alertDeliveries)
    .where(eq(alertDeliveries.alertId, alertId));
  const closed = summary.unsent === 0;
  await getDb()
    .update(alerts)
    .set({
      attempts: summary.attempts,
      lastError: closed ? null : summary.lastError,
      sentAt: closed ? new Date() : null,
      ...(summary.nextAttemptAt ? { nextAttemptAt: new Date(summary.nextAttemptAt) } : {}),
    })
    .where(and(eq(alerts.id, alertId), isNull(alerts.sentAt)));
  return closed;
}

/** Closes an alert no one is to receive (its call is not alerted by the workspace's rules, or no recipient). */
export async function closeAlertWithoutMail(alertId: string, reason: string): Promise<void> {
  await getDb().update(alerts).set({ sentAt: new Date(), lastError: reason }).where(and(eq(alerts.id, alertId), isNull(alerts.sentAt)));
}

/** The alerts of a campaign with their deliveries, oldest first (tests and the campaign page). */
export async function listCampaignAlerts(campaignId: string) {
  return getDb().select().from(alerts).where(eq(alerts.campaignId, campaignId)).orderBy(asc(alerts.createdAt));
}

/** The deliveries of the given alerts. */
export async function listDeliveries(alertIds: string[]) {
  if (alertIds.length === 0) return [];
  return getDb().select().from(alertDeliveries).where(inArray(alertDeliveries.alertId, alertIds)).orderBy(asc(alertDeliveries.email));
}

/**
 * Claims the digest of one person, workspace and day: returns its id when it still has to be sent
 * (new, or an earlier attempt failed), null when it was sent already.
 */
export async function claimDigest(workspaceId: string, userId: string, day: string): Promise<string | null> {
  await getDb().insert(digestDeliveries).values({ workspaceId, userId, day }).onConflictDoNothing();
  const rows = await getDb()
    .select({ id: digestDeliveries.id, sentAt: digestDeliveries.sentAt })
    .from(digestDeliveries)
    .where(and(eq(digestDeliveries.workspaceId, workspaceId), eq(digestDeliveries.userId, userId), eq(digestDeliveries.day, day)))
    .limit(1);
  return rows[0] && rows[0].sentAt === null ? rows[0].id : null;
}

export async function markDigest(id: string, outcome: { sent: true } | { sent: false; error: string }): Promise<void> {
  await getDb()
    .update(digestDeliveries)
    .set(
      outcome.sent
        ? { sentAt: new Date(), attempts: sql`${digestDeliveries.attempts} + 1`, lastError: null }
        : { attempts: sql`${digestDeliveries.attempts} + 1`, lastError: outcome.error.slice(0, 1000) },
    )
    .where(eq(digestDeliveries.id, id));
}
