/** One shared set of tolerances for every reference check of lib/sequential (the issue fixes these). */
export const TOLERANCE = {
  /** absolute, for z statistics */
  z: 1e-9,
  /** relative, for p-values */
  pRelative: 1e-6,
  /** absolute, for group-sequential boundaries */
  boundary: 1e-4,
  /** absolute, for the error rate of naive repeated tests */
  peeking: 1e-4,
} as const;

/** True when `actual` is within `relative` of `expected`, relative to |expected|. */
export function closeRelative(actual: number, expected: number, relative: number): boolean {
  if (expected === 0) return Math.abs(actual) <= relative;
  return Math.abs(actual - expected) <= relative * Math.abs(expected);
}
