import { describe, expect, it } from "vitest";
import { KEY_CACHE_MAX_ENTRIES, hashApiKey, takeKeyRequest, type CachedApiKey } from "@/lib/auth/key-cache";

function entry(id: string, max = 3, windowMs = 60_000): CachedApiKey {
  return { id, workspaceId: "w", permissions: {}, expiresAt: null, rateLimit: { max, windowMs }, loadedAt: 0 };
}

describe("the read-path key limiter", () => {
  it("admits max calls a window, answers the wait until the window ends, then admits again", () => {
    const key = entry("limited-key");
    expect([0, 1, 2].map((at) => takeKeyRequest(key, 1_000 + at))).toEqual([null, null, null]);
    expect(takeKeyRequest(key, 11_000)).toBe(50_000);
    expect(takeKeyRequest(key, 61_000)).toBeNull();
  });

  it("does not count keys whose limit is switched off", () => {
    const unlimited = { ...entry("unlimited-key"), rateLimit: null };
    for (let call = 0; call < 10; call++) expect(takeKeyRequest(unlimited, 5)).toBeNull();
  });

  it("stays bounded: the oldest window goes first when many keys call", () => {
    const first = entry("first-of-many", 1);
    expect(takeKeyRequest(first, 0)).toBeNull();
    expect(takeKeyRequest(first, 1)).not.toBeNull();
    for (let index = 0; index < KEY_CACHE_MAX_ENTRIES; index++) takeKeyRequest(entry(`many-${index}`), 2);
    // Its window was evicted, so it starts afresh (the bound costs at most one extra window per eviction).
    expect(takeKeyRequest(first, 3)).toBeNull();
  });
});

describe("hashApiKey", () => {
  it("is the stored form: SHA-256 in base64url without padding", () => {
    // SHA-256("abc") = ba7816bf…f20015ad (FIPS 180-2 test vector), here in base64url.
    expect(hashApiKey("abc")).toBe("ungWv48Bz-pBQUDeXa4iI7ADYaOWF3qctBD_YfIAFa0");
  });
});
