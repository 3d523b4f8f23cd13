import { timingSafeEqual } from "node:crypto";
import { z } from "zod";
import { runDigest } from "@/cron/digest";
import { runMailer } from "@/cron/mailer";
import { runRecompute } from "@/cron/recompute";
import { getEnv } from "@/lib/env";
import { ForbiddenError, NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";

export const dynamic = "force-dynamic";

const jobSchema = z.enum(["recompute", "nightly", "mailer", "digest"]);

function secretMatches(given: string | null, expected: string): boolean {
  if (!given) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** Runs one worker job now, for an outside scheduler: `x-cron-secret: $CRON_SECRET` (404 when no secret is configured). */
export async function POST(request: Request, context: { params: Promise<{ job: string }> }) {
  try {
    const secret = getEnv().CRON_SECRET;
    if (!secret) throw new NotFoundError("Cron triggers are off: set CRON_SECRET to turn them on.");
    if (!secretMatches(request.headers.get("x-cron-secret"), secret)) throw new ForbiddenError("The cron secret is missing or wrong.");
    const job = jobSchema.parse((await context.params).job);
    switch (job) {
      case "recompute":
      case "nightly": {
        const summary = await runRecompute({ all: job === "nightly" });
        return Response.json({ job, ran: summary.ran, processed: summary.processed, recomputed: summary.recomputed, skipped: summary.unchanged, failed: summary.failed, alerts: summary.alerts });
      }
      case "mailer":
        return Response.json({ job, ...(await runMailer()) });
      case "digest":
        return Response.json({ job, ...(await runDigest()) });
    }
  } catch (error) {
    return toResponse(error, new URL(request.url).pathname);
  }
}
