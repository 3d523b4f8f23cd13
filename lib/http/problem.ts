import { ZodError } from "zod";
import { BadRequestError, BusyError, DomainError, PayloadTooLargeError, RateLimitedError, type FieldProblem } from "@/lib/errors";

/** RFC 9457 problem details. */
export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  errors?: FieldProblem[];
  [extension: string]: unknown;
}

const PROBLEM_TYPE_BASE = "https://peeksafe.local/problems/";

export function problemResponse(problem: Problem, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(problem), {
    status: problem.status,
    headers: { "content-type": "application/problem+json", "cache-control": "no-store", ...headers },
  });
}

/** Zod issues as field problems with JSON pointers (`/rows/3/units`). */
export function zodProblems(error: ZodError, rowPath?: string): FieldProblem[] {
  return error.issues.map((issue) => {
    const pointer = "/" + issue.path.map(String).join("/");
    const rowIndex = rowPath && issue.path[0] === rowPath && typeof issue.path[1] === "number" ? issue.path[1] : undefined;
    return { ...(rowIndex !== undefined ? { row: rowIndex } : {}), pointer: pointer === "/" ? "" : pointer, message: issue.message };
  });
}

function slug(title: string): string {
  return title.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/(^-|-$)/g, "");
}

/** Maps any thrown value to a problem response, in one place; unexpected errors are logged and hidden. */
export function toResponse(error: unknown, instance?: string): Response {
  if (error instanceof ZodError) {
    return problemResponse({
      type: `${PROBLEM_TYPE_BASE}invalid-input`,
      title: "Invalid input",
      status: 422,
      detail: "The request does not match the expected shape.",
      instance,
      errors: zodProblems(error, "rows"),
    });
  }
  if (error instanceof DomainError) {
    const headers: Record<string, string> = {};
    if (error instanceof RateLimitedError || error instanceof BusyError) headers["retry-after"] = String(error.retryAfterSeconds);
    return problemResponse(
      {
        type: `${PROBLEM_TYPE_BASE}${slug(error.title)}`,
        title: error.title,
        status: error.status,
        detail: error.message,
        instance,
        ...error.extra,
      },
      headers,
    );
  }
  if (isDatabaseUnavailable(error)) {
    console.error("unavailable", describe(error));
    return problemResponse(
      {
        type: `${PROBLEM_TYPE_BASE}unavailable`,
        title: "Service unavailable",
        status: 503,
        detail: "A service we depend on did not answer; try again shortly. Resending an ingest batch with the same Idempotency-Key is safe.",
        instance,
      },
      { "retry-after": "1" },
    );
  }
  console.error("unexpected error", error);
  return problemResponse({
    type: `${PROBLEM_TYPE_BASE}internal`,
    title: "Internal error",
    status: 500,
    detail: "Something went wrong on our side; the request was not applied.",
    instance,
  });
}

// Connection-level failures (server restarting, socket dropped), not errors of the statement itself.
const UNAVAILABLE_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "57P01", "57P02", "57P03", "08000", "08001", "08003", "08004", "08006"]);
const UNAVAILABLE_MESSAGE = /^(Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error)/;

/** True when `error`, or an error it wraps (drizzle wraps the driver's), says PostgreSQL cannot be reached. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let current = error, depth = 0; current instanceof Error && depth < 5; current = current.cause, depth++) {
    const code = (current as NodeJS.ErrnoException).code;
    if ((code && UNAVAILABLE_CODES.has(code)) || UNAVAILABLE_MESSAGE.test(current.message)) return true;
    if (current instanceof AggregateError && current.errors.some((inner) => isDatabaseUnavailable(inner))) return true;
  }
  return false;
}

function describe(error: unknown): string {
  const messages: string[] = [];
  for (let current = error, depth = 0; current instanceof Error && depth < 5; current = current.cause, depth++) messages.push(current.message);
  return messages.join(" <- ");
}

/** Parses a JSON body, turning malformed JSON into a 400 problem rather than a 500. */
export async function readJson(request: Request, maxBytes: number): Promise<unknown> {
  const length = Number(request.headers.get("content-length") ?? "0");
  if (length > maxBytes) throw bodyTooLarge(maxBytes);
  const text = await readLimited(request, maxBytes);
  try {
    return JSON.parse(text);
  } catch {
    throw new BadRequestError("The body is not valid JSON.", "Malformed JSON");
  }
}

function bodyTooLarge(maxBytes: number): PayloadTooLargeError {
  return new PayloadTooLargeError(`The body is larger than ${maxBytes} bytes.`);
}

async function readLimited(request: Request, maxBytes: number): Promise<string> {
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel();
      throw bodyTooLarge(maxBytes);
    }
    chunks.push(value);
  }
  try {
    // Refuse broken UTF-8 rather than store U+FFFD in names: the sender's text was not what it meant.
    return new TextDecoder("utf-8", { fatal: true }).decode(Buffer.concat(chunks));
  } catch {
    throw new BadRequestError("The body is not valid UTF-8.", "Malformed JSON");
  }
}
