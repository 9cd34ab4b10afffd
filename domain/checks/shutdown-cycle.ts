import type { FosterTerm } from "../physics/foster.js";

/** An auto-retrying switch cycling between its thermal shutdown and shutdown − hysteresis. */
export type ShutdownCycle =
  | {
      readonly outcome: "cycles";
      /** The limiting dissipation while the switch is on, W. */
      readonly onLossW: number;
      /** Junction temperatures the cycle runs between, °C: the shutdown and the retry level. */
      readonly shutdownC: number;
      readonly retryC: number;
      /** Share of the time the switch is on (the load powered). */
      readonly dutyOn: number;
      /** Dissipation averaged over the cycle, W: onLossW × dutyOn. */
      readonly averageLossW: number;
      /** Heating (on) and cooling (off) times and their sum, s; absent without a transient thermal model (the duty needs none). */
      readonly heatS?: number;
      readonly coolS?: number;
      readonly periodS?: number;
      readonly thermalModel: "foster" | "single-pole";
    }
  | { readonly outcome: "stays-off"; readonly retryC: number; readonly reason: string }
  | { readonly outcome: "does-not-trip"; readonly steadyC: number; readonly reason: string }
  | { readonly outcome: "not-converged"; readonly reason: string };

/**
 * The limit cycle of an auto-retrying thermal shutdown: on at P the junction heats from the retry
 * level Tr = Tsd − H to the shutdown Tsd, off it cools from Tsd to Tr. With one thermal pole
 * (τ = R·C, steady rise R·P, Tss = Ta + R·P above Tsd):
 *   t_heat = τ·ln((Tss − Tr)/(Tss − Tsd)),  t_cool = τ·ln((Tsd − Ta)/(Tr − Ta)),
 * the exponential approach of a first-order system (circuit theory, docs/references.md); the duty
 * t_heat/(t_heat + t_cool) does not depend on τ, so it is given without a transient model from the
 * steady path R. With a Foster network the cycle is its periodic steady state: each node's rise at
 * the start of heating is Ri·P·(1 − ai)·bi/(1 − ai·bi), ai = e^(−t_heat/τi), bi = e^(−t_cool/τi)
 * (the geometric series of a periodic rectangle), and t_heat, t_cool solve Σ rises = Tr − Ta at
 * the start of heating and = Tsd − Ta at its end (Newton). A retry level at or below the ambient
 * is never reached: the switch stays off.
 */
export function shutdownCycle(
  onLossW: number,
  ambientC: number,
  shutdownC: number,
  hysteresisK: number,
  thermal: { readonly rthKPerW: number } | { readonly foster: readonly FosterTerm[] },
): ShutdownCycle {
  const retryC = shutdownC - hysteresisK;
  if (retryC <= ambientC)
    return {
      outcome: "stays-off",
      retryC,
      reason: `the retry level ${retryC} °C (shutdown − hysteresis) is at or below the ${ambientC} °C ambient: the junction never cools to it and the switch stays off`,
    };
  const rth = "rthKPerW" in thermal ? thermal.rthKPerW : thermal.foster.reduce((s, t) => s + t.rKPerW, 0);
  const ssC = ambientC + rth * onLossW;
  if (!(ssC > shutdownC))
    return {
      outcome: "does-not-trip",
      steadyC: ssC,
      reason: `the junction settles at ${ssC} °C on ${onLossW} W through ${rth} K/W, below the ${shutdownC} °C shutdown: the switch does not cycle`,
    };
  const base = { outcome: "cycles" as const, onLossW, shutdownC, retryC };
  const heatLn = Math.log((ssC - retryC) / (ssC - shutdownC));
  const coolLn = Math.log((shutdownC - ambientC) / (retryC - ambientC));
  const single = heatLn / (heatLn + coolLn);
  if ("rthKPerW" in thermal || thermal.foster.length === 1) {
    const tau = "rthKPerW" in thermal ? undefined : thermal.foster[0]?.tauS;
    const times =
      tau === undefined ? {} : { heatS: tau * heatLn, coolS: tau * coolLn, periodS: tau * (heatLn + coolLn) };
    return {
      ...base,
      dutyOn: single,
      averageLossW: onLossW * single,
      ...times,
      thermalModel: tau === undefined ? "single-pole" : "foster",
    };
  }
  const net = thermal.foster;
  // Newton on (ln t_heat, ln t_cool) for the two conditions of the periodic state: the junction
  // at Tr where heating starts and at Tsd where it ends; started from the single pole of the
  // network's resistance-weighted time constant, each step halved until the residual falls.
  const tauEff = net.reduce((s, t) => s + t.rKPerW * t.tauS, 0) / rth;
  const residual = (lh: number, lc: number): [number, number] => {
    const h = Math.exp(lh);
    const c = Math.exp(lc);
    let low = ambientC;
    let top = ambientC;
    for (const t of net) {
      const a = Math.exp(-h / t.tauS);
      const b = Math.exp(-c / t.tauS);
      const start = (t.rKPerW * onLossW * (1 - a) * b) / (1 - a * b);
      low += start;
      top += t.rKPerW * onLossW + (start - t.rKPerW * onLossW) * a;
    }
    return [low - retryC, top - shutdownC];
  };
  let lh = Math.log(tauEff * heatLn);
  let lc = Math.log(tauEff * coolLn);
  let g = residual(lh, lc);
  for (let it = 0; it < 100 && Math.hypot(g[0], g[1]) > 1e-10; it += 1) {
    const d = 1e-7;
    const gh = residual(lh + d, lc);
    const gc = residual(lh, lc + d);
    const j11 = (gh[0] - g[0]) / d;
    const j21 = (gh[1] - g[1]) / d;
    const j12 = (gc[0] - g[0]) / d;
    const j22 = (gc[1] - g[1]) / d;
    const det = j11 * j22 - j12 * j21;
    if (det === 0 || !Number.isFinite(det)) break;
    const sh = (g[0] * j22 - g[1] * j12) / det;
    const sc = (g[1] * j11 - g[0] * j21) / det;
    let step = 1;
    let next = residual(lh - sh, lc - sc);
    while (Math.hypot(next[0], next[1]) >= Math.hypot(g[0], g[1]) && step > 1e-6) {
      step /= 2;
      next = residual(lh - step * sh, lc - step * sc);
    }
    lh -= step * sh;
    lc -= step * sc;
    g = next;
  }
  const heatS = Math.exp(lh);
  const coolS = Math.exp(lc);
  if (!(Math.hypot(g[0], g[1]) <= 1e-6) || !Number.isFinite(heatS + coolS) || heatS + coolS <= 0)
    return {
      outcome: "not-converged",
      reason: `the periodic state of the Foster network was not found (residual ${Math.hypot(g[0], g[1])} K): the cycle is not assessed`,
    };
  const dutyOn = heatS / (heatS + coolS);
  return {
    ...base,
    dutyOn,
    averageLossW: onLossW * dutyOn,
    heatS,
    coolS,
    periodS: heatS + coolS,
    thermalModel: "foster",
  };
}
