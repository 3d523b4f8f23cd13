import { getCampaign } from "@/db/queries/campaigns";
import { createDecision, listAlertHistory, listDecisions } from "@/db/queries/decisions";
import { authorizeRequest } from "@/lib/auth/guard";
import { ForbiddenError, NotFoundError } from "@/lib/errors";
import { readJson, toResponse } from "@/lib/http/problem";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";
import { ENDING_OUTCOMES, recordDecisionSchema } from "@/lib/validation/decisions";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** The campaign's decisions and alerts, newest first (every member may read them). */
export async function GET(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] });
    const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    const [decisions, alerts] = await Promise.all([listDecisions(caller.workspaceId, campaign.id), listAlertHistory(caller.workspaceId, campaign.id)]);
    return Response.json({ campaignId: campaign.id, status: campaign.status, decisions, alerts }, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}

/** Records a lead's (or admin's) decision: ship, roll back and stop end the campaign, extend keeps it running. */
export async function POST(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { decision: ["record"] });
    if (caller.kind !== "user") throw new ForbiddenError("A decision is recorded by a person.");
    const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    const input = recordDecisionSchema.parse(await readJson(request, 16_384));
    const decision = await createDecision({
      workspaceId: caller.workspaceId,
      campaignId: campaign.id,
      userId: caller.userId,
      outcome: input.outcome,
      note: input.note,
      endsCampaign: ENDING_OUTCOMES.includes(input.outcome),
    });
    return Response.json(decision, { status: 201, headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}
