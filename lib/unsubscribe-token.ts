import { createHmac, hkdfSync, timingSafeEqual } from "node:crypto";
import { z } from "zod";
import { getEnv } from "@/lib/env";

const payloadSchema = z.object({ v: z.literal(1), c: z.uuid(), u: z.string().min(1).max(200) });

export interface UnsubscribeClaim {
  campaignId: string;
  userId: string;
}

/** A key of its own for these tokens, derived from BETTER_AUTH_SECRET with HKDF-SHA256. */
function signingKey(secret: string): Buffer {
  return Buffer.from(hkdfSync("sha256", secret, "peeksafe", "unsubscribe-token/v1", 32));
}

function sign(body: string, secret: string): Buffer {
  return createHmac("sha256", signingKey(secret)).update(body).digest();
}

/** A signed token that unsubscribes one user from one campaign's alerts, without signing in. */
export function createUnsubscribeToken(claim: UnsubscribeClaim, secret = getEnv().BETTER_AUTH_SECRET): string {
  const body = Buffer.from(JSON.stringify({ v: 1, c: claim.campaignId, u: claim.userId })).toString("base64url");
  return `${body}.${sign(body, secret).toString("base64url")}`;
}

/** The claim of a genuine token; null for anything malformed, tampered with or signed by another key (constant-time compare). */
export function verifyUnsubscribeToken(token: unknown, secret = getEnv().BETTER_AUTH_SECRET): UnsubscribeClaim | null {
  if (typeof token !== "string" || token.length > 1000) return null;
  const parts = token.split(".");
  if (parts.length !== 2) return null;
  const [body, signature] = parts;
  // Compare the canonical text: base64url decoding ignores a last character's spare bits, so a
  // byte comparison would accept other spellings of the same signature.
  const given = Buffer.from(signature, "utf8");
  const expected = Buffer.from(sign(body, secret).toString("base64url"), "utf8");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
  let decoded: unknown;
  try {
    decoded = JSON.parse(Buffer.from(body, "base64url").toString("utf8"));
  } catch {
    return null;
  }
  const parsed = payloadSchema.safeParse(decoded);
  return parsed.success ? { campaignId: parsed.data.c, userId: parsed.data.u } : null;
}
