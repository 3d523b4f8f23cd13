import { inject } from "vitest";

/** A cookie-keeping HTTP client for the app under test; sends our Origin like a browser does. */
export class TestClient {
  readonly cookies = new Map<string, string>();

  constructor(readonly baseUrl: string = inject("appUrl")) {}

  async fetch(path: string, init: RequestInit & { json?: unknown } = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (!headers.has("origin")) headers.set("origin", this.baseUrl);
    if (this.cookies.size > 0) {
      headers.set("cookie", [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; "));
    }
    let body = init.body;
    if (init.json !== undefined) {
      headers.set("content-type", "application/json");
      body = JSON.stringify(init.json);
    }
    const response = await fetch(new URL(path, this.baseUrl), { ...init, headers, body, redirect: "manual" });
    for (const cookie of response.headers.getSetCookie()) {
      const [pair] = cookie.split(";");
      const index = pair.indexOf("=");
      const name = pair.slice(0, index).trim();
      const value = pair.slice(index + 1).trim();
      if (value === "" || /max-age=0/i.test(cookie)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return response;
  }

  async json<T = unknown>(path: string, init: RequestInit & { json?: unknown } = {}): Promise<{ status: number; body: T; response: Response }> {
    const response = await this.fetch(path, init);
    const text = await response.text();
    return { status: response.status, body: (text ? JSON.parse(text) : null) as T, response };
  }
}
