import { describe, expect, it } from "vitest";
import {
  breakdownAtTjV,
  DEFAULT_VDS_TEMPCO_PER_K,
  mosfetBreakdownColdV,
} from "../../../domain/checks/breakdown-temperature.js";
import { pfetStage, schottkyStage } from "../../fixtures/reverse-stages.js";

// The breakdown against its closed form V(Tj) = V25·(1 + α·(Tj − 25 °C)) below 25 °C (a linear
// temperature coefficient, +0.1 %/K by default: memory), worked by hand below.
describe("breakdownAtTjV", () => {
  it("scales the 25 °C rating down with the coefficient below 25 °C", () => {
    expect(breakdownAtTjV(60, 0.001, -40)).toBeCloseTo(56.1, 12);
    expect(breakdownAtTjV(40, 0.0008, -40)).toBeCloseTo(40 * (1 - 0.052), 12);
    expect(breakdownAtTjV(100, 0.001, 0)).toBeCloseTo(97.5, 12);
  });
  it("takes no credit above 25 °C and stays positive to absolute zero at the largest coefficient", () => {
    expect(breakdownAtTjV(60, 0.001, 25)).toBe(60);
    expect(breakdownAtTjV(60, 0.001, 150)).toBe(60);
    expect(breakdownAtTjV(60, 0.003, -273.15)).toBeGreaterThan(0);
  });
  it("applies the default coefficient to a MOSFET stage, and none to a diode", () => {
    expect(DEFAULT_VDS_TEMPCO_PER_K).toBe(0.001);
    if (pfetStage.kind !== "pfet-high-side") throw new Error("fixture changed");
    expect(mosfetBreakdownColdV(pfetStage, -40)).toBeCloseTo(pfetStage.mosfet.vdsMaxV * (1 - 0.065), 12);
    expect(
      mosfetBreakdownColdV({ ...pfetStage, mosfet: { ...pfetStage.mosfet, vdsTempCoPerK: 0.002 } }, -40),
    ).toBeCloseTo(pfetStage.mosfet.vdsMaxV * (1 - 0.13), 12);
    expect(mosfetBreakdownColdV(schottkyStage, -40)).toBeUndefined();
  });
});
