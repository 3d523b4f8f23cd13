// Axis scales shared by the server-drawn still plots and the interactive recharts plots, so the two
// draw the same lines in the same place and nothing moves when the interactive chart takes over.

export interface LinearAxis {
  domain: [number, number];
  ticks: number[];
}

function niceStep(span: number, intervals: number): number {
  const raw = span / intervals;
  const power = 10 ** Math.floor(Math.log10(raw));
  const scaled = raw / power;
  return (scaled <= 1 ? 1 : scaled <= 2 ? 2 : scaled <= 2.5 ? 2.5 : scaled <= 5 ? 5 : 10) * power;
}

/** A linear axis over the finite values (and zero), widened to round ticks, about `intervals` of them. */
export function linearAxis(values: Iterable<number | null | undefined>, options: { intervals?: number; minimumTop?: number } = {}): LinearAxis {
  let low = 0;
  let high = options.minimumTop ?? 0;
  for (const value of values) {
    if (value === null || value === undefined || !Number.isFinite(value)) continue;
    low = Math.min(low, value);
    high = Math.max(high, value);
  }
  if (high === low) high = low + 1;
  const step = niceStep(high - low, options.intervals ?? 4);
  const bottom = Math.floor(low / step + 1e-9) * step;
  const top = Math.ceil(high / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let tick = bottom; tick <= top + step / 2; tick += step) ticks.push(Number(tick.toPrecision(12)));
  return { domain: [ticks[0], ticks.at(-1)!], ticks };
}

/** Evenly spread category labels to print under the x axis (first and last included). */
export function categoryTicks<T>(labels: readonly T[], count = 6): T[] {
  if (labels.length <= count) return [...labels];
  const picked = new Set<number>();
  for (let index = 0; index < count; index++) picked.add(Math.round((index * (labels.length - 1)) / (count - 1)));
  return [...picked].map((index) => labels[index]);
}

/** Where a value sits on an axis, 0 at the bottom and 1 at the top; values outside are clamped. */
export function axisFraction(value: number, domain: readonly [number, number], scale: "linear" | "log" = "linear"): number {
  const [low, high] = scale === "log" ? [Math.log10(domain[0]), Math.log10(domain[1])] : domain;
  const at = scale === "log" ? Math.log10(value) : value;
  return Math.min(1, Math.max(0, (at - low) / (high - low || 1)));
}

/** The p-value axis' ticks (log scale). */
export const P_TICKS = [1e-6, 1e-4, 0.01, 0.05, 1];

/** Tick labels of each chart's y axis, the same in the still and the interactive plot. */
export const tickText = {
  lift: (digits: number) => (value: number) => value.toFixed(Math.min(digits, 1)),
  p: (value: number) => (value >= 0.01 ? String(value) : value.toExponential(0)),
  share: (value: number) => `${Math.round(value * 100)} %`,
  count: (value: number) => (value >= 1000 ? `${Math.round(value / 1000)}k` : String(value)),
};
