import { describe, expect, it } from "vitest";
import { dp45Step, integrateRk45 } from "../../../domain/solve/ode-rk45.js";
import { relativeError } from "../../helpers/tolerance.js";

const opts = { rtol: 1e-9, atol: 1e-12, initialStepS: 1e-3, maxStepS: 1, maxSteps: 100_000 };

describe("Dormand-Prince 4(5)", () => {
  // Source: closed form y = e^(−t) of y' = −y; a single step is 5th order: halving h divides the
  // local error by about 2^6 = 64 (local error of a p-th order method is O(h^(p+1))).
  it("a single step is fifth order", () => {
    const f = (_t: number, y: readonly number[]): number[] => [-(y[0] ?? 0)];
    const e1 = Math.abs((dp45Step(f, 0, [1], 0.2).y5[0] ?? 0) - Math.exp(-0.2));
    const e2 = Math.abs((dp45Step(f, 0, [1], 0.1).y5[0] ?? 0) - Math.exp(-0.1));
    expect(e1 / e2).toBeGreaterThan(50);
    expect(e1 / e2).toBeLessThan(80);
  });

  // Source: closed forms of the harmonic oscillator y'' = −y (cos, sin) over ten periods.
  it("integrates an oscillator to the requested tolerance", () => {
    const r = integrateRk45((_t, y) => [y[1] ?? 0, -(y[0] ?? 0)], 0, [1, 0], 20 * Math.PI, opts);
    expect(r.outcome).toBe("end");
    expect(Math.abs((r.y[0] ?? 0) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.y[1] ?? 0)).toBeLessThan(1e-6);
  });

  // Source: closed form t* = ln 2 where e^(−t) crosses 0.5.
  it("locates an event", () => {
    const r = integrateRk45((_t, y) => [-(y[0] ?? 0)], 0, [1], 10, { ...opts, event: (_t, y) => (y[0] ?? 0) - 0.5 });
    expect(r.outcome).toBe("event");
    expect(relativeError(r.t, Math.LN2)).toBeLessThan(1e-9);
    if (r.outcome === "event")
      expect(Math.abs((r.y[0] ?? 0) - 0.5)).toBeLessThanOrEqual((r.localErrorSum[0] ?? 0) + 1e-12);
  });
});
