import { authorizeRequest } from "@/lib/auth/guard";
import { UnauthorizedError, ValidationError } from "@/lib/errors";
import { readJson, toResponse } from "@/lib/http/problem";
import { ingestBatch } from "@/lib/ingest/ingest-batch";
import { rateLimitHeaders, RATE_LIMIT_POLICY } from "@/lib/ingest/rate-limit-headers";
import { idempotencyKeySchema, ingestBatchSchema, MAX_INGEST_BYTES } from "@/lib/validation/ingest";

export const dynamic = "force-dynamic";

const INSTANCE = "/api/v1/ingest";

function withHeaders(response: Response, headers: Record<string, string>): Response {
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}

export async function POST(request: Request) {
  let headers: Record<string, string> = { "ratelimit-policy": RATE_LIMIT_POLICY };
  try {
    // Only a key is accepted here: any other Authorization (Basic, an empty Bearer) is no credential at all.
    if (!/^bearer\s+\S/i.test(request.headers.get("authorization") ?? "") && !request.headers.get("x-api-key")) {
      throw new UnauthorizedError("Send the workspace's API key as Authorization: Bearer <key>.");
    }
    const caller = await authorizeRequest(request, { ingest: ["write"] }, { allowKey: true });
    if (caller.kind !== "key") throw new UnauthorizedError("Send the workspace's API key as Authorization: Bearer <key>.");
    headers = { ...headers, ...(await rateLimitHeaders(caller.keyId)) };
    const keyCheck = idempotencyKeySchema.safeParse(request.headers.get("idempotency-key") ?? undefined);
    if (!keyCheck.success) {
      throw new ValidationError("The Idempotency-Key header is missing or malformed.", [{ pointer: "/headers/idempotency-key", message: keyCheck.error.issues[0].message }]);
    }
    const type = request.headers.get("content-type") ?? "";
    if (!/^application\/json\b/i.test(type)) {
      throw new ValidationError("Send the batch as application/json.", [{ pointer: "/headers/content-type", message: `Expected application/json, got "${type || "nothing"}"` }]);
    }
    const body = ingestBatchSchema.parse(await readJson(request, MAX_INGEST_BYTES));
    const outcome = await ingestBatch({ workspaceId: caller.workspaceId, apiKeyId: caller.keyId, source: "api", idempotencyKey: keyCheck.data, rows: body.rows });
    return Response.json(outcome.body, {
      status: outcome.status,
      headers: { ...headers, "cache-control": "no-store", ...(outcome.replayed ? { "idempotent-replayed": "true" } : {}) },
    });
  } catch (error) {
    return withHeaders(toResponse(error, INSTANCE), headers);
  }
}
