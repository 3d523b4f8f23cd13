import { BadRequestError, PayloadTooLargeError, type DomainError } from "@/lib/errors";

// Requests no browser of ours sends, which Next.js would answer with a bare 500 before any code of ours
// runs: a path whose percent-encoding does not decode, and a server-action call whose arguments React's
// reply decoder cannot read. proxy.ts answers them with a 4xx problem (`toResponse`) instead.

/** Next's default limit for a server action's body (`serverActions.bodySizeLimit`, 1 MB). */
export const ACTION_BODY_LIMIT_BYTES = 1024 * 1024;

/** The error for a path that is not valid percent-encoded UTF-8, or null when every segment decodes. */
export function malformedPathProblem(pathname: string): DomainError | null {
  for (const segment of pathname.split("/")) {
    try {
      decodeURIComponent(segment);
    } catch {
      return new BadRequestError("The address has a percent-encoding that is not valid UTF-8.", "Malformed address");
    }
  }
  return null;
}

function malformedCall(detail: string): DomainError {
  return new BadRequestError(detail, "Malformed action call");
}

// The reply encoding of plain values and FormData, as React's encodeReply writes them for the arguments our
// forms pass: `$$` escapes a string that starts with `$`; `$K<id>` names a FormData argument's parts.
const PLAIN_MARKERS = new Set(["$undefined", "$NaN", "$Infinity", "$-Infinity", "$-0"]);
const PLAIN_MARKER = /^\$(?:\$|D|n-?\d+$)/;
const FORM_DATA_MARKER = /^\$K[0-9a-f]+$/;

function firstUnreadableString(value: unknown, allowFormData: boolean, depth = 0): string | null {
  if (depth > 256) return "the arguments nest too deeply";
  if (typeof value === "string") {
    if (!value.startsWith("$") || PLAIN_MARKERS.has(value) || PLAIN_MARKER.test(value)) return null;
    if (allowFormData && FORM_DATA_MARKER.test(value)) return null;
    return `"${value.slice(0, 40)}" is not a value the app's forms send (a string starting with "$" is sent as "$$")`;
  }
  if (Array.isArray(value)) {
    for (const item of value) {
      const found = firstUnreadableString(item, allowFormData, depth + 1);
      if (found) return found;
    }
    return null;
  }
  if (value && typeof value === "object") {
    for (const item of Object.values(value)) {
      const found = firstUnreadableString(item, allowFormData, depth + 1);
      if (found) return found;
    }
  }
  return null;
}

function readRoot(text: string, allowFormData: boolean): DomainError | null {
  let root: unknown;
  try {
    root = JSON.parse(text);
  } catch {
    return malformedCall("The action's arguments are not JSON.");
  }
  if (!Array.isArray(root)) return malformedCall("The action's arguments are not a list.");
  const unreadable = firstUnreadableString(root, allowFormData);
  return unreadable ? malformedCall(`The action's arguments cannot be read: ${unreadable}.`) : null;
}

/**
 * Checks a server-action call (a POST with a `Next-Action` header) before Next decodes it: the body fits the
 * action body limit and its arguments are plain JSON values, or FormData, in React's reply encoding.
 * @returns the error to answer with, or null to let the call through
 */
export async function malformedActionCallProblem(request: Request): Promise<DomainError | null> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  const tooLarge = new PayloadTooLargeError(`An action call's body may have at most ${ACTION_BODY_LIMIT_BYTES} bytes.`);
  if (declared > ACTION_BODY_LIMIT_BYTES) return tooLarge;
  const contentType = request.headers.get("content-type") ?? "";
  if (contentType.startsWith("multipart/form-data")) {
    let form: FormData;
    try {
      form = await request.formData();
    } catch {
      return malformedCall("The action's form data does not parse.");
    }
    const root = form.get("0");
    // Without a root part this is a plain form post (a form submitted before the page's scripts ran).
    if (root === null) return null;
    if (typeof root !== "string") return malformedCall("The action's arguments are not JSON.");
    return readRoot(root, true);
  }
  const body = await request.arrayBuffer();
  if (body.byteLength > ACTION_BODY_LIMIT_BYTES) return tooLarge;
  return readRoot(new TextDecoder().decode(body), false);
}

const JSON_NUL = /\\u0000/i;

/**
 * The error for a request to better-auth's endpoints that carries a NUL character (in the query, a JSON
 * body or a form body): PostgreSQL refuses NUL in text, and better-auth answers that with a 500.
 * @returns the error to answer with, or null to pass the request on
 */
export async function nulCharacterProblem(request: Request): Promise<DomainError | null> {
  const problem = new BadRequestError("The request contains a NUL character, which no field accepts.", "Invalid input");
  const url = new URL(request.url);
  for (const [name, value] of url.searchParams) if (name.includes("\0") || value.includes("\0")) return problem;
  if (request.method === "GET" || request.method === "HEAD" || !request.body) return null;
  const text = await request.clone().text();
  if (text.includes("\0") || JSON_NUL.test(text)) return problem;
  if ((request.headers.get("content-type") ?? "").startsWith("application/x-www-form-urlencoded")) {
    for (const [name, value] of new URLSearchParams(text)) if (name.includes("\0") || value.includes("\0")) return problem;
  }
  return null;
}
