import assert from "node:assert/strict";

// Plain assertions (not vitest's expect) so the long soak script can run the same checks outside vitest.

/** A problem document as the API answers it (RFC 9457), with the per-row list where there is one. */
export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  errors?: { row?: number; pointer: string; message: string }[];
}

/**
 * Reads a response and asserts it is a 4xx RFC 9457 problem that names the problem (a title and a
 * non-empty detail, and the status repeated in the body); never a 5xx.
 */
export async function expectClientProblem(response: Response): Promise<ProblemBody> {
  const text = await response.text();
  return checkProblemText(response, text);
}

/**
 * Asserts an answer to bad input is no 5xx, and that every 4xx is an RFC 9457 problem naming the
 * problem. A 2xx/3xx passes (a GET that ignores an unknown query parameter is fine).
 * @returns the status
 */
export async function expectNoServerError(response: Response): Promise<number> {
  const text = await response.text();
  assert.ok(response.status < 500, `expected no 5xx, got ${response.status}: ${text.slice(0, 300)}`);
  if (response.status >= 400) checkProblemText(response, text);
  return response.status;
}

function checkProblemText(response: Response, text: string): ProblemBody {
  const context = `${response.status}: ${text.slice(0, 300)}`;
  assert.ok(response.status >= 400 && response.status < 500, `expected a 4xx, got ${context}`);
  assert.match(response.headers.get("content-type") ?? "", /^application\/problem\+json/, `not a problem document: ${context}`);
  const body = JSON.parse(text) as ProblemBody;
  assert.equal(body.status, response.status, `status not repeated in the body: ${context}`);
  assert.equal(typeof body.type, "string", `no type: ${context}`);
  assert.ok(typeof body.title === "string" && body.title.length > 0, `no title: ${context}`);
  assert.ok(typeof body.detail === "string" && body.detail.length > 0, `no detail: ${context}`);
  return body;
}
