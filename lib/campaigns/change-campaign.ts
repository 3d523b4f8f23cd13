import { sql } from "drizzle-orm";
import { getDb } from "@/db";
import { createAuditEvent } from "@/db/queries/audit-events";
import { campaignHasCounts, getCampaign, lockCampaign, updateCampaign, type CampaignDto, type CampaignPatch } from "@/db/queries/campaigns";
import { listDailyCounts } from "@/db/queries/daily-counts";
import { roleAllows } from "@/lib/auth/permissions";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import type { CampaignPlanInput, UpdateCampaignInput } from "@/lib/validation/campaigns";
import { computePlan } from "./compute-plan";
import { canMove } from "./lifecycle";

export interface Actor {
  userId: string;
  role: string;
}

/** The plan as the edit form and the lock compare it. */
export function planOf(campaign: CampaignDto): CampaignPlanInput {
  return {
    metric: { kind: campaign.metric.kind, name: campaign.metric.name, ...(campaign.metric.unit ? { unit: campaign.metric.unit } : {}) },
    ...(campaign.baselineRate !== null ? { baselineRate: campaign.baselineRate } : {}),
    ...(campaign.baselineMean !== null ? { baselineMean: campaign.baselineMean } : {}),
    ...(campaign.baselineSd !== null ? { baselineSd: campaign.baselineSd } : {}),
    minimumLift: campaign.minimumLift,
    alpha: campaign.alpha,
    power: campaign.power,
    sides: campaign.sides,
    arms: campaign.arms.map((arm) => ({ key: arm.key, name: arm.name, share: arm.share })),
  };
}

function statisticalPlan(plan: CampaignPlanInput) {
  return JSON.stringify({
    kind: plan.metric.kind,
    baseline: plan.metric.kind === "conversion" ? [plan.baselineRate] : [plan.baselineMean, plan.baselineSd],
    minimumLift: plan.minimumLift,
    alpha: plan.alpha,
    power: plan.power,
    sides: plan.sides,
    arms: plan.arms.map((arm) => [arm.key, arm.share]),
  });
}

/**
 * Applies a PATCH to a campaign under the campaign's lock: a lifecycle move (campaign:lifecycle), and
 * details or plan edits (campaign:update). Once counts exist the plan (metric, baseline, α, power,
 * sides, MDE, shares, hence τ) and the start date are locked: only an admin with a written reason may
 * change them; that lands in audit_events and stamps `planChangedAt`.
 */
export async function changeCampaign(workspaceId: string, reference: string, actor: Actor, input: UpdateCampaignInput): Promise<CampaignDto> {
  const wantsMove = input.status !== undefined;
  const wantsEdit = Object.keys(input).some((key) => key !== "status" && key !== "reason");
  if (wantsMove && !roleAllows(actor.role, { campaign: ["lifecycle"] })) throw new ForbiddenError("Your role does not allow moving a campaign through its lifecycle.");
  if (wantsEdit && !roleAllows(actor.role, { campaign: ["update"] })) throw new ForbiddenError("Your role does not allow editing a campaign.");

  return getDb().transaction(async (tx) => {
    const located = await getCampaign(workspaceId, reference, tx);
    if (!located) throw new NotFoundError("No such campaign in this workspace.");
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`campaign:${located.id}`}, 0))`);
    // The row lock serializes this change with a recompute reading the plan.
    const campaign = await lockCampaign(tx, workspaceId, located.id);
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    const patch: CampaignPatch = {};
    const audits: { action: string; reason?: string; detail: Record<string, unknown> }[] = [];

    if (wantsMove && input.status !== campaign.status) {
      if (!canMove(campaign.status, input.status!)) {
        throw new ConflictError(`A campaign that is ${campaign.status} cannot move to ${input.status}.`, { from: campaign.status, to: input.status });
      }
      patch.status = input.status;
      audits.push({ action: "campaign.status", detail: { from: campaign.status, to: input.status } });
    }
    if (wantsEdit && campaign.status === "archived") throw new ConflictError("An archived campaign cannot be edited.");
    if (input.name !== undefined) patch.name = input.name;
    if (input.hypothesis !== undefined) patch.hypothesis = input.hypothesis;
    if (input.maxDays !== undefined && input.maxDays !== campaign.maxDays) {
      patch.maxDays = input.maxDays;
      // The horizon is an input of the analysis: the worker recomputes the counts under it.
      if (await campaignHasCounts(campaign.id, tx)) patch.countsChangedAt = sql`clock_timestamp()`;
    }
    if (input.dailyUnits !== undefined) patch.dailyUnits = input.dailyUnits;

    const before = planOf(campaign);
    const nextPlan = input.plan ?? before;
    const planChanges = input.plan !== undefined && statisticalPlan(input.plan) !== statisticalPlan(before);
    const startChanges = input.startDate !== undefined && input.startDate !== campaign.startDate;
    let newArms: CampaignPlanInput["arms"] | undefined;
    if (planChanges || startChanges) {
      if (await campaignHasCounts(campaign.id, tx)) {
        if (actor.role !== "admin") {
          throw new ConflictError("The plan is locked: counts have arrived. Only an admin may change it, with a written reason.", { locked: true });
        }
        if (!input.reason) {
          throw new ValidationError("A plan change after counts arrived needs a written reason.", [{ pointer: "/reason", message: "Explain why the plan changes mid-flight" }]);
        }
        const counted = new Set((await listDailyCounts(campaign.id, tx)).map((count) => count.arm));
        const dropped = before.arms.filter((arm) => !nextPlan.arms.some((next) => next.key === arm.key) && counted.has(arm.key));
        if (dropped.length > 0) throw new ConflictError(`Arm "${dropped[0].key}" has counts and cannot be removed.`);
        if (input.startDate !== undefined && (await listDailyCounts(campaign.id, tx)).some((count) => count.day < input.startDate!)) {
          throw new ConflictError("Counts exist before the new start date.");
        }
        // The database's clock, the one analyzed_at uses, read after the row lock.
        patch.planChangedAt = sql`clock_timestamp()`;
        patch.countsChangedAt = sql`clock_timestamp()`;
        audits.push({ action: "campaign.plan_change", reason: input.reason, detail: { before: { ...before, startDate: campaign.startDate, tau: campaign.tau }, after: { ...nextPlan, startDate: input.startDate ?? campaign.startDate } } });
      } else {
        audits.push({ action: "campaign.plan_edit", detail: { before, after: nextPlan } });
      }
      if (startChanges) patch.startDate = input.startDate;
    }
    if (input.plan !== undefined || input.dailyUnits !== undefined) {
      let sized: ReturnType<typeof computePlan>;
      try {
        sized = computePlan(nextPlan, input.dailyUnits !== undefined ? input.dailyUnits : campaign.dailyUnits);
      } catch (error) {
        throw new ValidationError("The plan cannot be sized.", [{ pointer: "/plan/minimumLift", message: error instanceof Error ? error.message : "The plan cannot be sized" }]);
      }
      patch.plan = sized.plan;
      if (input.plan !== undefined) {
        patch.tau = sized.tau;
        patch.metricKind = nextPlan.metric.kind;
        patch.metricName = nextPlan.metric.name;
        patch.metricUnit = nextPlan.metric.unit || null;
        patch.baselineRate = nextPlan.metric.kind === "conversion" ? nextPlan.baselineRate! : null;
        patch.baselineMean = nextPlan.metric.kind === "mean" ? nextPlan.baselineMean! : null;
        patch.baselineSd = nextPlan.metric.kind === "mean" ? nextPlan.baselineSd! : null;
        patch.minimumLift = nextPlan.minimumLift;
        patch.alpha = nextPlan.alpha;
        patch.power = nextPlan.power;
        patch.sides = nextPlan.sides;
        newArms = nextPlan.arms;
      }
    }
    await updateCampaign(tx, workspaceId, campaign.id, patch, newArms);
    for (const audit of audits) {
      await createAuditEvent(
        { workspaceId, actorUserId: actor.userId, action: audit.action, targetType: "campaign", targetId: campaign.id, reason: audit.reason ?? null, detail: audit.detail },
        tx,
      );
    }
    return (await getCampaign(workspaceId, campaign.id, tx))!;
  });
}
