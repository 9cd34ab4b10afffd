import { describe, expect, it } from "vitest";
import { gateFit } from "../../api/map/fit-gate.js";
import { fitQuality } from "../../domain/fit/fit-quality.js";
import { leastSquares } from "../../domain/fit/least-squares.js";

// A fit 1 % off at its worst point, against a 5 % bound: within the bound.
const modelled = [1.0, 2.02, 2.97];
const measured = [1.0, 2.0, 3.0];
const describe_ = (i: number) => `point ${i}`;

describe("the fit gate reads whether the solver converged", () => {
  it("passes a converged fit within its bound, and states its residuals", () => {
    const q = fitQuality(modelled, measured, 0.05, { converged: true, iterations: 12 });
    const s = gateFit(q, undefined, ["curve", "points"], "curve", "V", 3, describe_);
    expect(s).toMatch(/least-squares fit to 3 points/);
    expect(s).not.toMatch(/iteration cap/);
  });

  it("refuses a fit that stopped at its iteration cap, naming the cap, unless the caller accepts it", () => {
    const q = fitQuality(modelled, measured, 0.05, { converged: false, iterations: 500 });
    let message = "";
    try {
      gateFit(q, undefined, ["curve", "points"], "curve", "V", 3, describe_);
    } catch (e) {
      message = (e as Error).message;
    }
    expect(message).toMatch(/stopped at its iteration cap \(500 iterations\) before converging/);
    expect(message).toMatch(/acceptFit: true/);
    const accepted = gateFit(q, true, ["curve", "points"], "curve", "V", 3, describe_);
    expect(accepted).toMatch(/iteration cap \(500 iterations\).*accepted by the caller \(acceptFit\)/);
  });

  it("refuses a fit whose exact solver stalled before its cap, giving the stall, unless the caller accepts it", () => {
    const stalled = leastSquares({
      residuals: (u) => [Math.abs(u[0] ?? 0) + 1],
      start: [2],
      lower: [-10],
      upper: [10],
    });
    if (stalled.outcome !== "solved") throw new Error(stalled.outcome);
    const q = fitQuality(modelled, measured, 0.05, stalled);
    expect(q.converged).toBe(false);
    expect(() => gateFit(q, undefined, ["curve", "points"], "curve", "V", 3, describe_)).toThrow(
      /the solver stalled after \d+ iterations.*so its parameters are not a converged least-squares solution.*acceptFit: true/,
    );
    expect(gateFit(q, true, ["curve", "points"], "curve", "V", 3, describe_)).toMatch(
      /stalled after \d+ iterations.*accepted by the caller \(acceptFit\)/,
    );
  });

  it("names both faults when a capped fit is also beyond its bound", () => {
    const q = fitQuality([1, 2.5, 3], measured, 0.05, { converged: false, iterations: 150 });
    expect(() => gateFit(q, false, ["p"], "curve", "V", 3, describe_)).toThrow(
      /beyond the 5.00 % bound \(and the solver stopped at its iteration cap \(150 iterations\)/,
    );
  });
});
