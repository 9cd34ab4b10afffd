import { clampExponential } from "../checks/clamp-energy.js";
import type { TransientContext } from "../checks/transient-stress.js";
import { sweepPoint, sweptTransientStress } from "../checks/transient-sweep.js";
import { steadyOvervoltageV } from "../review/candidate-review.js";
import type { StageModel } from "../stages/stage-model.js";
import type { SizingContext } from "./assessment.js";
import { fmt, limitItem, type SpecItem } from "./spec-item.js";

/**
 * The input clamp (TVS, bidirectional) the transient set needs for this stage: the working
 * window — standoff at least the steady supply / steady reverse voltage it must not conduct,
 * clamping at most the lowest input level that keeps every part within rating × derating
 * (transient-stress.ts) — and, at that clamping voltage, the largest peak pulse current
 * (|Us| − Vc)/Ri and energy Vc·Q over the pulses that make it conduct (clamp-energy.ts). The
 * stresses are taken without the design's own clamp, so the window is what any clamp must meet.
 */
export function clampSpec(ctx: SizingContext, stage: StageModel): SpecItem[] {
  const req = ctx.requirement;
  const { inputClamp: own, ...rest } = req.transientContext;
  const overvoltageV = steadyOvervoltageV(req);
  const tctx: TransientContext = {
    ...rest,
    supplyNominalV: req.supplyNominalV,
    supplyMaxV: req.supplyMaxV,
    reverseV: req.reverseV,
    ...(overvoltageV === undefined ? {} : { overvoltageV }),
  };
  // A swept test (transient-sweep.ts) enters with each of its worst points, as that point's pulse.
  const results = req.transients.flatMap((p) =>
    sweptTransientStress(stage, p, tctx).map((r) => {
      const base = p.baseV === "supply" ? req.supplyNominalV : p.baseV;
      return {
        p: p.sweep && r.sweep ? sweepPoint(p, p.sweep, r.sweep.sourceResistanceOhm, r.sweep.decayS, base) : p,
        r,
      };
    }),
  );
  const source = { kind: "requirement" as const, field: "transients, deratingFactor", severity: "fail" as const };
  const ids = {
    standoff: {
      id: "clampStandoffMinV",
      title: "input clamp: standoff (working) voltage at least",
      unit: "V",
      bound: "at-least" as const,
    },
    clamp: {
      id: "clampVMaxV",
      title: "input clamp: clamping voltage at its peak current at most",
      unit: "V",
      bound: "at-most" as const,
    },
    current: {
      id: "clampPeakCurrentMinA",
      title: "input clamp: rated peak pulse current at least",
      unit: "A",
      bound: "at-least" as const,
    },
    energy: {
      id: "clampEnergyMinJ",
      title: "input clamp: rated pulse energy at least",
      unit: "J",
      bound: "at-least" as const,
    },
  };
  const needing = results.filter((x) => x.r.clamp.needed === true);
  const unmodelled = results.filter((x) => x.r.clamp.needed === "unmodelled");
  if (needing.length === 0) {
    const why =
      unmodelled.length > 0
        ? `not determined for ${unmodelled.map((x) => x.p.id).join(", ")}: ${unmodelled.map((x) => ("note" in x.r.clamp ? x.r.clamp.note : "")).join("; ")}`
        : "every part stays within its derated rating in every pulse of the set without a clamp";
    const outcome = unmodelled.length > 0 ? ("not-determined" as const) : ("not-required" as const);
    return Object.values(ids).map((b) => ({ ...b, outcome, reason: why }));
  }
  let standoff = { v: Number.NEGATIVE_INFINITY, id: "" };
  let clampMax = { v: Number.POSITIVE_INFINITY, id: "" };
  for (const { p, r } of needing) {
    if (r.clamp.needed !== true) continue;
    if (r.clamp.standoffMinV > standoff.v) standoff = { v: r.clamp.standoffMinV, id: p.id };
    if (r.clamp.clampMaxV < clampMax.v) clampMax = { v: r.clamp.clampMaxV, id: p.id };
  }
  const ratio = tctx.clampToStandoffRatio;
  if (clampMax.v < standoff.v * ratio) {
    const reason = `no clamp fits: it must stand off ${fmt(standoff.v)} V (${standoff.id}) yet clamp at ≤ ${fmt(clampMax.v)} V (${clampMax.id}), with clamping/standoff ≥ ${ratio}: choose parts with higher ratings`;
    return Object.values(ids).map((b) => ({ ...b, outcome: "impossible" as const, source, reason }));
  }
  // Every pulse whose open-circuit peak passes the clamping voltage drives the clamp.
  let current = { v: 0, id: "" };
  let energy = { v: 0, id: "" };
  // A module clamp below a central suppressor takes the generator's whole current (ISO 16750-2 test B).
  for (const { p, r } of results) {
    if (p.clampedAtV !== undefined && clampMax.v >= p.clampedAtV) continue;
    const baseV = p.baseV === "supply" ? req.supplyNominalV : p.baseV;
    const mirrored =
      r.polarity === "negative" ? { baseV: -baseV, amplitudeV: -p.amplitudeV } : { baseV, amplitudeV: p.amplitudeV };
    const duty = clampExponential(
      { ...mirrored, tauS: r.tauS, sourceResistanceOhm: p.sourceResistanceOhm, riseS: p.riseS },
      clampMax.v,
    );
    if (duty.conducts !== true) continue;
    if (duty.peakCurrentA > current.v) current = { v: duty.peakCurrentA, id: p.id };
    if (duty.energyJ > energy.v) energy = { v: duty.energyJ, id: p.id };
  }
  const at = (id: string) => ({ corner: `pulse ${id}`, conditions: { pulse: id } });
  return [
    limitItem(ids.standoff, standoff.v, own?.standoffV, {
      ...at(standoff.id),
      source,
      reason: `the clamp must not conduct the steady ${fmt(standoff.v)} V (${standoff.id})`,
    }),
    limitItem(ids.clamp, clampMax.v, own?.clampV, {
      ...at(clampMax.id),
      source,
      reason: `above ${fmt(clampMax.v)} V a part exceeds its rating × ${tctx.deratingFactor} in ${clampMax.id}`,
    }),
    limitItem(ids.current, current.v, own?.peakCurrentA, {
      ...at(current.id),
      source,
      reason: `clamping at ${fmt(clampMax.v)} V, ${current.id} drives (|Us| − Vc)/Ri = ${fmt(current.v)} A`,
    }),
    limitItem(ids.energy, energy.v, own?.energyJ, {
      ...at(energy.id),
      source,
      reason: `clamping at ${fmt(clampMax.v)} V, ${energy.id} deposits Vc·Q = ${fmt(energy.v)} J`,
    }),
  ];
}
