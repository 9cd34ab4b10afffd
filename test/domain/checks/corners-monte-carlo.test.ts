import { describe, expect, it } from "vitest";
import { solveCorners, worstCase } from "../../../domain/checks/corners.js";
import { distributionOf, monteCarlo } from "../../../domain/checks/monte-carlo.js";
import { lowSideFet } from "../../helpers/stages.js";

// A model linear in its parameters: a low-side N-FET with temperature-independent Rds(on) at a
// constant current, so Tj = Ta + Rth·I²·R·k exactly (closed form), linear in Ta and in k.
const rth = 20;
const stage = lowSideFet(0.01, rth, { law: "power", exponent: 0 });
const load = { kind: "constant-current" as const, currentA: 5 };

describe("corner search", () => {
  it("finds the analytic worst case of a model linear in its parameters", () => {
    const space = {
      supplyMinV: 9,
      supplyNominalV: 13.5,
      supplyMaxV: 16,
      ambientMinC: -40,
      ambientMaxC: 85,
      loadScales: [1, 0.5],
      sourceResistanceOhm: 0,
      load,
      datasheetMax: { rdsOnFactor: 1.3, forwardVoltageFactor: 1, rthFactor: 1 },
    };
    const corners = solveCorners(stage, space);
    expect(corners).toHaveLength(3 * 2 * 2 * 2);
    const w = worstCase(corners);
    const worstTj = w.tjC;
    if (worstTj === undefined) throw new Error("no worst Tj");
    const c = corners[worstTj.cornerIndex]?.conditions;
    expect(c?.ambient).toBe("max");
    expect(c?.tolerance).toBe("datasheet-max");
    expect(c?.loadScale).toBe(1);
    // The body diode (Is 10 fA) is negligible at 65 mV: compare with the channel alone.
    expect(worstTj.value).toBeCloseTo(85 + rth * 25 * 0.013, 6);
    expect(w.loadMinV?.value).toBeCloseTo(9 - 5 * 0.013, 6);
  });
});

describe("Monte Carlo", () => {
  // Check: for Tj linear in Ta and in the Rds(on) factor, E[Tj] = E[Ta] + Rth·I²·R·E[k] = Ta0 + 5 K;
  // the sample mean of 10 000 draws lies within 4 standard errors (σTj/√N) of it.
  it("converges to the analytic mean, and the same seed gives identical samples", () => {
    const run = (seed: number) => {
      const tj: number[] = [];
      monteCarlo(
        {
          stage,
          supplyV: 13.5,
          ambientC: 50,
          sourceResistanceOhm: 0,
          load,
          tolerances: [
            { parameter: "ambientC", distribution: "normal", sigma: 5 },
            { parameter: "rdsOn", distribution: "uniform", halfWidth: 0.2 },
          ],
          samples: 10_000,
          seed,
        },
        (s) => {
          if ("point" in s.result) tj.push(s.result.point.tjC);
        },
      );
      return tj;
    };
    const a = run(42);
    expect(a).toHaveLength(10_000);
    const d = distributionOf(a);
    if (d === undefined) throw new Error("empty");
    // σ² = 5² + (5 K · 0.2)²/3 for Ta normal(σ = 5 K) and a uniform ±20 % on a 5 K rise.
    const sigma = Math.sqrt(25 + (5 * 0.2) ** 2 / 3);
    expect(Math.abs(d.mean - 55)).toBeLessThan((4 * sigma) / Math.sqrt(10_000));
    expect(d.std).toBeCloseTo(sigma, 1);
    expect(JSON.stringify(run(42))).toBe(JSON.stringify(a));
    expect(run(43)[0]).not.toBe(a[0]);
  });
});
