import type { CornerResult } from "../../domain/checks/corners.js";
import type { OperatingPointOutcome, ThermalPoint } from "../../domain/solve/electrothermal-point.js";

/** A review corner as the answer gives it (contracts/review-output.ts cornerRow). */
export function cornerRow(c: CornerResult) {
  // Written out rather than spread from pointRow: 96 rows per review, and a spread into a literal
  // takes V8's slow clone path. Same fields, same order.
  const r = c.result;
  const hot = c.hotterAtLimit;
  const extra =
    hot === undefined ? {} : { hotterAtLimit: { currentLimitA: hot.currentLimitA, ...pointRow(hot.result) } };
  if ("point" in r) {
    const p = r.point;
    return {
      conditions: c.conditions,
      outcome: r.outcome,
      mode: p.forward.mode,
      currentA: p.currentA,
      dropV: p.forward.dropV,
      lossW: p.dieLossW,
      tjC: p.tjC,
      loadV: p.loadV,
      ...extra,
    };
  }
  return { conditions: c.conditions, outcome: r.outcome, reason: r.reason, ...extra };
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
