import { getCampaign } from "@/db/queries/campaigns";
import { authorizeRequest } from "@/lib/auth/guard";
import { campaignSeries } from "@/lib/campaigns/campaign-status";
import { NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

export async function GET(request: Request, context: { params: Promise<{ id: string }> }) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    return Response.json(await campaignSeries(campaign), { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}
