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

declare module "autocannon" {
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    amount?: number;
    overallRate?: number;
    headers?: Record<string, string>;
  }
  interface Histogram {
    average: number;
    p50: number;
    p90: number;
    p99: number;
    max: number;
  }
  interface Result {
    requests: Histogram;
    latency: Histogram;
    non2xx: number;
    errors: number;
  }
  export default function autocannon(options: Options): Promise<Result>;
}
