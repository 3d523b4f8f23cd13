import { expect } from "vitest";

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
  expect(response.status, `expected a 4xx, got ${response.status}: ${text.slice(0, 300)}`).toBeGreaterThanOrEqual(400);
  expect(response.status, `expected a 4xx, got ${response.status}: ${text.slice(0, 300)}`).toBeLessThan(500);
  expect(response.headers.get("content-type") ?? "").toMatch(/^application\/problem\+json/);
  const body = JSON.parse(text) as ProblemBody;
  expect(body.status).toBe(response.status);
  expect(typeof body.type).toBe("string");
  expect(body.title.length).toBeGreaterThan(0);
  expect(body.detail.length).toBeGreaterThan(0);
  return body;
}
