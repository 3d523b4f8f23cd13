import { toNextJsHandler } from "better-auth/next-js";
import { getAuth } from "@/lib/auth/server";
import { toResponse } from "@/lib/http/problem";
import { nulCharacterProblem } from "@/lib/http/request-guards";

export const dynamic = "force-dynamic";

// better-auth's own endpoints pass strings to PostgreSQL as they come; a NUL there is a 500, so refuse it first.
async function guarded(request: Request, handle: (request: Request) => Promise<Response>): Promise<Response> {
  const refused = await nulCharacterProblem(request);
  return refused ? toResponse(refused, new URL(request.url).pathname) : handle(request);
}

export async function GET(request: Request) {
  return guarded(request, toNextJsHandler(getAuth()).GET);
}

export async function POST(request: Request) {
  return guarded(request, toNextJsHandler(getAuth()).POST);
}
