import type { CornerResult } from "../../domain/checks/corners.js";
import type { OperatingPointOutcome, ThermalPoint } from "../../domain/solve/electrothermal-point.js";

/** A review corner as the answer gives it (contracts/review-output.ts cornerRow). */
export function cornerRow(c: CornerResult) {
  const hot = c.hotterAtLimit;
  return {
    conditions: c.conditions,
    ...pointRow(c.result),
    ...(hot === undefined ? {} : { hotterAtLimit: { currentLimitA: hot.currentLimitA, ...pointRow(hot.result) } }),
  };
}

/** A solved point (or its outcome) as the answer gives it. */
export function pointRow(r: OperatingPointOutcome<ThermalPoint>) {
  if ("point" in r) {
    const p = r.point;
    return {
      outcome: r.outcome,
      mode: p.forward.mode,
      currentA: p.currentA,
      dropV: p.forward.dropV,
      lossW: p.dieLossW,
      tjC: p.tjC,
      loadV: p.loadV,
    };
  }
  return { outcome: r.outcome, reason: r.reason };
}
