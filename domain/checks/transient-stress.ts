import type { TransientPulse } from "../review/transient-library.js";
import type { StageModel } from "../stages/stage-model.js";
import { type ClampResult, clampExponential, clampPulse, type ParallelLoad, tauFromDecay } from "./clamp-energy.js";
import { allowedPeakPowerW, type ClampPowerRating } from "./clamp-rating.js";
import { type ClampTrain, type ClampTrainNotAssessed, clampTrainOf } from "./clamp-train.js";
import type { FosterTerm } from "../physics/foster.js";
import { reverseStress } from "./reverse-steady.js";
import { blocksReverseCurrent, forwardLimits } from "./stage-ratings.js";

export interface TransientContext {
  /** Nominal supply, V: the base of pulses that ride on the supply. */
  readonly supplyNominalV: number;
  /** Highest steady supply, V: a clamp must not conduct at it. */
  readonly supplyMaxV: number;
  /** Steady reverse polarity to withstand (magnitude), V: a clamp must not conduct at it either. */
  readonly reverseV: number;
  /**
   * Highest steady overvoltage of the supply (jump start, long-term overvoltage, abnormal service
   * limit), V; absent where it has none. A clamp must not conduct at it: it lasts a minute or more.
   */
  readonly overvoltageV?: number;
  /** Voltage held at the output by the hold-up capacitor during a negative pulse, V. */
  readonly outputHeldV: number;
  /** Share of a rating the design may use (e.g. 0.8), 0..1. */
  readonly deratingFactor: number;
  /** Smallest ratio of a clamp's clamping voltage to its standoff voltage (common practice, ~1.3). */
  readonly clampToStandoffRatio: number;
  /** A clamp the design already has at its input (bidirectional: it limits either polarity). */
  readonly inputClamp?: InputClamp;
  /** The module's load in parallel with the clamp while a pulse passes the stage (absent: none). */
  readonly parallelLoad?: ParallelLoad;
  /** Junction temperature the clamp starts a pulse at (the highest ambient), °C: its power derating. */
  readonly clampTjC?: number;
  /**
   * Allowances read from a rule set, V, in place of rating × deratingFactor: for the element that
   * blocks a negative pulse, for a controller's or switch's input, and for a gate-source.
   */
  readonly allowanceV?: TransientAllowance;
}

export interface TransientAllowance {
  readonly blocking?: number | undefined;
  readonly input?: number | undefined;
  readonly gateSource?: number | undefined;
}

function allowanceKey(element: string, polarity: "negative" | "positive"): keyof TransientAllowance | undefined {
  if (polarity === "negative") return element === "controller-input" ? undefined : "blocking";
  if (element === "controller-input" || element === "switch-input") return "input";
  return element === "gate-source" ? "gateSource" : undefined;
}

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

export interface ElementStress {
  readonly element: string;
  readonly seenV: number;
  readonly ratingV: number | undefined;
  readonly allowedV: number | undefined;
  readonly exceeds: boolean;
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

export interface TransientResult {
  readonly pulseId: string;
  readonly polarity: "negative" | "positive";
  /** Peak open-circuit voltage of the pulse, signed, V. */
  readonly peakOpenCircuitV: number;
  /** Peak at the stage input after the design's own clamp (if any), signed, V. */
  readonly inputPeakV: number;
  readonly tauS: number;
  readonly stresses: readonly ElementStress[];
  /** Whether the pulse (or its reverse current) reaches the load side. */
  readonly reachesLoad: boolean;
  readonly clamp:
    | { readonly needed: false }
    | ({ readonly needed: true } & ClampRequirement)
    | { readonly needed: "unmodelled"; readonly note: string };
  /** With a clamp in the design: its duty in this pulse and whether it is within its ratings. */
  readonly designClamp?: ClampDuty;
}

/**
 * The peak voltage each part of a stage sees in a transient and, where an allowance (rating ×
 * derating) is exceeded, the input clamp it needs: working window, peak current (|Us| − Vc)/Ri,
 * energy and conduction time (clamp-energy.ts). Negative pulses stress the blocking element with
 * |Us| + the held output voltage; positive pulses stress the input-side ratings (controller
 * input, switch input, gate-source). A centrally suppressed pulse is held at its level unless
 * the design's clamp breaks down below it, which then takes the generator's whole current. The
 * design's clamp follows its breakdown and dynamic resistance, the pulse's rise and, in a positive
 * pulse, the module's load in parallel (clamp-energy.ts); its peak power is read against its
 * rating at the pulse's width and its starting Tj (clamp-rating.ts).
 */
export function transientStress(stage: StageModel, pulse: TransientPulse, ctx: TransientContext): TransientResult {
  const baseV = pulse.baseV === "supply" ? ctx.supplyNominalV : pulse.baseV;
  const peak = pulse.clampedAtV ?? baseV + pulse.amplitudeV;
  const tauS = tauFromDecay(pulse.decayS, pulse.decayConvention);
  const polarity =
    (pulse.clampedAtV ?? (pulse.baseV === "supply" ? ctx.supplyNominalV : pulse.baseV) + pulse.amplitudeV) < 0
      ? "negative"
      : "positive";
  const allowance = (element: string, ratingV: number | undefined) => {
    const key = allowanceKey(element, polarity);
    const fromRules = key === undefined ? undefined : ctx.allowanceV?.[key];
    if (fromRules !== undefined) return fromRules;
    return ratingV === undefined ? undefined : ratingV * ctx.deratingFactor;
  };
  const stress = (element: string, seenV: number, ratingV: number | undefined): ElementStress => {
    const allowedV = allowance(element, ratingV);
    return { element, seenV, ratingV, allowedV, exceeds: allowedV === undefined || seenV > allowedV };
  };

  const own = ctx.inputClamp;
  const designClamp = (p: { baseV: number; amplitudeV: number }, load?: ParallelLoad): ClampDuty | undefined => {
    if (own === undefined) return undefined;
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
  };
  // A module clamp below a central suppressor takes the generator's whole current: the central one
  // stops conducting once the line is below its level (ISO 16750-2 test B on the bench).
  // The input peak is the clamp's voltage at its peak current (above clampV when the pulse drives more than the rated current).
  const limitByClamp = (v: number, dc: ClampDuty | undefined) => {
    if (own === undefined) return v;
    const d = dc?.duty;
    return d?.conducts === true ? Math.min(v, d.peakClampV) : Math.min(v, own.clampV);
  };

  if (peak < 0) {
    const blocks = blocksReverseCurrent(stage);
    const mirrored = { baseV: -baseV, amplitudeV: -pulse.amplitudeV };
    // A reversed load is not counted on to draw its current: the clamp takes the whole (conservative).
    const dc = designClamp(mirrored);
    const magnitude = limitByClamp(-peak, dc);
    const { stress: rs } = reverseStress(stage, magnitude);
    const held = blocks ? ctx.outputHeldV : 0;
    const stresses = [stress(rs.blockingElement, magnitude + held, rs.ratingV)];
    if (rs.controllerReverseV !== undefined) stresses.push(stress("controller-input", magnitude, rs.controllerRatingV));
    // Budget at the input: each element's allowance less what the held output adds to it.
    const budgets = stresses.map((s, i) =>
      s.allowedV === undefined ? Number.NEGATIVE_INFINITY : s.allowedV - (i === 0 ? held : 0),
    );
    const clampMaxV = Math.min(...budgets);
    return {
      pulseId: pulse.id,
      polarity: "negative",
      peakOpenCircuitV: peak,
      inputPeakV: -magnitude,
      tauS,
      stresses,
      reachesLoad: !blocks,
      clamp: stresses.some((s) => s.exceeds)
        ? clampFor(
            {
              baseV: mirrored.baseV,
              amplitudeV: mirrored.amplitudeV,
              tauS,
              sourceResistanceOhm: pulse.sourceResistanceOhm,
            },
            ctx.reverseV,
            clampMaxV,
            ctx,
          )
        : { needed: false },
      ...(dc ? { designClamp: dc } : {}),
    };
  }

  // Above the central suppressor's level the module clamp does not conduct: the input stays at that level.
  const held = pulse.clampedAtV !== undefined && own !== undefined && clampLawOf(own).breakdownV >= pulse.clampedAtV;
  const dc = designClamp(
    { baseV, amplitudeV: held && pulse.clampedAtV !== undefined ? pulse.clampedAtV - baseV : pulse.amplitudeV },
    ctx.parallelLoad,
  );
  const inputPeak = limitByClamp(peak, dc);
  const stresses = forwardLimits(stage).map((l) => stress(l.element, l.seenV(inputPeak), l.ratingV));
  const exceeds = stresses.some((s) => s.exceeds);
  let clamp: TransientResult["clamp"] = { needed: false };
  if (exceeds) {
    // Centrally suppressed or not, a module clamp below the input's peak takes the generator's current.
    const clampMaxV = Math.min(...stresses.filter((s) => s.exceeds).map((s) => s.allowedV ?? Number.NEGATIVE_INFINITY));
    clamp = clampFor(
      { baseV, amplitudeV: pulse.amplitudeV, tauS, sourceResistanceOhm: pulse.sourceResistanceOhm },
      Math.max(ctx.supplyMaxV, ctx.overvoltageV ?? 0),
      clampMaxV,
      ctx,
    );
  }
  return {
    pulseId: pulse.id,
    polarity: "positive",
    peakOpenCircuitV: peak,
    inputPeakV: inputPeak,
    tauS,
    stresses,
    reachesLoad: true,
    clamp,
    ...(dc ? { designClamp: dc } : {}),
  };
}

function clampFor(
  pulse: { baseV: number; amplitudeV: number; tauS: number; sourceResistanceOhm: number },
  standoffMinV: number,
  clampMaxV: number,
  ctx: TransientContext,
): TransientResult["clamp"] {
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
