import { describe, expect, it } from "vitest";
import { junctionLaw } from "../../../domain/checks/bridge-element.js";
import type { AcBridgeCircuit } from "../../../domain/solve/ac-bridge-circuit.js";
import { offDecayOf, offMoments, offOutV, onsetS } from "../../../domain/solve/ac-bridge-off-interval.js";
import { integratePeriod } from "../../../domain/solve/ac-bridge-period.js";
import type { LoadModel } from "../../../domain/solve/load-model.js";
import { demoPn } from "../../helpers/bridge-parts.js";
import { relativeError } from "../../helpers/tolerance.js";

const law = junctionLaw(demoPn, 298.15);
const laws = { positive: [law, law], negative: [law, law] } as const;

function circuit(load: LoadModel, leakageInductanceH: number): AcBridgeCircuit {
  return {
    sourceRmsV: 24,
    frequencyHz: 50,
    sourceResistanceOhm: 0.5,
    leakageInductanceH,
    capacitanceF: 2200e-6,
    esrOhm: 0.05,
    load,
    pairLaws: () => laws,
  };
}

describe("AC bridge off interval in closed form", () => {
  // Source: closed form against the general path — the same period map integrated with the
  // off intervals stepped by TR-BDF2 at a tight tolerance (1e-9) must agree with the one exact
  // step per off interval to the general path's own error (the closed form is the exact
  // solution of the linear RC discharge, so the difference is the general path's error).
  const loads: LoadModel[] = [
    { kind: "resistive", resistanceOhm: 20 },
    { kind: "constant-current", currentA: 1.3 },
  ];
  for (const load of loads) {
    for (const lh of [0, 2e-3]) {
      it(`${load.kind} load, L = ${lh * 1e3} mH: the same map as the general steps`, () => {
        const c = circuit(load, lh);
        const x = lh > 0 ? [27, 0] : [27];
        const opt = { rtol: 1e-9, voltageScaleV: 33.9, currentScaleA: 1.7, record: false, jacobian: true };
        const fast = integratePeriod(c, x, opt);
        const general = integratePeriod(c, x, { ...opt, generalOffInterval: true });
        if (!fast.ok || !general.ok) throw new Error("no map");
        expect(fast.steps).toBeLessThan(general.steps);
        expect(Math.abs((fast.end[0] ?? 0) - (general.end[0] ?? 0))).toBeLessThan(2e-6);
        const a = fast.integrals;
        const b = general.integrals;
        for (const k of [
          "sourceEnergyJ",
          "lineA2s",
          "esrEnergyJ",
          "capA2s",
          "loadEnergyJ",
          "loadAs",
          "outVs",
          "outMinV",
          "outMaxV",
        ] as const) {
          expect(relativeError(a[k], b[k])).toBeLessThan(1e-6);
        }
        for (let s = 0; s < 4; s += 1)
          expect(relativeError(a.elementEnergyJ[s] ?? 0, b.elementEnergyJ[s] ?? 0)).toBeLessThan(1e-5);
        // The map derivative through the closed form: the capacitor row agrees as well.
        expect(relativeError(fast.jacobian?.[0]?.[0] ?? 0, general.jacobian?.[0]?.[0] ?? 1)).toBeLessThan(1e-4);
      });
    }
  }

  it("moments: the closed forms against a composite Simpson rule", () => {
    // Source: numerical quadrature (Simpson, 2000 panels) of the closed-form output curve.
    for (const load of loads) {
      const d = offDecayOf(circuit(load, 0));
      if (d === undefined) throw new Error("no closed form");
      const span = 6e-3;
      const n = 2000;
      let v = 0;
      let v2 = 0;
      for (let k = 0; k <= n; k += 1) {
        const w = k === 0 || k === n ? 1 : k % 2 === 1 ? 4 : 2;
        const o = offOutV(d, 29, (k * span) / n);
        v += w * o;
        v2 += w * o * o;
      }
      const m = offMoments(d, 29, span);
      expect(relativeError(m.vS, (v * span) / (3 * n))).toBeLessThan(1e-10);
      expect(relativeError(m.v2S, (v2 * span) / (3 * n))).toBeLessThan(1e-10);
    }
  });

  it("onset: the source's rising edge meets the decaying output at the returned time", () => {
    // Source: the onset condition |e(t)| = outV(t) (a junction law drops 0 V at zero current),
    // checked on both sides of the returned root.
    const c = circuit({ kind: "resistive", resistanceOhm: 20 }, 0);
    const d = offDecayOf(c);
    if (d === undefined) throw new Error("no closed form");
    const m = (t: number) => Math.SQRT2 * 24 * Math.sin(2 * Math.PI * 50 * t) - offOutV(d, 27, t);
    const t = onsetS(c, d, 0, 5e-3, 27, 0);
    if (t === undefined) throw new Error("no onset");
    expect(m(t)).toBeLessThanOrEqual(0);
    expect(m(t + 1e-9)).toBeGreaterThan(0);
    // A reservoir above the source's peak: no onset in the quarter period.
    expect(onsetS(c, d, 0, 5e-3, 40, 0)).toBeUndefined();
  });
});
