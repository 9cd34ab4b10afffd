import { describe, expect, it } from "vitest";
import { cToK } from "../../../domain/physics/constants.js";
import { type DiodeParams, diodeVoltageV } from "../../../domain/physics/diode.js";
import { fitDiode } from "../../../domain/physics/diode-fit.js";
import { createRng } from "../../../domain/solve/prng.js";

// Source: the model itself (diode.ts's linear law: the curve at T0 shifted by tc·(T − T0) at
// constant current, its slope n·Vt held at T0), points generated from known parameters with
// seeded Gaussian noise; the fit must recover the coefficient it was generated from.
const truth: DiodeParams = {
  saturationCurrentA: 2e-9,
  ideality: 1.6,
  seriesResistanceOhm: 0.03,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: cToK(25),
  linearTempCoVPerK: -0.0018,
};
const currents = [0.05, 0.2, 0.5, 1, 2, 4];
const grid = [25, 75, 125].flatMap((tC) => currents.map((currentA) => ({ currentA, tempK: cToK(tC) })));
const opts = { energyGapEv: 1.11, saturationTempExponent: 3, nominalTempK: cToK(25), fitLinearTempCo: true };

function pointsWithNoise(sigmaV: number, seed: number) {
  const rng = createRng(seed);
  return grid.map((p) => ({ ...p, voltageV: diodeVoltageV(truth, p.currentA, p.tempK) + sigmaV * rng.normal() }));
}

describe("diode forward fit with a linear Vf temperature coefficient", () => {
  it("recovers the coefficient and Is, n, Rs from noise-free points", () => {
    const fit = fitDiode(pointsWithNoise(0, 1), opts);
    if (!fit.ok) throw new Error(fit.message);
    expect(fit.fitted).toEqual(["saturationCurrentA", "ideality", "seriesResistanceOhm", "linearTempCoVPerK"]);
    expect(Math.abs((fit.params.linearTempCoVPerK ?? 0) - (truth.linearTempCoVPerK ?? 0))).toBeLessThan(1e-8);
    expect(Math.abs(fit.params.ideality - truth.ideality)).toBeLessThan(1e-6);
    expect(Math.abs(fit.params.seriesResistanceOhm - truth.seriesResistanceOhm)).toBeLessThan(1e-6);
    expect(fit.quality.rms).toBeLessThan(1e-9);
    expect(fit.quality.converged).toBe(true);
  });

  // Tolerance: 2 mV of noise on 18 points over 100 K: the coefficient's standard error is about
  // 2 mV / (100 K · √(18/3)) ≈ 10 µV/K; within 5 standard errors and within 0.05 mV/K absolute.
  it.each([21, 22, 23, 24, 25])("recovers it from points with 2 mV of seeded noise (seed %i)", (seed) => {
    const fit = fitDiode(pointsWithNoise(0.002, seed), opts);
    if (!fit.ok) throw new Error(fit.message);
    const tc = fit.params.linearTempCoVPerK ?? Number.NaN;
    const se = fit.standardErrors.linearTempCoVPerK ?? 0;
    expect(se).toBeGreaterThan(2e-6);
    expect(se).toBeLessThan(3e-5);
    expect(Math.abs(tc - (truth.linearTempCoVPerK ?? 0))).toBeLessThan(5 * se);
    expect(Math.abs(tc - (truth.linearTempCoVPerK ?? 0))).toBeLessThan(5e-5);
    expect(fit.quality.rms).toBeGreaterThan(0.001);
    expect(fit.quality.rms).toBeLessThan(0.003);
    expect(fit.quality.worstFraction).toBeLessThan(fit.quality.boundFraction);
  });

  it("refuses to fit it from one temperature, or from three points", () => {
    const oneT = fitDiode(
      pointsWithNoise(0, 1).filter((p) => p.tempK === cToK(25)),
      opts,
    );
    expect(oneT.ok).toBe(false);
    if (!oneT.ok) expect(oneT.message).toMatch(/two temperatures or more \(6 points at 1 temperature given\)/);
    const three = fitDiode(pointsWithNoise(0, 1).slice(0, 3), opts);
    expect(three.ok).toBe(false);
  });

  it("fits a different coefficient than the one held when given (the law is the points', not the default)", () => {
    const held = fitDiode(pointsWithNoise(0.002, 21), { ...opts, fitLinearTempCo: false, linearTempCoVPerK: -0.001 });
    if (!held.ok) throw new Error(held.message);
    expect(held.params.linearTempCoVPerK).toBe(-0.001);
    expect(held.fitted).toEqual(["saturationCurrentA", "ideality", "seriesResistanceOhm"]);
    const fitted = fitDiode(pointsWithNoise(0.002, 21), opts);
    if (!fitted.ok) throw new Error(fitted.message);
    expect(fitted.quality.rms).toBeLessThan(held.quality.rms);
  });
});
