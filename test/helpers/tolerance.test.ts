import { describe, expect, it } from "vitest";
import { relativeError, withinTolerance } from "./tolerance.js";

describe("tolerance helper", () => {
  it("accepts inside and rejects outside the band", () => {
    expect(withinTolerance(1.0009, 1, 1e-3)).toBe(true);
    expect(withinTolerance(1.0011, 1, 1e-3)).toBe(false);
    expect(withinTolerance(0.5e-6, 0, 0, 1e-6)).toBe(true);
    expect(withinTolerance(2e-6, 0, 0, 1e-6)).toBe(false);
    expect(withinTolerance(Number.NaN, 0, 1, 1)).toBe(false);
    expect(relativeError(1.1, 1)).toBeCloseTo(0.1, 12);
  });
});
