import { describe, expect, it } from "vitest";
import { clampExponential, tauFromDecay } from "../../../domain/checks/clamp-energy.js";
import { pulseTrainRiseK, stepFoster, zthKPerW } from "../../../domain/physics/foster.js";
import { relativeError } from "../../helpers/tolerance.js";

const net = [
  { rKPerW: 0.5, tauS: 1e-3 },
  { rKPerW: 2, tauS: 0.1 },
  { rKPerW: 20, tauS: 30 },
];

describe("Foster network", () => {
  // Closed form: a single rectangular pulse P from 0 gives ΔTj(t) = P·Zth(t) while on and
  // P·(Zth(t) − Zth(t − tp)) after, Zth(t) = Σ Ri(1 − e^(−t/τi)) (docs/references.md, JESD51-14 practice).
  it("single pulse equals the closed form, and stepping reproduces it", () => {
    const p = 5;
    const tp = 0.2;
    for (const t of [1e-4, 0.01, 0.2, 0.5, 10]) {
      const closed = net.reduce(
        (s, n) => s + p * n.rKPerW * (1 - Math.exp(-t / n.tauS) - (t > tp ? 1 - Math.exp(-(t - tp) / n.tauS) : 0)),
        0,
      );
      expect(relativeError(pulseTrainRiseK(net, [{ startS: 0, endS: tp, powerW: p }], t), closed)).toBeLessThan(1e-12);
    }
    // Exact stepping over uneven steps lands on the same value (constant power within a step).
    let rises = [0, 0, 0];
    for (const dt of [0.05, 0.1, 0.05]) {
      rises = stepFoster(net, rises, p, dt);
    }
    expect(
      relativeError(
        rises.reduce((a, b) => a + b, 0),
        p * zthKPerW(net, 0.2),
      ),
    ).toBeLessThan(1e-12);
  });

  // Superposition (linearity of the thermal network): two pulses = sum of two single responses.
  it("superposes two pulses", () => {
    const pulses = [
      { startS: 0, endS: 0.05, powerW: 3 },
      { startS: 0.1, endS: 0.3, powerW: 7 },
    ];
    const t = 0.25;
    const single = (q: { startS: number; endS: number; powerW: number }) =>
      q.powerW * (zthKPerW(net, t - q.startS) - zthKPerW(net, t - q.endS));
    const [a, b] = pulses;
    if (a === undefined || b === undefined) throw new Error("two pulses");
    expect(relativeError(pulseTrainRiseK(net, pulses, t), single(a) + single(b))).toBeLessThan(1e-12);
    // Long after both pulses the junction is back near ambient.
    expect(pulseTrainRiseK(net, pulses, 1e4)).toBeLessThan(1e-9);
  });
});

describe("clamp energy for an exponentially decaying source", () => {
  // Check: the closed form (docs/references.md derivation) against direct numerical integration of
  // i(t) = max(0, (Ub + A·e^(−t/τ) − Vc)/Ri) and E = ∫ Vc·i dt (composite Simpson, 200 000 panels).
  it.each([
    { baseV: 13.5, amplitudeV: 87.5, tauS: 0.4 / Math.LN10, sourceResistanceOhm: 4, clampV: 33 },
    { baseV: 0, amplitudeV: 150, tauS: 2e-3 / Math.LN10, sourceResistanceOhm: 10, clampV: 40 },
    { baseV: 27, amplitudeV: 175, tauS: 0.35 / Math.LN10, sourceResistanceOhm: 8, clampV: 58 },
  ])("matches numerical integration: %o", ({ clampV, ...pulse }) => {
    const r = clampExponential(pulse, clampV);
    expect(r.conducts).toBe(true);
    if (r.conducts !== true) return;
    const end = r.conductionTimeS;
    const n = 200_000;
    const h = end / n;
    const i = (t: number) =>
      Math.max(0, (pulse.baseV + pulse.amplitudeV * Math.exp(-t / pulse.tauS) - clampV) / pulse.sourceResistanceOhm);
    let q = i(0) + i(end);
    for (let k = 1; k < n; k += 1) q += (k % 2 ? 4 : 2) * i(k * h);
    q *= h / 3;
    expect(relativeError(r.chargeC, q)).toBeLessThan(1e-6);
    expect(relativeError(r.energyJ, clampV * q)).toBeLessThan(1e-6);
    expect(relativeError(r.peakCurrentA, i(0))).toBeLessThan(1e-12);
    expect(i(end)).toBeLessThan(1e-9);
  });

  it("a clamp above the peak never conducts; one below the base always would", () => {
    expect(clampExponential({ baseV: 13.5, amplitudeV: 20, tauS: 0.1, sourceResistanceOhm: 1 }, 40).conducts).toBe(
      false,
    );
    expect(clampExponential({ baseV: 13.5, amplitudeV: 20, tauS: 0.1, sourceResistanceOhm: 1 }, 12).conducts).toBe(
      "always",
    );
  });

  // Convention (docs/references.md, memory): td to 10 % of the peak means τ = td/ln 10.
  it("reads td as the time to 10 %", () => {
    expect(Math.exp(-0.4 / tauFromDecay(0.4, "to-10-percent"))).toBeCloseTo(0.1, 12);
  });
});
