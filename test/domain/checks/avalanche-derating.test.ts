import { describe, expect, it } from "vitest";
import { avalancheEnergyAtTjJ } from "../../../domain/checks/avalanche-derating.js";

// The avalanche energy rating at the starting Tj against its closed form
// E(Tj) = EAS·(Tjmax − Tj)/(Tjmax − 25 °C) (common practice: the datasheet's EAS-versus-starting-Tj
// curve is close to linear; docs/references.md "MOSFETs"), worked by hand below.
describe("avalancheEnergyAtTjJ", () => {
  it("is the rating at 25 °C, falls linearly and is 0 at Tj(max)", () => {
    expect(avalancheEnergyAtTjJ(0.1, 175, 25)).toBe(0.1);
    // 0.1·(175 − 85)/150 = 0.06 J; 0.1·(175 − 100)/150 = 0.05 J (half-way).
    expect(avalancheEnergyAtTjJ(0.1, 175, 85)).toBeCloseTo(0.06, 12);
    expect(avalancheEnergyAtTjJ(0.1, 175, 100)).toBeCloseTo(0.05, 12);
    // 150 °C on a 150 °C part: nothing left.
    expect(avalancheEnergyAtTjJ(0.02, 150, 150)).toBe(0);
    // 1 mJ, 175 °C part, 150 °C start: 1e-3·25/150.
    expect(avalancheEnergyAtTjJ(1e-3, 175, 150)).toBeCloseTo(1e-3 / 6, 15);
  });
  it("gives no credit below 25 °C and none beyond Tj(max)", () => {
    expect(avalancheEnergyAtTjJ(0.1, 175, -40)).toBe(0.1);
    expect(avalancheEnergyAtTjJ(0.1, 175, 200)).toBe(0);
    expect(avalancheEnergyAtTjJ(0.1, 25, 26)).toBe(0);
  });
  it("never rises with the starting Tj and stays finite", () => {
    let last = Number.POSITIVE_INFINITY;
    for (let t = -60; t <= 220; t += 0.5) {
      const e = avalancheEnergyAtTjJ(0.1, 175, t);
      expect(Number.isFinite(e)).toBe(true);
      expect(e).toBeLessThanOrEqual(last);
      expect(e).toBeGreaterThanOrEqual(0);
      last = e;
    }
  });
});
