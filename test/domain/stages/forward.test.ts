import { describe, expect, it } from "vitest";
import { T25_K } from "../../../domain/physics/constants.js";
import { stageForward } from "../../../domain/stages/forward.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { mosfet, siBodyDiode } from "../../helpers/stages.js";
import { relativeError } from "../../helpers/tolerance.js";

// A P-FET whose body diode carries nothing at these drops (Is = 1e-14 A), so the drop is I·R(Vgs)
// and Vgs = Vin − drop. Rds(on) 15 mΩ at 4.5 V, 10 mΩ at 10 V, threshold 2 V (test values).
function pfet(exponent: number, gateClampV?: number): StageModel {
  const m = mosfet(0.01, { law: "power", exponent });
  return {
    kind: "pfet-high-side",
    mosfet: { ...m, bodyDiode: { ...siBodyDiode, saturationCurrentA: 1e-14 } },
    ...(gateClampV === undefined ? {} : { gateClampV }),
    thermal: { kind: "junction-ambient", rthJaKPerW: 0 },
  };
}

/**
 * Closed form: on a segment where the 25 °C conductance is linear, G(v) = a + b·v, the gate
 * equation (Vin − v)·G(v) = I·f (f = R(T)/R25) is the quadratic b·v² + (a − b·Vin)·v + (I·f − a·Vin) = 0;
 * substitution from v = Vin reaches its larger root.
 */
function closedFormVgs(
  vin: number,
  currentA: number,
  f: number,
  seg: { x0: number; g0: number; x1: number; g1: number },
): number {
  const b = (seg.g1 - seg.g0) / (seg.x1 - seg.x0);
  const a = seg.g0 - b * seg.x0;
  const p = a - b * vin;
  const q = currentA * f - a * vin;
  return (-p + Math.sqrt(p * p - 4 * b * q)) / (2 * b);
}

describe("P-FET gate drive Vgs = Vin − drop (closed form of the piecewise-linear conductance)", () => {
  const below = { x0: 2, g0: 0, x1: 4.5, g1: 1 / 0.015 };
  const between = { x0: 4.5, g0: 1 / 0.015, x1: 10, g1: 1 / 0.01 };
  const cases = [
    { vin: 4, currentA: 2, tK: T25_K, exponent: 0, seg: below },
    { vin: 3, currentA: 1.5, tK: T25_K, exponent: 0, seg: below },
    { vin: 8, currentA: 3, tK: T25_K, exponent: 0, seg: between },
    { vin: 6, currentA: 5, tK: 400, exponent: 2.3, seg: between },
  ];
  for (const c of cases) {
    it(`Vin ${c.vin} V, ${c.currentA} A, ${c.tK} K`, () => {
      const f = (c.tK / T25_K) ** c.exponent;
      const vgs = closedFormVgs(c.vin, c.currentA, f, c.seg);
      expect(vgs).toBeGreaterThan(c.seg.x0);
      expect(vgs).toBeLessThan(c.seg.x1);
      const s = stageForward(pfet(c.exponent), c.currentA, c.tK, c.vin);
      expect(relativeError(s.gateSourceV ?? 0, vgs)).toBeLessThan(1e-11);
      expect(relativeError(s.dropV, c.vin - vgs)).toBeLessThan(1e-9);
      expect(s.mode).toBe(c.seg === below ? "partially-enhanced" : "fully-enhanced");
    });
  }

  it("above the highest Rds(on) point (no clamp): drop = I·Rds(on) at 10 V, Vgs = Vin − drop", () => {
    const s = stageForward(pfet(0), 4, T25_K, 14);
    expect(relativeError(s.dropV, 4 * 0.01)).toBeLessThan(1e-12);
    expect(Math.abs((s.gateSourceV ?? 0) - (14 - s.dropV))).toBeLessThan(1e-12);
    expect(s.mode).toBe("fully-enhanced");
  });

  it("a gate clamp below the input holds Vgs at the clamp: drop = I·Rds(on) at 10 V and above", () => {
    const s = stageForward(pfet(0, 12), 4, T25_K, 20);
    expect(s.gateSourceV).toBe(12);
    expect(relativeError(s.dropV, 4 * 0.01)).toBeLessThan(1e-12);
  });
});
