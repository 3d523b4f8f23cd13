import { describe, expect, it } from "vitest";
import { ACTION_BODY_LIMIT_BYTES, malformedActionCallProblem, malformedPathProblem, nulCharacterProblem } from "@/lib/http/request-guards";

// The requests Next.js would answer with a bare 500 (found by `npm run soak:fuzz`, issue 7): they must get a
// 4xx problem from proxy.ts, and every request a browser of ours sends must pass untouched.

function actionCall(body: BodyInit, contentType: string, headers: Record<string, string> = {}): Request {
  return new Request("http://127.0.0.1/settings", { method: "POST", body, headers: { "content-type": contentType, "next-action": "00ab", ...headers } });
}

describe("malformedPathProblem", () => {
  it.each(["/api/v1/campaigns/%FF/status", "/api/health/%", "/campaigns/%E0%A4%A", "/a/%C3%28"])("refuses %s with a 400", (pathname) => {
    expect(malformedPathProblem(pathname)).toMatchObject({ status: 400, title: "Malformed address" });
  });

  it.each(["/api/v1/campaigns/%C3%A4/status", "/campaigns/3f1c", "/", "/a%20b/%2F", "/x/%F0%9F%99%82"])("lets %s through", (pathname) => {
    expect(malformedPathProblem(pathname)).toBeNull();
  });
});

describe("malformedActionCallProblem", () => {
  // What React's encodeReply writes for the plain arguments our forms pass (from memory of React 19's
  // reply encoding: `$$` escapes a leading `$`; `$undefined`, `$NaN`, `$-0`, `$D…` and `$K<id>` are markers).
  it.each([
    ['[{"memberId":"m1"}]'],
    ['["$$1 off", "$undefined", "$NaN", "$-Infinity", "$-0", "$D2026-12-01T00:00:00.000Z", "$n42"]'],
    ['[{"nested":[{"a":"$$@1"}]}, 1.5, null, true]'],
  ])("lets the JSON call %s through", async (body) => {
    expect(await malformedActionCallProblem(actionCall(body, "text/plain;charset=UTF-8"))).toBeNull();
  });

  it.each([['["$1"]'], ['[{"memberId":"$@2"}]'], ['["$"]'], ['["$nabc"]'], ['["$K1"]'], ['{"memberId":"m1"}'], ['[1,'], [""]])("refuses the JSON call %s with a 400", async (body) => {
    expect(await malformedActionCallProblem(actionCall(body, "text/plain;charset=UTF-8"))).toMatchObject({ status: 400, title: "Malformed action call" });
  });

  it("lets a FormData call through and refuses one whose root references a row that is not there", async () => {
    const form = new FormData();
    form.append("0", '["$K1"]');
    form.append("1_memberId", "$1");
    const ok = new Request("http://127.0.0.1/settings", { method: "POST", body: form, headers: { "next-action": "00ab" } });
    expect(await malformedActionCallProblem(ok)).toBeNull();

    const bad = new FormData();
    bad.append("0", '["$Q1"]');
    const refused = new Request("http://127.0.0.1/settings", { method: "POST", body: bad, headers: { "next-action": "00ab" } });
    expect(await malformedActionCallProblem(refused)).toMatchObject({ status: 400 });
    expect(await malformedActionCallProblem(actionCall("--x\r\nbroken", "multipart/form-data; boundary=x"))).toMatchObject({ status: 400 });
  });

  it("refuses a body over the action body limit with a 413, declared or not", async () => {
    const big = JSON.stringify(["x".repeat(ACTION_BODY_LIMIT_BYTES)]);
    expect(await malformedActionCallProblem(actionCall(big, "text/plain;charset=UTF-8"))).toMatchObject({ status: 413 });
    expect(await malformedActionCallProblem(actionCall("[]", "text/plain;charset=UTF-8", { "content-length": String(ACTION_BODY_LIMIT_BYTES + 1) }))).toMatchObject({ status: 413 });
  });
});

describe("nulCharacterProblem", () => {
  const post = (body: string, contentType = "application/json") => new Request("http://127.0.0.1/api/auth/organization/set-active", { method: "POST", body, headers: { "content-type": contentType } });

  it.each([
    ["a JSON body", post('{"organizationId":"\\u0000"}')],
    ["a JSON body, upper-case escape", post('{"name":"a\\U0000b"}')],
    ["a raw NUL byte", post('{"name":"a\u0000b"}')],
    ["a form body", post("email=%00&password=x", "application/x-www-form-urlencoded")],
    ["the query", new Request("http://127.0.0.1/api/auth/organization/list-members?organizationId=%00")],
  ])("refuses a NUL in %s with a 400", async (_where, request) => {
    expect(await nulCharacterProblem(request)).toMatchObject({ status: 400, title: "Invalid input" });
  });

  it("lets ordinary calls through and leaves the body readable for better-auth", async () => {
    const request = post('{"email":"lead@northwind.example","password":"100%00 sure"}');
    expect(await nulCharacterProblem(request)).toBeNull();
    expect(await request.json()).toMatchObject({ email: "lead@northwind.example" });
    expect(await nulCharacterProblem(new Request("http://127.0.0.1/api/auth/get-session"))).toBeNull();
  });
});
