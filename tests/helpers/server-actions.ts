import { readFileSync } from "node:fs";
import path from "node:path";

// Server actions are called the way the browser calls them: a POST to the page with the action's id in
// Next-Action, the arguments as a JSON array (or FormData), and the answer as an RSC flight stream.

export type ActionResult<T = unknown> = { ok: true; data: T } | { ok: false; error: string; fieldErrors?: Record<string, string[] | undefined> };

type Manifest = { node: Record<string, { exportedName?: string; filename?: string }> };
const manifests = new Map<string, Manifest>();

/** The id of the action `name` exported from the file whose path contains `fileFragment`, in the build in `distDir`. */
export function actionId(name: string, fileFragment: string, distDir = process.env.NEXT_DIST_DIR ?? ".next"): string {
  let manifest = manifests.get(distDir);
  if (!manifest) {
    manifest = JSON.parse(readFileSync(path.resolve(distDir, "server/server-reference-manifest.json"), "utf8")) as Manifest;
    manifests.set(distDir, manifest);
  }
  const found = Object.entries(manifest.node).find(([, entry]) => entry.exportedName === name && (entry.filename ?? "").includes(fileFragment));
  if (!found) throw new Error(`no id for ${name} (${fileFragment}) in the server-reference manifest`);
  return found[0];
}

/** Parses the action's return value out of the RSC flight answer (row 0 points at it with "$@<row>"). */
export function parseFlightResult<T = unknown>(text: string): ActionResult<T> | null {
  const rows = new Map<string, string>();
  for (const line of text.split("\n")) {
    const match = /^([0-9a-f]+):(.*)$/.exec(line);
    if (match) rows.set(match[1], match[2]);
  }
  const head = rows.get("0");
  if (!head) return null;
  let value = (JSON.parse(head) as { a?: unknown }).a;
  if (typeof value === "string" && value.startsWith("$@")) value = JSON.parse(rows.get(value.slice(2)) ?? "null");
  return (value ?? null) as ActionResult<T> | null;
}
