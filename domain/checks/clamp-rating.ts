/**
 * A clamp's (TVS) peak pulse power rating read at the pulse it actually takes.
 *
 * Width: the datasheet rates Ppp at a reference pulse (e.g. 10/1000 us: 1000 us to half value).
 * Between about 0.1 us and 10 ms the heat spreads from the junction into the die as into a
 * semi-infinite body, so the junction's rise for a power P held for t goes as P·sqrt(t) and the
 * power that reaches the same failure temperature goes as t^(-1/2) (Wunsch and Bell, IEEE Trans.
 * Nucl. Sci. 15(6), 1968; docs/references.md):
 *   P(t) = Ppp·sqrt(tref / t).
 * For pulses longer than the reference the heat reaches the package and the true allowance falls
 * more slowly than t^(-1/2): the law understates it (conservative); for much shorter ones the
 * adiabatic t^(-1) regime allows more: again conservative.
 * Temperature: linear derating from 100 % at 25 °C to 0 at Tj(max) (common practice: the
 * datasheet's derating line); the clamp starts the pulse at the highest ambient.
 * The width of an actual pulse is its current's time from the peak to half of it (clamp-energy.ts).
 */
export interface ClampPowerRating {
  readonly peakPulsePowerW: number;
  /** Width of the reference pulse (to half value), s. */
  readonly referencePulseS: number;
  readonly tjMaxC: number;
}

export function allowedPeakPowerW(r: ClampPowerRating, pulseWidthS: number, tjStartC: number): number {
  const width = Math.max(pulseWidthS, 1e-12);
  const derate = tjStartC <= 25 ? 1 : Math.max(0, (r.tjMaxC - tjStartC) / (r.tjMaxC - 25));
  return r.peakPulsePowerW * Math.sqrt(r.referencePulseS / width) * derate;
}
