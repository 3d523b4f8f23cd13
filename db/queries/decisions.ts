import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { alerts, campaigns, decisions, users, type CallName, type CampaignStatus, type DecisionOutcome } from "@/db/schema";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { createAuditEvent } from "./audit-events";

export interface DecisionDto {
  id: string;
  outcome: DecisionOutcome;
  note: string;
  callAtDecision: CallName;
  decidedBy: { id: string | null; name: string | null };
  createdAt: string;
}

export interface AlertHistoryDto {
  id: string;
  kind: CallName;
  fromCall: CallName;
  day: string;
  sentAt: string | null;
  attempts: number;
  lastError: string | null;
  createdAt: string;
}

/** Statuses a decision may be recorded in. */
const DECIDABLE: readonly CampaignStatus[] = ["running", "paused"];

/** The campaign's decisions, newest first; empty when the campaign is not in the workspace. */
export async function listDecisions(workspaceId: string, campaignId: string): Promise<DecisionDto[]> {
  const rows = await getDb()
    .select({
      id: decisions.id,
      outcome: decisions.outcome,
      note: decisions.note,
      callAtDecision: decisions.callAtDecision,
      userId: decisions.userId,
      userName: users.name,
      createdAt: decisions.createdAt,
    })
    .from(decisions)
    .innerJoin(campaigns, eq(campaigns.id, decisions.campaignId))
    .leftJoin(users, eq(users.id, decisions.userId))
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(decisions.campaignId, campaignId)))
    .orderBy(desc(decisions.createdAt));
  return rows.map((row) => ({
    id: row.id,
    outcome: row.outcome,
    note: row.note,
    callAtDecision: row.callAtDecision,
    decidedBy: { id: row.userId, name: row.userName },
    createdAt: row.createdAt.toISOString(),
  }));
}

/** The campaign's alerts (each change of call), newest first; empty when the campaign is not in the workspace. */
export async function listAlertHistory(workspaceId: string, campaignId: string): Promise<AlertHistoryDto[]> {
  const rows = await getDb()
    .select({
      id: alerts.id,
      kind: alerts.kind,
      fromCall: alerts.fromCall,
      day: alerts.day,
      sentAt: alerts.sentAt,
      attempts: alerts.attempts,
      lastError: alerts.lastError,
      createdAt: alerts.createdAt,
    })
    .from(alerts)
    .innerJoin(campaigns, eq(campaigns.id, alerts.campaignId))
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(alerts.campaignId, campaignId)))
    .orderBy(desc(alerts.createdAt));
  return rows.map((row) => ({ ...row, sentAt: row.sentAt?.toISOString() ?? null, createdAt: row.createdAt.toISOString() }));
}

/** The latest decision of each campaign (for the portfolio). */
export async function listLatestDecisions(campaignIds: string[]): Promise<Map<string, { outcome: DecisionOutcome; createdAt: string }>> {
  const latest = new Map<string, { outcome: DecisionOutcome; createdAt: string }>();
  if (campaignIds.length === 0) return latest;
  const rows = await getDb()
    .select({ campaignId: decisions.campaignId, outcome: decisions.outcome, createdAt: decisions.createdAt })
    .from(decisions)
    .where(inArray(decisions.campaignId, campaignIds))
    .orderBy(asc(decisions.createdAt));
  for (const row of rows) latest.set(row.campaignId, { outcome: row.outcome, createdAt: row.createdAt.toISOString() });
  return latest;
}

/**
 * Records a decision on a running or paused campaign of the workspace, in one transaction under the
 * campaign's lock: the decision with the call shown at that moment, the end of the campaign when the
 * outcome ends it, and an audit event. Throws NotFoundError (not in the workspace) or ConflictError
 * (already ended, archived or a draft).
 */
export async function createDecision(values: {
  workspaceId: string;
  campaignId: string;
  userId: string;
  outcome: DecisionOutcome;
  note: string;
  endsCampaign: boolean;
}): Promise<DecisionDto & { campaignStatus: CampaignStatus }> {
  return getDb().transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`campaign:${values.campaignId}`}, 0))`);
    const [campaign] = await tx
      .select({ id: campaigns.id, status: campaigns.status, currentCall: campaigns.currentCall })
      .from(campaigns)
      .where(and(eq(campaigns.workspaceId, values.workspaceId), eq(campaigns.id, values.campaignId)))
      .for("update");
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    if (!DECIDABLE.includes(campaign.status)) {
      throw new ConflictError(`A campaign that is ${campaign.status} takes no decision; decisions are recorded while it runs or is paused.`, { campaignStatus: campaign.status });
    }
    const [row] = await tx
      .insert(decisions)
      .values({ campaignId: campaign.id, userId: values.userId, outcome: values.outcome, note: values.note, callAtDecision: campaign.currentCall })
      .returning({ id: decisions.id, createdAt: decisions.createdAt });
    const status: CampaignStatus = values.endsCampaign ? "ended" : campaign.status;
    if (status !== campaign.status) await tx.update(campaigns).set({ status }).where(eq(campaigns.id, campaign.id));
    await createAuditEvent(
      {
        workspaceId: values.workspaceId,
        actorUserId: values.userId,
        action: "campaign.decision",
        targetType: "campaign",
        targetId: campaign.id,
        reason: values.note,
        detail: { outcome: values.outcome, callAtDecision: campaign.currentCall, from: campaign.status, to: status },
      },
      tx,
    );
    const [user] = await tx.select({ name: users.name }).from(users).where(eq(users.id, values.userId)).limit(1);
    return {
      id: row.id,
      outcome: values.outcome,
      note: values.note,
      callAtDecision: campaign.currentCall,
      decidedBy: { id: values.userId, name: user?.name ?? null },
      createdAt: row.createdAt.toISOString(),
      campaignStatus: status,
    };
  });
}
