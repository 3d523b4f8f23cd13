const BASE = "http://peeksafe.invalid";

/**
 * The `next` destination if it is a same-site relative path ("/campaigns?x=1"), else `fallback`.
 * Refuses absolute and protocol-relative URLs ("//evil.example", "/\\evil.example") and control characters.
 */
export function safeNext(value: unknown, fallback = "/"): string {
  if (typeof value !== "string" || !value.startsWith("/") || value.startsWith("//") || /[\\\u0000-\u001f]/.test(value)) {
    return fallback;
  }
  try {
    const url = new URL(value, BASE);
    if (url.origin !== BASE) return fallback;
    return `${url.pathname}${url.search}${url.hash}`;
  } catch {
    return fallback;
  }
}

/** `path` with `?next=` set when the destination is not the default. */
export function withNext(path: string, next: string): string {
  return next === "/" ? path : `${path}?next=${encodeURIComponent(next)}`;
}
