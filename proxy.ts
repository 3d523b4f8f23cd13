import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";
import { toResponse } from "@/lib/http/problem";
import { malformedActionCallProblem, malformedPathProblem } from "@/lib/http/request-guards";

// The pages the first matcher below leaves out (Next needs the matcher as a literal, so the list stands twice).
const PUBLIC_PAGES = /^\/(?:api|_next|sign-in|sign-up|forgot-password|reset-password|verify-email|invitations|unsubscribe|docs|icon\.svg|logo\.svg|favicon\.ico)(?:\/|$)/;

// A cookie-presence redirect for pages, and a 4xx for requests Next would answer with a bare 500 (this is
// the only code of ours that runs before Next's router and its action decoder). It is never the
// authorization: every handler and action authorizes for itself.
export async function proxy(request: NextRequest) {
  const { pathname } = request.nextUrl;
  const badPath = malformedPathProblem(pathname);
  if (badPath) return toResponse(badPath, pathname);
  if (PUBLIC_PAGES.test(pathname)) return NextResponse.next();
  if (!getSessionCookie(request)) {
    const url = new URL("/sign-in", request.url);
    url.searchParams.set("next", pathname);
    return NextResponse.redirect(url);
  }
  if (request.method === "POST" && request.headers.has("next-action")) {
    const badCall = await malformedActionCallProblem(request);
    if (badCall) return toResponse(badCall, pathname);
  }
  return NextResponse.next();
}

export const config = {
  matcher: [
    "/((?!api|_next|sign-in|sign-up|forgot-password|reset-password|verify-email|invitations|unsubscribe|docs|icon.svg|logo.svg|favicon.ico).*)",
    // Any other address only when it holds a percent-encoding that may not decode (a non-ASCII byte or a stray
    // `%`), so the API's hot paths never pass through here.
    "/:path(.*%(?:[89a-fA-F]|(?![0-9a-fA-F]{2})).*)",
  ],
};
