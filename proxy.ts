import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";

// Only a cookie-presence redirect for pages; every handler and action authorizes for itself.
export function proxy(request: NextRequest) {
  if (!getSessionCookie(request)) {
    const url = new URL("/sign-in", request.url);
    url.searchParams.set("next", request.nextUrl.pathname);
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = {
  matcher: ["/((?!api|_next|sign-in|sign-up|forgot-password|reset-password|verify-email|invitations|unsubscribe|docs|icon.svg|logo.svg|favicon.ico).*)"],
};
