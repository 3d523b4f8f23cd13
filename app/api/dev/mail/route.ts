import { getEnv, isMailCatcherEnabled } from "@/lib/env";
import { NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";

export const dynamic = "force-dynamic";

/** The local catcher's messages as JSON; exists only while the catcher is the configured SMTP server. */
export async function GET() {
  try {
    if (!isMailCatcherEnabled()) throw new NotFoundError("The local mailbox is off: SMTP points at a real server.");
    const response = await fetch(`${getEnv().MAIL_CATCHER_URL}/messages`, { cache: "no-store" });
    if (!response.ok) throw new Error(`mail catcher answered ${response.status}`);
    return Response.json(await response.json(), { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/dev/mail");
  }
}
