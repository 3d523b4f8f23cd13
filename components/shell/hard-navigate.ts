/**
 * A full page load to `path`. Used where the session or the active workspace just changed: the client
 * router may still cache pages (or prefetched redirects) made for the previous identity.
 */
export function hardNavigate(path: string): void {
  window.location.assign(path);
}
