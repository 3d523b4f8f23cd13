import { listCampaigns } from "@/db/queries/campaigns";
import { authorizeRequest } from "@/lib/auth/guard";
import { registerCampaign } from "@/lib/campaigns/create-campaign";
import { readJson, toResponse } from "@/lib/http/problem";
import { createCampaignSchema, listCampaignsQuerySchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

export async function GET(request: Request) {
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const query = listCampaignsQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
    return Response.json({ campaigns: await listCampaigns(caller.workspaceId, query) }, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/v1/campaigns");
  }
}

export async function POST(request: Request) {
  try {
    const caller = await authorizeRequest(request, { campaign: ["create"] }, { allowKey: true });
    const input = createCampaignSchema.parse(await readJson(request, 65_536));
    const campaign = await registerCampaign(caller.workspaceId, caller.kind === "user" ? caller.userId : null, input);
    return Response.json(campaign, { status: 201, headers: { location: `/api/v1/campaigns/${campaign.id}`, "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/v1/campaigns");
  }
}
