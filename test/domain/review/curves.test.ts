import { describe, expect, it } from "vitest";
import { solveCorners, worstCase } from "../../../domain/checks/corners.js";
import { curveAmbients, curveLoadLevels, reviewCurves } from "../../../domain/review/curves.js";
import { idealDiode } from "../../helpers/stages.js";
import { withinTolerance } from "../../helpers/tolerance.js";

// A 10 mΩ channel with no temperature coefficient, fully enhanced (10 V drive above 3 V), no
// regulated drop: the closed form is drop = I·R, loss = I²·R, Tj = Ta + Rth·I²·R (Ohm's law and
// the steady thermal path, docs/references.md); 1e-5 relative covers the circuit solve's convergence and the
// body diode's share in parallel (nanoamperes at these millivolts).
const R = 0.01;
const RTH = 20;
const stage = idealDiode(R, { rth: RTH });
const space = {
  supplyMinV: 9,
  supplyNominalV: 12,
  supplyMaxV: 16,
  ambientMinC: -40,
  ambientMaxC: 85,
  loadScales: [0.1, 1],
  sourceResistanceOhm: 0.02,
  load: { kind: "constant-current", currentA: 5 } as const,
};

describe("review curves", () => {
  const corners = solveCorners(stage, space);
  const worst = worstCase(corners);
  const curves = reviewCurves(stage, space, corners, worst);

  it("sweep grids: 0.05 … 1.2 of full load with the requirement's levels, the ambient range in ten steps", () => {
    expect(curveLoadLevels([0.1, 1])).toEqual([0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1, 1.1, 1.2]);
    expect(curveLoadLevels([0.25, 0.5])).toContain(0.25);
    expect(curveAmbients(-40, 85)).toHaveLength(11);
    expect(curveAmbients(-40, 85)[10]).toBe(85);
  });

  it("passes through the worst-Tj corner with the same numbers (same solve)", () => {
    expect(curves.conditions.basis).toBe("worst-tj-corner");
    const w = worst.tjC;
    if (w === undefined) throw new Error("no worst corner");
    const corner = corners[w.cornerIndex];
    if (corner === undefined || !("point" in corner.result)) throw new Error("worst corner unsolved");
    expect(curves.conditions.ambientC).toBe(85);
    const onLoad = curves.load.find((p) => p.loadScale === curves.conditions.loadScale);
    const onAmbient = curves.ambient.find((p) => p.ambientC === curves.conditions.ambientC);
    if (!onLoad || !("point" in onLoad.result) || !onAmbient || !("point" in onAmbient.result))
      throw new Error("curve misses the corner");
    expect(onLoad.result.point.tjC).toBe(corner.result.point.tjC);
    expect(onAmbient.result.point.tjC).toBe(corner.result.point.tjC);
  });

  it("follows the closed form I·R, I²·R and Ta + Rth·I²·R along both sweeps", () => {
    for (const p of curves.load) {
      if (!("point" in p.result)) throw new Error(`no point at ×${p.loadScale}`);
      const i = 5 * p.loadScale;
      expect(withinTolerance(p.result.point.forward.dropV, i * R, 1e-5)).toBe(true);
      expect(withinTolerance(p.result.point.dieLossW, i * i * R, 1e-5)).toBe(true);
      expect(withinTolerance(p.result.point.tjC, 85 + RTH * i * i * R, 1e-5)).toBe(true);
    }
    for (const p of curves.ambient) {
      if (!("point" in p.result)) throw new Error(`no point at ${p.ambientC} °C`);
      expect(withinTolerance(p.result.point.tjC, p.ambientC + RTH * 25 * R, 1e-5, 1e-9)).toBe(true);
    }
  });
});
