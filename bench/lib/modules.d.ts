// Types of the bench-only stream helpers (they ship none).
declare module "pg-copy-streams" {
  import type { Writable } from "node:stream";
  import type { Submittable } from "pg";
  export function from(text: string): Writable & Submittable;
}
