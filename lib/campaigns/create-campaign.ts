import { createCampaign as insertCampaign, type CampaignDto } from "@/db/queries/campaigns";
import { createAuditEvent } from "@/db/queries/audit-events";
import { ValidationError } from "@/lib/errors";
import type { CreateCampaignInput } from "@/lib/validation/campaigns";
import { computePlan } from "./compute-plan";

/** Registers a campaign for a workspace: sizes the plan, fixes τ, stores it with its arms as a draft. */
export async function registerCampaign(workspaceId: string, userId: string | null, input: CreateCampaignInput): Promise<CampaignDto> {
  let sized: ReturnType<typeof computePlan>;
  try {
    sized = computePlan(input, input.dailyUnits);
  } catch (error) {
    throw new ValidationError("The plan cannot be sized.", [{ pointer: "/minimumLift", message: error instanceof Error ? error.message : "The plan cannot be sized" }]);
  }
  const campaign = await insertCampaign({
    workspaceId,
    createdBy: userId,
    name: input.name,
    hypothesis: input.hypothesis,
    metricKind: input.metric.kind,
    metricName: input.metric.name,
    metricUnit: input.metric.unit || null,
    baselineRate: input.metric.kind === "conversion" ? input.baselineRate! : null,
    baselineMean: input.metric.kind === "mean" ? input.baselineMean! : null,
    baselineSd: input.metric.kind === "mean" ? input.baselineSd! : null,
    minimumLift: input.minimumLift,
    alpha: input.alpha,
    power: input.power,
    sides: input.sides,
    startDate: input.startDate,
    maxDays: input.maxDays,
    dailyUnits: input.dailyUnits ?? null,
    tau: sized.tau,
    plan: sized.plan,
    arms: input.arms,
  });
  await createAuditEvent({ workspaceId, actorUserId: userId, action: "campaign.create", targetType: "campaign", targetId: campaign.id, detail: { slug: campaign.slug } });
  return campaign;
}
