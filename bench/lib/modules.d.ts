// Types of the bench-only stream helpers (they ship none).
declare module "pg-copy-streams" {
  import type { Readable, Writable } from "node:stream";
  import type { Submittable } from "pg";
  export function from(text: string): Writable & Submittable;
  export function to(text: string): Readable & Submittable;
}

declare module "pg-cursor" {
  import type { Submittable } from "pg";
  export default class Cursor<Row = Record<string, unknown>> implements Submittable {
    constructor(text: string, values?: unknown[]);
    submit: Submittable["submit"];
    read(rows: number): Promise<Row[]>;
    close(): Promise<void>;
  }
}
