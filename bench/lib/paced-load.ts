import http from "node:http";

/** Latencies of a paced load in ms, measured from each request's scheduled start. */
export interface PacedResult {
  sent: number;
  requestsPerSecond: number;
  latencyMs: { p50: number; p90: number; p99: number; max: number };
  non2xx: number;
  errors: number;
  /** How far the load tool's own timer ran behind its schedule, at worst (ms). */
  maxScheduleLagMs: number;
}

function percentile(sorted: number[], share: number): number {
  if (sorted.length === 0) return 0;
  return Math.round(sorted[Math.min(sorted.length - 1, Math.floor(share * sorted.length))] * 10) / 10;
}

/**
 * An open-loop load: request i starts at `i / rate` seconds, over at most `connections` keep-alive
 * sockets (a request waits for a free one), and its latency counts from its scheduled start, so a
 * stall of the server (or of this tool) is never left out. autocannon's `overallRate` instead lets each
 * connection send its share back to back at the top of every second, so its p99 measures a burst.
 */
export async function pacedLoad(options: { url: string; headers: Record<string, string>; rate: number; connections: number; durationSeconds: number }): Promise<PacedResult> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: options.connections });
  const total = Math.round(options.rate * options.durationSeconds);
  const latencies: number[] = [];
  let non2xx = 0;
  let errors = 0;
  let maxLag = 0;
  let next = 0;
  const started = performance.now();
  const pending: Promise<void>[] = [];
  const send = (scheduledAt: number) =>
    new Promise<void>((resolve) => {
      const request = http.get(options.url, { agent, headers: options.headers }, (response) => {
        response.resume();
        response.on("end", () => {
          latencies.push(performance.now() - scheduledAt);
          if (!response.statusCode || response.statusCode < 200 || response.statusCode >= 300) non2xx += 1;
          resolve();
        });
      });
      request.setTimeout(10_000, () => request.destroy(new Error("timeout")));
      request.on("error", () => {
        errors += 1;
        resolve();
      });
    });
  await new Promise<void>((resolve) => {
    const tick = () => {
      const now = performance.now();
      while (next < total && started + (next * 1000) / options.rate <= now) {
        const scheduledAt = started + (next * 1000) / options.rate;
        maxLag = Math.max(maxLag, now - scheduledAt);
        pending.push(send(scheduledAt));
        next += 1;
      }
      if (next >= total) resolve();
      else setTimeout(tick, 1);
    };
    tick();
  });
  await Promise.all(pending);
  const wallSeconds = (performance.now() - started) / 1000;
  agent.destroy();
  latencies.sort((a, b) => a - b);
  return {
    sent: total,
    requestsPerSecond: Math.round(latencies.length / wallSeconds),
    latencyMs: { p50: percentile(latencies, 0.5), p90: percentile(latencies, 0.9), p99: percentile(latencies, 0.99), max: percentile(latencies, 1) },
    non2xx,
    errors,
    maxScheduleLagMs: Math.round(maxLag * 10) / 10,
  };
}
