import { gateDischargeS } from "../checks/reverse-path.js";
import { type TurnOffOutcome, turnOffEvent } from "../checks/turn-off-event.js";
import { withThresholdShift } from "../checks/gate-threshold.js";
import { bracketedRoot } from "../solve/root-find.js";
import type { StageModel } from "../stages/stage-model.js";
import type { SizingContext, TurnOffSizing } from "./assessment.js";
import { fmt, limitItem, type SpecItem } from "./spec-item.js";

/** The reverse-current event with the controller's delay set to d (every other value of the template held; its threshold at the event's corner). */
export function eventWithDelay(
  ctx: SizingContext,
  stage: StageModel,
  t: TurnOffSizing,
  delayS: number,
): TurnOffOutcome {
  return turnOffEvent({
    stage: withThresholdShift(stage, t.thresholdShiftV ?? 0),
    outputV: t.outputV,
    inputAfterV: t.inputAfterV,
    ...(t.inputDecay === undefined ? {} : { inputDecay: t.inputDecay }),
    loopResistanceOhm: t.loopResistanceOhm,
    loopInductanceH: t.loopInductanceH,
    capacitanceF: t.capacitanceF,
    esrOhm: t.esrOhm,
    load: ctx.requirement.load,
    loadMinV: t.loadMinV,
    tjC: t.tjC,
    controller: { ...t.timing, turnOffDelayS: delayS },
    ...(t.clampV === undefined ? {} : { clampV: t.clampV }),
  });
}

/**
 * The longest turn-off delay of the controller (trip to gate discharge) for a reverse-current
 * peak limit and for an absorbed-energy limit, on the exact series R-L-C response of the loop
 * (domain/physics/rlc-series.ts via turn-off-event.ts). The peak reverse current is the largest
 * −i(t) up to the turn-off instant, which rises with the delay until the loop's own first
 * reverse extremum; the delay at which it reaches the limit is the root of peak(d) − Imax on
 * [0, d at the extremum], closed by regula falsi on the closed form (the time at which the
 * exact i(t) equals −Imax, less the trip time and the gate discharge). The energy the blocking
 * element absorbs in the clamp phase grows with the current at turn-off and is inverted the
 * same way on the same interval.
 */
export function turnOffDelayLimits(ctx: SizingContext, stage: StageModel, t: TurnOffSizing): SpecItem[] {
  const fall =
    t.inputDecay === undefined
      ? `input falls from ${fmt(t.outputV)} V to ${fmt(t.inputAfterV)} V`
      : `input falls from ${fmt(t.outputV)} V to ${fmt(t.inputDecay.startV)} V and decays to ${fmt(t.inputAfterV)} V (τ ${fmt(t.inputDecay.tauS)} s)`;
  const corner = `${fall}, loop ${fmt(t.loopResistanceOhm)} Ω ${fmt(t.loopInductanceH)} H, ${fmt(t.capacitanceF)} F at the output, Tj ${fmt(t.tjC)} °C`;
  const conditions = {
    outputV: t.outputV,
    inputAfterV: t.inputAfterV,
    ...(t.inputDecay === undefined
      ? {}
      : { inputDecayStartV: t.inputDecay.startV, inputDecayTimeConstantS: t.inputDecay.tauS }),
    loopResistanceOhm: t.loopResistanceOhm,
    loopInductanceH: t.loopInductanceH,
    capacitanceF: t.capacitanceF,
    tjC: t.tjC,
  };
  const e0 = eventWithDelay(ctx, stage, t, 0);
  const current = {
    id: "turnOffDelayMaxS.reverseCurrent",
    title: "longest turn-off delay that keeps the reverse-current peak within its limit",
    unit: "s",
    bound: "at-most" as const,
  };
  const energy = {
    id: "turnOffDelayMaxS.absorbedEnergy",
    title: "longest turn-off delay that keeps the energy the blocking element absorbs within its limit",
    unit: "s",
    bound: "at-most" as const,
  };
  if (e0.outcome !== "blocks") {
    const why = e0.reason;
    return [current, energy].map((b) => ({
      ...b,
      outcome: "not-determined" as const,
      corner,
      reason: `the event does not end in a controller turn-off (${e0.outcome}: ${why})`,
    }));
  }
  const detect = e0.detectS ?? 0;
  const discharge = gateDischargeS(t.timing);
  // The loop's own first reverse extremum: turning off later cannot raise the peak further.
  const late = eventWithDelay(ctx, stage, t, 1);
  const peakTimeS = "peakReverseTimeS" in late ? late.peakReverseTimeS : 0;
  const dPeak = Math.max(peakTimeS - detect - discharge, 0);
  const tail = `(trip at ${fmt(detect)} s, gate discharge ${fmt(discharge)} s; the loop's reverse current peaks at ${fmt("peakReverseCurrentA" in late ? late.peakReverseCurrentA : 0)} A at ${fmt(peakTimeS)} s if never turned off)`;
  const peakAt = (d: number): number => {
    const e = eventWithDelay(ctx, stage, t, d);
    return "peakReverseCurrentA" in e ? e.peakReverseCurrentA : Number.POSITIVE_INFINITY;
  };
  const energyAt = (d: number): number => {
    const e = eventWithDelay(ctx, stage, t, d);
    if (e.outcome === "clamp-below-drive") return Number.POSITIVE_INFINITY;
    return e.outcome === "blocks" ? (e.clamp?.absorbedJ ?? 0) : Number.POSITIVE_INFINITY;
  };
  const invert = (
    f: (d: number) => number,
    limit: number,
    base: typeof current,
    what: string,
    unit: string,
    field: string,
  ): SpecItem => {
    const source = { kind: "requirement" as const, field: `turnOff.${field}`, severity: "fail" as const };
    const f0 = f(0);
    if (f0 > limit)
      return {
        ...base,
        outcome: "impossible",
        corner,
        source,
        reason: `even with no delay ${what} reaches ${fmt(f0)} ${unit}, above the ${fmt(limit)} ${unit} limit ${tail}: lower the trip threshold, add loop inductance or a faster gate discharge`,
      };
    const fPk = f(dPeak);
    if (fPk <= limit)
      return {
        ...base,
        outcome: "unbounded",
        corner,
        source,
        reason: `${what} stays at or below ${fmt(fPk)} ${unit} (limit ${fmt(limit)} ${unit}) however late the turn-off ${tail}`,
      };
    const root = bracketedRoot((d) => f(d) - limit, 0, dPeak, f0 - limit, fPk - limit, 1e-12 * Math.max(dPeak, 1e-300));
    return limitItem(base, root.x, t.templateDelayS, {
      corner,
      conditions,
      source,
      reason: `at this delay ${what} reaches the ${fmt(limit)} ${unit} limit ${tail}`,
    });
  };
  return [
    t.peakReverseCurrentMaxA === undefined
      ? { ...current, outcome: "not-required" as const, reason: "the requirement sets no reverse-current peak limit" }
      : invert(peakAt, t.peakReverseCurrentMaxA, current, "the reverse-current peak", "A", "peakReverseCurrentMaxA"),
    t.absorbedEnergyMaxJ === undefined
      ? { ...energy, outcome: "not-required" as const, reason: "the requirement sets no absorbed-energy limit" }
      : invert(energyAt, t.absorbedEnergyMaxJ, energy, "the absorbed energy", "J", "absorbedEnergyMaxJ"),
  ];
}
