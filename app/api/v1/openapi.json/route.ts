import { getEnv } from "@/lib/env";
import { openApiDocument } from "@/lib/openapi";

export const dynamic = "force-dynamic";

export function GET() {
  return Response.json(openApiDocument(getEnv().APP_URL), { headers: { "cache-control": "public, max-age=300" } });
}
