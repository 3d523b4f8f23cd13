import { describe, expect, it } from "vitest";
import { TestClient } from "../helpers/http-client";
import { linkIn, waitForMail } from "../helpers/mail";
import { TEST_PASSWORD, createUser, uniqueEmail } from "../factories";

describe("sign-up, e-mail verification and sign-in", () => {
  it("sends a verification mail over SMTP, refuses sign-in until verified, then signs in", async () => {
    const email = uniqueEmail("signup");
    const client = new TestClient();
    const signUp = await client.json("/api/auth/sign-up/email", {
      method: "POST",
      json: { email, password: TEST_PASSWORD, name: "Rosa Lindqvist" },
    });
    expect(signUp.status).toBe(200);

    const early = await client.json<{ code?: string }>("/api/auth/sign-in/email", {
      method: "POST",
      json: { email, password: TEST_PASSWORD },
    });
    expect(early.status).toBe(403);

    const mail = await waitForMail(email, (m) => m.subject.includes("Confirm"));
    expect(mail.html).toContain("Confirm e-mail");
    const link = linkIn(mail, `${client.baseUrl}/api/auth/verify-email`);
    const verified = await client.fetch(link.replace(client.baseUrl, ""));
    expect([200, 302]).toContain(verified.status);

    const signIn = new TestClient();
    const ok = await signIn.json<{ user: { email: string } }>("/api/auth/sign-in/email", {
      method: "POST",
      json: { email, password: TEST_PASSWORD },
    });
    expect(ok.status).toBe(200);
    expect(ok.body.user.email).toBe(email);
    const session = await signIn.json<{ user: { email: string } } | null>("/api/auth/get-session");
    expect(session.body?.user.email).toBe(email);
  });

  it("refuses a wrong password, and a signed-in POST from another origin", async () => {
    const client = new TestClient();
    const wrong = await client.json("/api/auth/sign-in/email", {
      method: "POST",
      json: { email: uniqueEmail("nobody"), password: "not-the-password" },
    });
    expect(wrong.status).toBe(401);
    const user = await createUser();
    const foreign = await user.client.fetch("/api/auth/organization/create", {
      method: "POST",
      headers: { origin: "http://evil.example" },
      json: { name: "Forged", slug: `forged-${Date.now()}` },
    });
    expect(foreign.status).toBe(403);
  });

  it("sends a password-reset mail whose link sets a new password", async () => {
    const email = uniqueEmail("reset");
    const client = new TestClient();
    await client.json("/api/auth/sign-up/email", { method: "POST", json: { email, password: TEST_PASSWORD, name: "Ade" } });
    const asked = await client.json("/api/auth/request-password-reset", {
      method: "POST",
      json: { email, redirectTo: "/reset-password" },
    });
    expect(asked.status).toBe(200);
    const mail = await waitForMail(email, (m) => m.subject.includes("Reset"));
    const link = linkIn(mail, `${client.baseUrl}/api/auth/reset-password/`);
    const token = new URL(link).pathname.split("/").pop()!;
    const reset = await client.json("/api/auth/reset-password", {
      method: "POST",
      json: { token, newPassword: "a-brand-new-passphrase" },
    });
    expect(reset.status).toBe(200);
  });
});
