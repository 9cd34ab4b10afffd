import { T25_K } from "./constants.js";

/** On-resistance of a MOSFET channel against gate-source voltage and junction temperature. */
export interface ChannelParams {
  /** Datasheet Rds(on) at 25 °C against Vgs, sorted by gateSourceV ascending, at least one. */
  readonly rdsOnPoints: readonly { readonly gateSourceV: number; readonly rdsOnOhm: number }[];
  /** Gate threshold voltage at 25 °C, V (magnitude for a P-channel part). */
  readonly thresholdV: number;
  /**
   * Temperature coefficient of the threshold, V/K (a power MOSFET's falls about 2–7 mV/K: memory,
   * docs/references.md); absent: the threshold is held at its 25 °C value.
   */
  readonly thresholdTempCoVPerK?: number;
  readonly tempLaw: RdsTempLaw;
}

/** The gate threshold at a junction temperature: Vth(T) = Vth(25 °C) + k·(T − 298.15 K), at least 0, V. */
export function thresholdAtV(p: ChannelParams, tK: number): number {
  const k = p.thresholdTempCoVPerK;
  return k === undefined || k === 0 ? p.thresholdV : Math.max(0, p.thresholdV + k * (tK - T25_K));
}

/**
 * Temperature law of Rds(on): a power law R(T) = R25·(T/298.15 K)^α (common practice, α ≈ 2.3,
 * after the mobility exponents of Arora et al. 1982), or a factor R(T)/R25 against Tj as points,
 * interpolated linearly and held flat outside them.
 */
export type RdsTempLaw =
  | { readonly law: "power"; readonly exponent: number }
  | { readonly law: "points"; readonly points: readonly { readonly tempK: number; readonly factor: number }[] };

/** R(T)/R(25 °C). */
export function rdsTempFactor(law: RdsTempLaw, tK: number): number {
  // (T/T25)^α as exp(α·ln(T/T25)): the same power, about half the cost of Math.pow in V8 (this
  // runs for every circuit solve of a MOSFET stage); a few ulp of rounding, exact at T25.
  if (law.law === "power") return law.exponent === 0 ? 1 : Math.exp(law.exponent * Math.log(tK / T25_K));
  const pts = law.points;
  const first = pts[0];
  const last = pts[pts.length - 1];
  if (first === undefined || last === undefined) return 1;
  if (tK <= first.tempK) return first.factor;
  for (let i = 1; i < pts.length; i += 1) {
    const a = pts[i - 1];
    const b = pts[i];
    if (a && b && tK <= b.tempK) return a.factor + ((b.factor - a.factor) * (tK - a.tempK)) / (b.tempK - a.tempK);
  }
  return last.factor;
}

/**
 * Channel conductance at 25 °C mobility against Vgs: piecewise linear through (Vth, 0) and the
 * datasheet points, flat above the highest point. Below the lowest point this is the square-law
 * triode scaling R ∝ 1/(Vgs − Vth) (textbook MOSFET triode region), which is why it is linear in
 * G. `thresholdV` is the threshold at the junction's temperature (thresholdAtV; default the 25 °C
 * one): the zero node moves with Vth(T), the datasheet points stay (their temperature dependence
 * is the Rds(on) law's, divided out by the caller).
 */
export function channelConductance25S(p: ChannelParams, gateSourceV: number, thresholdV = p.thresholdV): number {
  if (gateSourceV <= thresholdV) return 0;
  // Walk the nodes (Vth, 0), then the points above threshold, without allocating (hot path).
  let x0 = thresholdV;
  let g0 = 0;
  for (const pt of p.rdsOnPoints) {
    if (pt.gateSourceV <= thresholdV) continue;
    const g1 = 1 / pt.rdsOnOhm;
    if (gateSourceV <= pt.gateSourceV) {
      const span = pt.gateSourceV - x0;
      return span > 0 ? g0 + ((g1 - g0) * (gateSourceV - x0)) / span : g1;
    }
    x0 = pt.gateSourceV;
    g0 = g1;
  }
  return g0;
}

/** Channel resistance at a gate drive and temperature; Infinity-free: undefined when off. */
export function channelResistanceOhm(p: ChannelParams, gateSourceV: number, tK: number): number | undefined {
  const g = channelConductance25S(p, gateSourceV, thresholdAtV(p, tK));
  if (!(g > 0)) return undefined;
  return rdsTempFactor(p.tempLaw, tK) / g;
}

/** The lowest gate drive at which the datasheet characterises Rds(on): "fully enhanced" from here. */
export function fullEnhancementV(p: ChannelParams): number {
  let lowest = Number.POSITIVE_INFINITY;
  for (const pt of p.rdsOnPoints) lowest = Math.min(lowest, pt.gateSourceV);
  return lowest;
}

/** Linear interpolation through sorted (x, y) nodes, flat outside them. */
export function interpolate(nodes: readonly (readonly [number, number])[], x: number): number {
  const first = nodes[0];
  const last = nodes[nodes.length - 1];
  if (first === undefined || last === undefined) throw new Error("interpolate: no nodes");
  if (x <= first[0]) return first[1];
  if (x >= last[0]) return last[1];
  for (let i = 1; i < nodes.length; i += 1) {
    const a = nodes[i - 1];
    const b = nodes[i];
    if (a && b && x <= b[0]) {
      const span = b[0] - a[0];
      return span > 0 ? a[1] + ((b[1] - a[1]) * (x - a[0])) / span : b[1];
    }
  }
  return last[1];
}
