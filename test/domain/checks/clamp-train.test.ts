import { describe, expect, it } from "vitest";
import { clampExponential } from "../../../domain/checks/clamp-energy.js";
import { clampTrainTj } from "../../../domain/checks/clamp-train.js";
import type { FosterTerm } from "../../../domain/physics/foster.js";

// The clamp's junction over a pulse train (domain/checks/clamp-train.ts) against outside
// references: the single-stage closed form of a periodic rectangular train (geometric series,
// docs/references.md "Thermal"), the same train summed pulse by pulse from the step response,
// and the true exponential clamp power integrated numerically through the network (it must stay
// below the rectangle bound). Conservation: N → ∞ is the steady periodic state, duty → 1 the DC
// steady state R·P.

const computed = (x: ReturnType<typeof clampTrainTj>) => {
  if (x.outcome !== "computed") throw new Error(`expected a computed train, got ${x.outcome}`);
  return x;
};

describe("clamp junction over a pulse train", () => {
  const r = 40;
  const tau = 0.8;
  const one: FosterTerm[] = [{ rKPerW: r, tauS: tau }];

  it("single stage: the end of the n-th pulse is R·P·(1 − e^(−w/τ))·(1 − e^(−nT/τ))/(1 − e^(−T/τ)) (geometric series)", () => {
    const e = 0.5;
    const p = 200;
    const w = e / p;
    const rep = { periodS: 0.5, count: 12 };
    const out = computed(clampTrainTj(e, p, one, rep, 85));
    const closed =
      (r * p * (1 - Math.exp(-w / tau)) * (1 - Math.exp((-rep.count * rep.periodS) / tau))) /
      (1 - Math.exp(-rep.periodS / tau));
    expect(out.equivalentWidthS).toBeCloseTo(w, 15);
    expect(out.trainTjC - 85).toBeCloseTo(closed, 9);
    // Brute force: the step response of every pulse, summed at the end of the last one.
    const tEnd = (rep.count - 1) * rep.periodS + w;
    let sum = 0;
    for (let k = 0; k < rep.count; k += 1) {
      const on = tEnd - k * rep.periodS;
      const off = on - w;
      sum += r * p * (1 - Math.exp(-on / tau)) - (off > 0 ? r * p * (1 - Math.exp(-off / tau)) : 0);
    }
    expect(out.trainTjC - 85).toBeCloseTo(sum, 9);
    expect(out.singlePulseTjC - 85).toBeCloseTo(r * p * (1 - Math.exp(-w / tau)), 9);
  });

  it("many pulses reach the steady periodic peak; at duty 1 it is the DC steady state R·P (conservation)", () => {
    const net: FosterTerm[] = [
      { rKPerW: 2, tauS: 1e-3 },
      { rKPerW: 10, tauS: 0.1 },
      { rKPerW: 30, tauS: 5 },
    ];
    const long = computed(clampTrainTj(0.1, 100, net, { periodS: 0.01, count: 1_000_000 }, 25));
    expect(long.trainTjC).toBeCloseTo(long.steadyPeriodicTjC, 9);
    const dc = computed(clampTrainTj(1, 2, net, { periodS: 0.5, count: 1_000_000 }, 25));
    expect(dc.trainTjC - 25).toBeCloseTo(2 * 42, 6);
    expect(dc.steadyPeriodicTjC - 25).toBeCloseTo(2 * 42, 6);
    const few = computed(clampTrainTj(0.1, 100, net, { periodS: 0.01, count: 3 }, 25));
    expect(few.trainTjC).toBeGreaterThan(few.singlePulseTjC);
    expect(few.trainTjC).toBeLessThan(few.steadyPeriodicTjC);
  });

  it("bounds the true exponential clamp power of the train (numerical integration, within 40 % of it)", () => {
    // A 100 V / 2 ohm pulse with τ = 2 ms into a 30 V clamp, every 20 ms, 40 times.
    const pulse = { baseV: 0, amplitudeV: 100, tauS: 2e-3, sourceResistanceOhm: 2 };
    const duty = clampExponential(pulse, 30);
    if (duty.conducts !== true) throw new Error("the clamp must conduct");
    const net: FosterTerm[] = [
      { rKPerW: 1, tauS: 2e-4 },
      { rKPerW: 5, tauS: 5e-3 },
      { rKPerW: 20, tauS: 0.5 },
    ];
    const rep = { periodS: 20e-3, count: 40 };
    const bound = computed(clampTrainTj(duty.energyJ, duty.peakPowerW, net, rep, 25));
    // P(t) = Vc·(A·e^(−t/τ) − B)/Ri while it conducts; each node stepped exactly for the mean power of a 1 us step.
    const power = (t: number) => {
      const s = t % rep.periodS;
      const i = (100 * Math.exp(-s / 2e-3) - 30) / 2;
      return i > 0 ? 30 * i : 0;
    };
    const dt = 1e-6;
    const rises = net.map(() => 0);
    let peak = 0;
    for (let n = 0; n * dt < rep.count * rep.periodS; n += 1) {
      const pw = 0.5 * (power(n * dt) + power((n + 1) * dt));
      net.forEach((term, k) => {
        const d = Math.exp(-dt / term.tauS);
        rises[k] = (rises[k] ?? 0) * d + term.rKPerW * pw * (1 - d);
      });
      peak = Math.max(
        peak,
        rises.reduce((a, b) => a + b, 0),
      );
    }
    expect(bound.trainTjC - 25).toBeGreaterThanOrEqual(peak);
    expect(bound.trainTjC - 25).toBeLessThan(1.4 * peak);
  });

  it("a period shorter than the pulse's equivalent width is its own outcome", () => {
    const out = clampTrainTj(1, 10, one, { periodS: 0.05, count: 5 }, 25);
    expect(out.outcome).toBe("overlapping");
  });

  it("a clamp that takes no energy stays at its starting junction", () => {
    const out = computed(clampTrainTj(0, 0, one, { periodS: 1, count: 5 }, 70));
    expect([out.singlePulseTjC, out.trainTjC, out.steadyPeriodicTjC]).toEqual([70, 70, 70]);
  });
});
