import { authorizeRequest } from "@/lib/auth/guard";
import { toResponse } from "@/lib/http/problem";
import { planDesign, plannerInputSchema } from "@/lib/planner/plan-design";

export const dynamic = "force-dynamic";

/** `GET /api/v1/planner?baseline=…&minimumLift=…&dailyUnits=…`: fixed horizon and the always-valid design's expected days to a call. */
export async function GET(request: Request) {
  try {
    await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const input = plannerInputSchema.parse(Object.fromEntries(new URL(request.url).searchParams));
    return Response.json(planDesign(input), { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/v1/planner");
  }
}
