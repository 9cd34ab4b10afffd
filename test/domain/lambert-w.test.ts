import { describe, expect, it } from "vitest";
import { lambertW0, wrightOmega } from "../../domain/physics/lambert-w.js";

describe("Lambert W0 and Wright omega", () => {
  // Closed form: W0 is the inverse of w·e^w (Corless et al. 1996); check by substitution.
  it.each([-0.36, -0.2, -1e-5, 1e-8, 0.5, 1, Math.E, 10, 1e3, 1e10, 1e100])("W0(%f) satisfies w·e^w = x", (x) => {
    const w = lambertW0(x);
    expect(Math.abs(w * Math.exp(w) - x)).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(x)));
  });
  it("known values: W0(e) = 1, W0(-1/e) = -1, W0(1) = Ω = 0.5671432904097838 (omega constant)", () => {
    expect(lambertW0(Math.E)).toBeCloseTo(1, 14);
    expect(lambertW0(-1 / Math.E)).toBeCloseTo(-1, 6);
    expect(lambertW0(1)).toBeCloseTo(0.5671432904097838, 15);
  });
  it.each([-800, -50, 0, 0.5, 5, 50, 700, 1e4, 1e8])("ω(%f) satisfies ω + ln ω = x", (x) => {
    const w = wrightOmega(x);
    if (x < -700) expect(w).toBeCloseTo(Math.exp(x), 300);
    else expect(Math.abs(w + Math.log(w) - x)).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(x)));
  });
});
