import { getCampaign } from "@/db/queries/campaigns";
import { listDailyCounts } from "@/db/queries/daily-counts";
import { authorizeRequest } from "@/lib/auth/guard";
import { NotFoundError, PayloadTooLargeError, UnauthorizedError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { ingestCsv, MAX_CSV_BYTES } from "@/lib/ingest/ingest-csv";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** The campaign's stored daily counts, by day and arm. */
export async function GET(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    const counts = await listDailyCounts(campaign.id);
    return Response.json(
      { id: campaign.id, counts: counts.map((count) => ({ ...count, updatedAt: count.updatedAt.toISOString() })) },
      { headers: { "cache-control": "no-store" } },
    );
  } catch (error) {
    return toResponse(error, instance);
  }
}

/** The CSV upload's confirm step (session only, campaign:upload): the file as text/csv. */
export async function POST(request: Request, context: Context) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["upload"] });
    if (caller.kind !== "user") throw new UnauthorizedError();
    const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
    if (Number(request.headers.get("content-length") ?? "0") > MAX_CSV_BYTES) throw new PayloadTooLargeError(`The file is larger than ${MAX_CSV_BYTES / 1_048_576} MB; split it into smaller files.`);
    const text = await request.text();
    const outcome = await ingestCsv({ workspaceId: caller.workspaceId, userId: caller.userId, campaign, text });
    return Response.json(outcome.body, { status: outcome.status, headers: { "cache-control": "no-store", ...(outcome.replayed ? { "idempotent-replayed": "true" } : {}) } });
  } catch (error) {
    return toResponse(error, instance);
  }
}
