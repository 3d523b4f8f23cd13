import { beforeAll, describe, expect, it } from "vitest";
import { TestClient } from "../helpers/http-client";
import { createWorkspaceWithRoles, type TestWorkspace } from "../factories";

let workspace: TestWorkspace;

beforeAll(async () => {
  workspace = await createWorkspaceWithRoles();
});

describe("pages a role may not open", () => {
  for (const role of ["lead", "viewer"] as const) {
    it(`a ${role} opening the new-campaign form gets the not-for-your-role screen, not an error page`, async () => {
      const response = await workspace[role].client.fetch("/campaigns/new");
      const html = await response.text();
      // The shell streams first, so the status may already be 200; the page itself must be the refusal.
      expect([200, 403]).toContain(response.status);
      expect(html).toContain("This screen needs another role");
      expect(html).not.toContain("couldn");
      expect(html).not.toContain("Register a campaign");
    });
  }

  it("a marketer opens the new-campaign form", async () => {
    const response = await workspace.marketer.client.fetch("/campaigns/new");
    expect(response.status).toBe(200);
  });

  it("a signed-out visitor is sent to sign-in", async () => {
    const response = await new TestClient().fetch("/campaigns/new");
    expect(response.status).toBe(307);
    expect(response.headers.get("location")).toContain("/sign-in");
  });
});
