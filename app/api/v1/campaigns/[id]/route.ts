import { getCampaign } from "@/db/queries/campaigns";
import { authorizeRequest } from "@/lib/auth/guard";
import { changeCampaign } from "@/lib/campaigns/change-campaign";
import { NotFoundError, UnauthorizedError } from "@/lib/errors";
import { readJson, toResponse } from "@/lib/http/problem";
import { campaignReferenceSchema, updateCampaignSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export async function GET(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const id = campaignReferenceSchema.parse((await context.params).id);
    const campaign = await getCampaign(caller.workspaceId, id);
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    return Response.json(campaign, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}

export async function PATCH(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] });
    if (caller.kind !== "user") throw new UnauthorizedError();
    const id = campaignReferenceSchema.parse((await context.params).id);
    const input = updateCampaignSchema.parse(await readJson(request, 65_536));
    const campaign = await changeCampaign(caller.workspaceId, id, { userId: caller.userId, role: caller.role }, input);
    return Response.json(campaign, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}
