/**
 * Argument guard: throws unless `value` is a finite number.
 *
 * Reference: none (input validation, STYLE.md "lib/sequential validates its own arguments").
 * Complexity: O(1).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param name - the argument's name
 * @param value - the value to check
 * @returns nothing
 * @throws RangeError("<functionName> requires <name> to be a finite number, got …")
 * @example requireFinite("twoSampleZTest", "sum", 3) // passes
 */
export function requireFinite(functionName: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new RangeError(`${functionName} requires ${name} to be a finite number, got ${String(value)}`);
  }
}
