/**
 * A battery as an open-circuit voltage against state of charge (points, linear between them,
 * flat outside) behind an internal resistance: V = OCV(SoC) − I·R (I positive discharging).
 * The points must rise strictly in SoC and not fall in voltage (checked in contracts/).
 */
export interface BatteryModel {
  readonly capacityC: number;
  readonly ocvPoints: readonly { readonly soc: number; readonly voltageV: number }[];
  readonly internalResistanceOhm: number;
  readonly initialSoc: number;
}

export function ocvV(b: BatteryModel, soc: number): number {
  const pts = b.ocvPoints;
  const first = pts[0];
  const last = pts[pts.length - 1];
  if (first === undefined || last === undefined) throw new Error("ocvV: a battery needs OCV points");
  if (soc <= first.soc) return first.voltageV;
  if (soc >= last.soc) return last.voltageV;
  for (let i = 1; i < pts.length; i += 1) {
    const a = pts[i - 1];
    const c = pts[i];
    if (a && c && soc <= c.soc) return a.voltageV + ((c.voltageV - a.voltageV) * (soc - a.soc)) / (c.soc - a.soc);
  }
  return last.voltageV;
}

/**
 * Exact ∫ OCV(s) ds from s0 to s1 of the piecewise-linear curve (trapezoids between the
 * breakpoints, flat extension outside): the chemical energy per coulomb-of-capacity moved.
 */
export function ocvIntegralVs(b: BatteryModel, s0: number, s1: number): number {
  if (s1 < s0) return -ocvIntegralVs(b, s1, s0);
  const cuts = [s0, ...b.ocvPoints.map((p) => p.soc).filter((s) => s > s0 && s < s1), s1];
  let sum = 0;
  for (let i = 1; i < cuts.length; i += 1) {
    const a = cuts[i - 1] ?? s0;
    const c = cuts[i] ?? s1;
    sum += 0.5 * (ocvV(b, a) + ocvV(b, c)) * (c - a);
  }
  return sum;
}
