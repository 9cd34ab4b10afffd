import { type FosterTerm, stepFoster } from "../physics/foster.js";
import { type InrushCircuit, inrushCharge, type InrushWaveform } from "./inrush.js";

/**
 * How the junction follows the inrush's loss: a Foster network (Zth), or none (then only a stall,
 * held for good, has a junction temperature: the steady path's).
 */
export type InrushThermal =
  | { readonly kind: "foster"; readonly terms: readonly FosterTerm[]; readonly steadyRthKPerW: number }
  | { readonly kind: "none"; readonly steadyRthKPerW: number };

export interface InrushSoaModel extends InrushCircuit {
  /** The junction at the start of the charge (the die is at ambient at power-on), °C. */
  readonly ambientC: number;
  readonly thermal: InrushThermal;
  /** Junction temperature at which the part shuts itself down (an integrated switch's thermal shutdown), °C; absent: none. */
  readonly thermalShutdownC?: number;
}

interface Figures {
  readonly chargeTimeS: number;
  readonly energyJ: number;
  readonly peakCurrentA: number;
  readonly peakPowerW: number;
  /** The stage's voltage at its peak power, V. */
  readonly peakPowerVdsV: number;
}

export type InrushResult =
  | ({
      readonly outcome: "charged";
      /** Highest junction temperature during the charge, °C; absent without a transient network. */
      readonly tjPeakC?: number;
      readonly thermalModel: InrushThermal["kind"];
      /** The part's shutdown temperature, where it has one and no network says whether the charge reaches it. */
      readonly shutdownUnassessedC?: number;
    } & Figures)
  | ({
      readonly outcome: "thermal-shutdown";
      /** When the junction reaches the shutdown temperature, s. */
      readonly shutdownAtS: number;
      readonly outputAtShutdownV: number;
      readonly tjPeakC: number;
      readonly thermalModel: InrushThermal["kind"];
      readonly reason: string;
    } & Figures)
  | {
      readonly outcome: "does-not-charge";
      readonly stallV: number;
      readonly stallPowerW: number;
      /** The junction held at the stall's loss in steady state (or its shutdown temperature), °C. */
      readonly tjPeakC: number;
      readonly thermalModel: InrushThermal["kind"];
      readonly reason: string;
    };

/** Steps of the loss along the charge (the Foster step is exact for the power held over a step; the midpoint's power is held). */
const STEPS = 2000;

/**
 * The stage's safe operating area during the inrush in its thermally limited form: the junction
 * follows the charge's loss P(t) (inrush.ts) from the ambient through the stage's transient
 * thermal network (Foster, stepped exactly for the power held over each step: foster.ts), its
 * peak is what a rule holds to Tj(max). Without a network the pulse's Tj is not assessed (the
 * steady path's Tamb + Rth·Ppeak bounds it, but hundreds of times too high for a pulse of
 * microseconds to milliseconds: no figure, the rule stays open). A part with a thermal shutdown
 * that its junction reaches before the charge is done switches off: the start fails (outcome
 * thermal-shutdown). An output that stalls (the load
 * takes the whole available current) never charges: the loss is held, its Tj is the steady one.
 */
export function inrushSoa(m: InrushSoaModel): InrushResult {
  const charge = inrushCharge(m);
  const shutdown = m.thermalShutdownC;
  if (charge.outcome === "stalls") {
    const steadyC = m.ambientC + m.thermal.steadyRthKPerW * charge.stallPowerW;
    return {
      outcome: "does-not-charge",
      stallV: charge.stallV,
      stallPowerW: charge.stallPowerW,
      tjPeakC: shutdown === undefined ? steadyC : Math.min(steadyC, shutdown),
      thermalModel: m.thermal.kind,
      reason: charge.reason,
    };
  }
  const figures: Figures = {
    chargeTimeS: charge.chargeTimeS,
    energyJ: charge.energyJ,
    peakCurrentA: charge.peakCurrentA,
    peakPowerW: charge.peakPowerW,
    peakPowerVdsV: charge.peakPowerVdsV,
  };
  if (m.thermal.kind === "none")
    return {
      outcome: "charged",
      thermalModel: "none",
      ...(shutdown === undefined ? {} : { shutdownUnassessedC: shutdown }),
      ...figures,
    };
  const hit = fosterPeak(charge, m.thermal.terms, m.ambientC, shutdown);
  const shutAtS = hit.shutdownAtS;
  if (shutdown !== undefined && shutAtS !== undefined && shutAtS < charge.chargeTimeS) {
    return {
      outcome: "thermal-shutdown",
      shutdownAtS: shutAtS,
      outputAtShutdownV: charge.outputV(shutAtS),
      tjPeakC: shutdown,
      thermalModel: m.thermal.kind,
      reason: `the junction reaches its shutdown temperature ${shutdown} °C at ${shutAtS.toPrecision(3)} s, before the charge completes at ${charge.chargeTimeS.toPrecision(3)} s: the switch turns off and the start fails`,
      ...figures,
    };
  }
  return { outcome: "charged", tjPeakC: hit.tjPeakC, thermalModel: "foster", ...figures };
}

function fosterPeak(
  w: InrushWaveform,
  terms: readonly FosterTerm[],
  ambientC: number,
  shutdownC: number | undefined,
): { tjPeakC: number; shutdownAtS: number | undefined } {
  const dt = w.spanS / STEPS;
  let rises: number[] = terms.map(() => 0);
  let peak = ambientC;
  let prev = ambientC;
  for (let k = 0; k < STEPS; k += 1) {
    rises = stepFoster(terms, rises, w.powerW((k + 0.5) * dt), dt);
    const tj = ambientC + rises.reduce((a, b) => a + b, 0);
    if (shutdownC !== undefined && tj >= shutdownC) {
      // Linear between the step's ends.
      const f = tj > prev ? (shutdownC - prev) / (tj - prev) : 0;
      return { tjPeakC: shutdownC, shutdownAtS: (k + f) * dt };
    }
    peak = Math.max(peak, tj);
    prev = tj;
  }
  return { tjPeakC: peak, shutdownAtS: undefined };
}
