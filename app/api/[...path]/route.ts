import { NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";

export const dynamic = "force-dynamic";

/** Any /api address no route answers: an RFC 9457 404 like every other API error, not the HTML page. */
function notFound(request: Request): Response {
  return toResponse(new NotFoundError("No API route at this address."), new URL(request.url).pathname);
}

export const GET = notFound;
export const POST = notFound;
export const PUT = notFound;
export const PATCH = notFound;
export const DELETE = notFound;
