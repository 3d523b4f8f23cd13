/**
 * A small seeded uniform generator for the Monte Carlo tests (mulberry32: Tommy Ettinger's 32-bit
 * generator; statistically fine for a few million draws, deterministic across platforms).
 * Returns a function giving numbers in [0, 1) and counting its calls, so tests can assert it is used.
 */
export function seededRandom(seed: number): (() => number) & { calls: number } {
  let state = seed >>> 0;
  const next = (() => {
    next.calls++;
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }) as (() => number) & { calls: number };
  next.calls = 0;
  return next;
}
