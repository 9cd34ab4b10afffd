import type { FosterTerm } from "../physics/foster.js";
import type { TransientPulse } from "../review/transient-library.js";
import { type ClampResult, clampExponential, clampPulse, type ParallelLoad } from "./clamp-energy.js";
import { allowedPeakPowerW, type ClampPowerRating } from "./clamp-rating.js";
import { type ClampTrain, type ClampTrainNotAssessed, clampTrainOf } from "./clamp-train.js";
import type { TransientContext } from "./transient-stress.js";

// The design's input clamp in a transient, and the clamp a transient needs (a move out of
// transient-stress.ts, which finds the stresses and asks these).

export interface InputClamp {
  readonly standoffV: number;
  /** Clamping voltage at the rated peak current (constant where no breakdown voltage is given), V. */
  readonly clampV: number;
  /** Breakdown voltage VBR; with the rated peak current it gives the dynamic resistance (clampV − VBR)/Ipp. */
  readonly breakdownV?: number | undefined;
  readonly peakCurrentA?: number | undefined;
  readonly energyJ?: number | undefined;
  /** Peak pulse power at its reference pulse, with its Tj(max) (clamp-rating.ts). */
  readonly power?: ClampPowerRating | undefined;
  /** The clamp's maximum junction temperature, °C. */
  readonly tjMaxC?: number | undefined;
  /** Junction-to-ambient Foster network of the clamp: its Tj over a pulse train (clamp-train.ts). */
  readonly thermal?: readonly FosterTerm[] | undefined;
}

/** The clamp's law: breakdown and dynamic resistance where both are known, else the constant clamping voltage. */
export function clampLawOf(c: InputClamp): { breakdownV: number; dynamicOhm: number } {
  if (c.breakdownV === undefined || c.peakCurrentA === undefined) return { breakdownV: c.clampV, dynamicOhm: 0 };
  return { breakdownV: c.breakdownV, dynamicOhm: (c.clampV - c.breakdownV) / c.peakCurrentA };
}

/** What the design's own clamp does in a pulse, against its ratings. */
export interface ClampDuty {
  readonly duty: ClampResult;
  readonly withinPeakCurrent: boolean | undefined;
  readonly withinEnergy: boolean | undefined;
  /** Peak pulse power allowed at this pulse's width and the clamp's starting Tj, W (absent: no power rating). */
  readonly allowedPeakPowerW?: number;
  readonly withinPeakPower: boolean | undefined;
  /** Its standoff must clear the steady supply and steady reverse voltage, or it conducts them. */
  readonly standoffClearsSteady: boolean;
  /** Its junction over the test's train of this pulse (with the clamp's thermal network and the pulse's repetition). */
  readonly train?: ClampTrain | ClampTrainNotAssessed;
}

export interface ClampRequirement {
  /** The clamp must not conduct below this (steady supply or steady reverse), V. */
  readonly standoffMinV: number;
  /** The clamp must hold the input at or below this for every element to stay within its allowance, V. */
  readonly clampMaxV: number;
  readonly feasible: boolean;
  /** The clamp's duty at clampMaxV (the least-current clamp inside the window). */
  readonly atClampMax: ClampResult;
  readonly note: string;
}

/** What the clamp's duty and window read of the transient context. */
export type ClampContext = Pick<
  TransientContext,
  "supplyMaxV" | "reverseV" | "overvoltageV" | "clampToStandoffRatio" | "clampTjC"
>;

/**
 * The design's own clamp in one pulse (clamp-energy.ts clampPulse: its breakdown and dynamic
 * resistance, the pulse's rise and, in a positive pulse, the module's load in parallel), against
 * its ratings: peak current, energy, peak power at the pulse's width and its starting Tj
 * (clamp-rating.ts), its train's Tj (clamp-train.ts), and its standoff against the steady levels.
 */
export function designClampDuty(
  own: InputClamp,
  p: { readonly baseV: number; readonly amplitudeV: number; readonly tauS: number; readonly pulse: TransientPulse },
  ctx: ClampContext,
  load?: ParallelLoad,
): ClampDuty {
  const { tauS, pulse } = p;
  const duty = clampPulse(
    {
      baseV: p.baseV,
      amplitudeV: p.amplitudeV,
      tauS,
      sourceResistanceOhm: pulse.sourceResistanceOhm,
      riseS: pulse.riseS,
    },
    clampLawOf(own),
    load,
  );
  const allowedW =
    own.power !== undefined && duty.conducts === true
      ? allowedPeakPowerW(own.power, duty.currentHalfWidthS, ctx.clampTjC ?? 25)
      : undefined;
  // A clamp that conducts the supply the pulse rides on ("always") is within no rating.
  const within = (rating: number | undefined, duty_: (d: Extract<ClampResult, { conducts: true }>) => number) =>
    rating === undefined
      ? undefined
      : duty.conducts === false
        ? true
        : duty.conducts === true
          ? duty_(duty) <= rating
          : false;
  const train = clampTrainOf(duty, own.thermal, pulse.repetition, ctx.clampTjC ?? 25);
  return {
    duty,
    ...(train === undefined ? {} : { train }),
    withinPeakCurrent: within(own.peakCurrentA, (d) => d.peakCurrentA),
    withinEnergy: within(own.energyJ, (d) => d.energyJ),
    ...(allowedW === undefined ? {} : { allowedPeakPowerW: allowedW }),
    withinPeakPower:
      own.power === undefined ? undefined : within(allowedW ?? own.power.peakPulsePowerW, (d) => d.peakPowerW),
    standoffClearsSteady: own.standoffV >= Math.max(ctx.supplyMaxV, ctx.reverseV, ctx.overvoltageV ?? 0),
  };
}

/**
 * The clamp a pulse needs where a part's allowance is exceeded: the working window (standoff above
 * the steady levels, clamping at most clampMaxV), whether a clamp's clamping/standoff ratio fits
 * it, and its duty at clampMaxV (clamp-energy.ts clampExponential).
 */
export function clampFor(
  pulse: { baseV: number; amplitudeV: number; tauS: number; sourceResistanceOhm: number },
  standoffMinV: number,
  clampMaxV: number,
  ctx: ClampContext,
): ({ readonly needed: true } & ClampRequirement) | { readonly needed: "unmodelled"; readonly note: string } {
  if (!Number.isFinite(clampMaxV) || clampMaxV <= 0) {
    return {
      needed: "unmodelled",
      note: "a part in the path states no rating for this polarity: no clamp window can be given",
    };
  }
  const feasible = clampMaxV >= standoffMinV * ctx.clampToStandoffRatio;
  return {
    needed: true,
    standoffMinV,
    clampMaxV,
    feasible,
    atClampMax: clampExponential(pulse, clampMaxV),
    note: feasible
      ? `a clamp with standoff ≥ ${round(standoffMinV)} V clamping at ≤ ${round(clampMaxV)} V keeps every part within its allowance`
      : `no clamp fits: it must stand off ${round(standoffMinV)} V yet clamp at ${round(clampMaxV)} V (clamping/standoff ratio ≥ ${ctx.clampToStandoffRatio}): choose parts with higher ratings`,
  };
}

function round(v: number): number {
  return Math.round(v * 100) / 100;
}
