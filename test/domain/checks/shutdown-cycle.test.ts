import { describe, expect, it } from "vitest";
import { shutdownCycle } from "../../../domain/checks/shutdown-cycle.js";
import { stepFoster } from "../../../domain/physics/foster.js";

// The auto-retry cycle of a thermal shutdown against the first-order closed form
// (docs/references.md, thermal shutdown of an integrated switch): heating from Tr to Tsd toward
// Tss = Ta + R·P takes τ·ln((Tss − Tr)/(Tss − Tsd)), cooling from Tsd to Tr toward Ta takes
// τ·ln((Tsd − Ta)/(Tr − Ta)); and, for a network of several poles, against the same cycle
// simulated step by step (the Foster nodes advanced exactly, stepFoster) until it repeats.

const P = 20;
const TA = 85;
const TSD = 150;
const H = 15;

describe("shutdownCycle", () => {
  it("one pole: t = τ·ln(...) both ways, the duty independent of τ", () => {
    const tau = 0.8;
    const r = 5; // Tss = 85 + 100 = 185 °C
    const c = shutdownCycle(P, TA, TSD, H, { foster: [{ rKPerW: r, tauS: tau }] });
    if (c.outcome !== "cycles") throw new Error(c.outcome);
    const heat = tau * Math.log((185 - 135) / (185 - 150));
    const cool = tau * Math.log((150 - 85) / (135 - 85));
    expect(c.heatS).toBeCloseTo(heat, 12);
    expect(c.coolS).toBeCloseTo(cool, 12);
    expect(c.periodS).toBeCloseTo(heat + cool, 12);
    expect(c.dutyOn).toBeCloseTo(heat / (heat + cool), 12);
    expect(c.averageLossW).toBeCloseTo((P * heat) / (heat + cool), 12);
    const noNet = shutdownCycle(P, TA, TSD, H, { rthKPerW: r });
    if (noNet.outcome !== "cycles") throw new Error(noNet.outcome);
    expect(noNet.dutyOn).toBeCloseTo(c.dutyOn, 12);
    expect(noNet.periodS).toBeUndefined();
    expect(noNet.thermalModel).toBe("single-pole");
  });

  it("two poles of the same τ are one pole: the periodic fixed point gives the closed form", () => {
    const c = shutdownCycle(P, TA, TSD, H, {
      foster: [
        { rKPerW: 2, tauS: 0.8 },
        { rKPerW: 3, tauS: 0.8 },
      ],
    });
    if (c.outcome !== "cycles") throw new Error(c.outcome);
    expect(c.heatS).toBeCloseTo(0.8 * Math.log(50 / 35), 10);
    expect(c.coolS).toBeCloseTo(0.8 * Math.log(65 / 50), 10);
  });

  it("a network of three poles: the cycle simulated step by step settles to the same period and duty", () => {
    const net = [
      { rKPerW: 0.5, tauS: 0.002 },
      { rKPerW: 1.5, tauS: 0.05 },
      { rKPerW: 3, tauS: 2 },
    ];
    const c = shutdownCycle(P, TA, TSD, H, { foster: net });
    if (c.outcome !== "cycles") throw new Error(c.outcome);
    // brute force: 2 µs steps from ambient, switching at the thresholds, last cycles measured
    const dt = 2e-6;
    let rises = [0, 0, 0];
    let on = true;
    let t = 0;
    const edges: { t: number; on: boolean }[] = [];
    while (edges.length < 400 && t < 200) {
      rises = stepFoster(net, rises, on ? P : 0, dt);
      t += dt;
      const tj = TA + rises.reduce((a, b) => a + b, 0);
      if (on && tj >= TSD) {
        on = false;
        edges.push({ t, on });
      } else if (!on && tj <= TSD - H) {
        on = true;
        edges.push({ t, on });
      }
    }
    const [e0, e1, e2] = edges.slice(edges.length - 3); // off, on, off (or on, off, on)
    if (e0 === undefined || e1 === undefined || e2 === undefined || c.periodS === undefined)
      throw new Error("no cycle");
    const period = e2.t - e0.t;
    expect(Math.abs(period - c.periodS) / c.periodS).toBeLessThan(2e-3);
    const onTime = e0.on ? e1.t - e0.t : e2.t - e1.t;
    expect(Math.abs(onTime / period - c.dutyOn)).toBeLessThan(2e-3);
  });

  it("a retry level at or below ambient never comes: stays off; a steady rise below the shutdown does not trip", () => {
    expect(shutdownCycle(P, TA, TSD, 70, { rthKPerW: 5 }).outcome).toBe("stays-off");
    expect(shutdownCycle(P, TA, TSD, H, { rthKPerW: 3 }).outcome).toBe("does-not-trip");
  });
});
