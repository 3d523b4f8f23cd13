/**
 * Argument guard: throws unless `value` is a probability strictly inside (0, 1).
 *
 * Reference: none (input validation). Complexity: O(1).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param name - the argument's name
 * @param value - the value to check
 * @returns nothing
 * @throws RangeError("<functionName> requires <name> in (0, 1), got …")
 * @example requireProbability("planSampleSize", "power", 0.8) // passes
 */
export function requireProbability(functionName: string, name: string, value: number): void {
  if (typeof value !== "number" || !(value > 0 && value < 1)) {
    throw new RangeError(`${functionName} requires ${name} in (0, 1), got ${String(value)}`);
  }
}
