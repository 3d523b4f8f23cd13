import { recomputeCampaign } from "@/cron/recompute";
import { getAnalysisRefresh } from "@/db/queries/analysis";
import { getCampaign } from "@/db/queries/campaigns";
import { authorizeRequest } from "@/lib/auth/guard";
import { NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { createLogger } from "@/lib/logger";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

async function findCampaignId(workspaceId: string, context: Context): Promise<string> {
  const campaign = await getCampaign(workspaceId, campaignReferenceSchema.parse((await context.params).id));
  if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
  return campaign.id;
}

/** When the campaign's analysis was last refreshed, and whether new counts wait for the worker. */
export async function GET(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const refresh = await getAnalysisRefresh(caller.workspaceId, await findCampaignId(caller.workspaceId, context));
    if (!refresh) throw new NotFoundError("No such campaign in this workspace.");
    return Response.json(refresh, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}

/** Recomputes the campaign now (admins and leads), in one transaction, and queues an alert when its call changed. */
export async function POST(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["recompute"] });
    const campaignId = await findCampaignId(caller.workspaceId, context);
    const result = await recomputeCampaign(campaignId, { force: true, logger: createLogger("recompute").child({ trigger: "api" }) });
    const refresh = await getAnalysisRefresh(caller.workspaceId, campaignId);
    return Response.json(
      { campaignId, days: result.days, call: result.call, previousCall: result.previousCall, alertQueued: result.alertId !== null, durationMs: result.durationMs, analyzedAt: refresh?.analyzedAt ?? null },
      { headers: { "cache-control": "no-store" } },
    );
  } catch (error) {
    return toResponse(error, instance);
  }
}
