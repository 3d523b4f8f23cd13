import { describe, expect, it } from "vitest";
import type { Membership } from "@/db/queries/members";
import {
  SESSION_CACHE_MAX_ENTRIES,
  SESSION_CACHE_TTL_MS,
  forgetMemberships,
  forgetSession,
  forgetUserSessions,
  getCachedMembership,
  getCachedSession,
} from "@/lib/auth/session-cache";

const HOUR = 3_600_000;

function session(token: string, userId = "user-1", expiresAt = 10 * HOUR) {
  return { token, userId, email: `${userId}@northwind-test.example`, activeOrganizationId: "workspace-1", expiresAt };
}

/** A loader that counts its calls and answers `value`. */
function loader<T>(value: T) {
  const calls = { count: 0 };
  return { calls, load: async () => ((calls.count += 1), value) };
}

function membership(role: string): Membership {
  return { memberId: "m", workspaceId: "w", workspaceName: "Northwind Outfitters", workspaceSlug: "northwind", timeZone: "UTC", role };
}

describe("the route handlers' session cache", () => {
  it("verifies a cookie once per TTL, then loads again", async () => {
    const { calls, load } = loader(session("tok-ttl"));
    await getCachedSession("tok-ttl.sig", load, 1_000);
    await getCachedSession("tok-ttl.sig", load, 1_000 + SESSION_CACHE_TTL_MS - 1);
    expect(calls.count).toBe(1);
    await getCachedSession("tok-ttl.sig", load, 1_000 + SESSION_CACHE_TTL_MS);
    expect(calls.count).toBe(2);
  });

  it("never answers an expired session, and caches no miss", async () => {
    const expired = loader(session("tok-expired", "user-1", 500));
    expect(await getCachedSession("tok-expired.sig", expired.load, 1_000)).toBeNull();
    const none = loader(null);
    expect(await getCachedSession("tok-none.sig", none.load, 1_000)).toBeNull();
    expect(await getCachedSession("tok-none.sig", none.load, 1_001)).toBeNull();
    expect(none.calls.count).toBe(2);
  });

  it("stops answering a cached session once its expiry passes within the TTL", async () => {
    const { load } = loader(session("tok-ends", "user-1", 2_000));
    expect(await getCachedSession("tok-ends.sig", load, 1_000)).not.toBeNull();
    const after = loader(null);
    expect(await getCachedSession("tok-ends.sig", after.load, 2_000)).toBeNull();
    expect(after.calls.count).toBe(1);
  });

  it("forgets a session by token and a user's sessions at once", async () => {
    const first = loader(session("tok-a", "user-a"));
    await getCachedSession("tok-a.sig", first.load, 1_000);
    forgetSession("tok-a");
    await getCachedSession("tok-a.sig", first.load, 1_001);
    expect(first.calls.count).toBe(2);
    const second = loader(session("tok-b", "user-b"));
    await getCachedSession("tok-b.sig", second.load, 1_000);
    forgetUserSessions("user-b");
    await getCachedSession("tok-b.sig", second.load, 1_001);
    expect(second.calls.count).toBe(2);
  });

  it("does not store a load that a forget overtook", async () => {
    let release: () => void = () => {};
    const slow = async () => {
      await new Promise<void>((resolve) => (release = resolve));
      return session("tok-race", "user-race");
    };
    const pending = getCachedSession("tok-race.sig", slow, 1_000);
    forgetSession("tok-race");
    release();
    await pending;
    const again = loader(session("tok-race", "user-race"));
    await getCachedSession("tok-race.sig", again.load, 1_001);
    expect(again.calls.count).toBe(1);
  });

  it("caches only a cookie whose token is the loaded session's", async () => {
    const other = loader(session("tok-real"));
    await getCachedSession("tok-forged.sig", other.load, 1_000);
    await getCachedSession("tok-forged.sig", other.load, 1_001);
    expect(other.calls.count).toBe(2);
  });

  it("stays bounded: the oldest session goes first", async () => {
    const first = loader(session("tok-first"));
    await getCachedSession("tok-first.sig", first.load, 1_000);
    for (let index = 0; index < SESSION_CACHE_MAX_ENTRIES; index++) await getCachedSession(`tok-${index}.sig`, loader(session(`tok-${index}`)).load, 1_000);
    await getCachedSession("tok-first.sig", first.load, 1_001);
    expect(first.calls.count).toBe(2);
  });
});

describe("the route handlers' membership cache", () => {
  it("reads a membership once per TTL, never caches a non-member, and forgets every membership at once", async () => {
    const member = loader(membership("admin"));
    await getCachedMembership("w", "u", member.load, 1_000);
    expect(await getCachedMembership("w", "u", member.load, 1_500)).toMatchObject({ role: "admin" });
    expect(member.calls.count).toBe(1);
    forgetMemberships();
    const demoted = loader(membership("viewer"));
    expect(await getCachedMembership("w", "u", demoted.load, 1_600)).toMatchObject({ role: "viewer" });
    const outsider = loader(null);
    await getCachedMembership("w", "stranger", outsider.load, 1_000);
    await getCachedMembership("w", "stranger", outsider.load, 1_001);
    expect(outsider.calls.count).toBe(2);
    await getCachedMembership("w", "u", demoted.load, 1_600 + SESSION_CACHE_TTL_MS);
    expect(demoted.calls.count).toBe(2);
  });
});
