/** |actual − expected| ≤ rel·|expected| + abs. */
export function withinTolerance(actual: number, expected: number, rel: number, abs = 0): boolean {
  return Number.isFinite(actual) && Math.abs(actual - expected) <= rel * Math.abs(expected) + abs;
}

export function relativeError(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.max(Math.abs(expected), Number.MIN_VALUE);
}
