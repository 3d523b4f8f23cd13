import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { createUnsubscribeToken, verifyUnsubscribeToken } from "@/lib/unsubscribe-token";

const SECRET = "northwind-test-secret-with-enough-entropy-0123456789";
const campaignId = randomUUID();
const otherCampaignId = randomUUID();
const userId = "user-northwind-lead";

function parts(token: string): [string, string] {
  const [body, signature] = token.split(".");
  return [body, signature];
}

describe("unsubscribe tokens", () => {
  it("round-trips the campaign and the user", () => {
    const token = createUnsubscribeToken({ campaignId, userId }, SECRET);
    expect(token).toMatch(/^[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+$/);
    expect(verifyUnsubscribeToken(token, SECRET)).toEqual({ campaignId, userId });
  });

  it("refuses a tampered body or signature", () => {
    const token = createUnsubscribeToken({ campaignId, userId }, SECRET);
    const [body, signature] = parts(token);
    const forgedBody = Buffer.from(JSON.stringify({ v: 1, c: otherCampaignId, u: userId })).toString("base64url");
    expect(verifyUnsubscribeToken(`${forgedBody}.${signature}`, SECRET)).toBeNull();
    const flipped = signature.slice(0, -1) + (signature.endsWith("A") ? "B" : "A");
    expect(verifyUnsubscribeToken(`${body}.${flipped}`, SECRET)).toBeNull();
    expect(verifyUnsubscribeToken(`${body}.${signature.slice(0, 10)}`, SECRET)).toBeNull();
    expect(verifyUnsubscribeToken(`${body}x.${signature}`, SECRET)).toBeNull();
  });

  it("does not let a token for another campaign or another user stand in for this one", () => {
    const mine = createUnsubscribeToken({ campaignId, userId }, SECRET);
    const otherCampaign = createUnsubscribeToken({ campaignId: otherCampaignId, userId }, SECRET);
    const otherUser = createUnsubscribeToken({ campaignId, userId: "user-northwind-viewer" }, SECRET);
    expect(verifyUnsubscribeToken(otherCampaign, SECRET)).toEqual({ campaignId: otherCampaignId, userId });
    expect(verifyUnsubscribeToken(otherUser, SECRET)).toEqual({ campaignId, userId: "user-northwind-viewer" });
    expect(new Set([mine, otherCampaign, otherUser]).size).toBe(3);
    // Another token's signature on this body (and the reverse) is refused.
    expect(verifyUnsubscribeToken(`${parts(mine)[0]}.${parts(otherCampaign)[1]}`, SECRET)).toBeNull();
    expect(verifyUnsubscribeToken(`${parts(otherUser)[0]}.${parts(mine)[1]}`, SECRET)).toBeNull();
  });

  it("refuses a token signed with another secret", () => {
    const token = createUnsubscribeToken({ campaignId, userId }, "another-deployment-secret-0123456789abcdef");
    expect(verifyUnsubscribeToken(token, SECRET)).toBeNull();
  });

  it("refuses anything malformed without throwing", () => {
    for (const value of [undefined, null, 42, "", "no-dot", "a.b.c", ".", "x".repeat(1001), { token: "x" }]) {
      expect(verifyUnsubscribeToken(value, SECRET)).toBeNull();
    }
  });
});
