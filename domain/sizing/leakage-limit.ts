import { reverseSteady, junctionLeakageA, scaleLeakage, type LeakagePoint } from "../checks/reverse-steady.js";
import { cToK, T25_K } from "../physics/constants.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import type { SizingContext } from "./assessment.js";
import { largestScale } from "./largest-scale.js";
import { fmt, limitItem, type SpecItem } from "./spec-item.js";

/**
 * The largest reverse leakage a diode may have for the steady reverse polarity of the
 * requirement: its leakage law (the datasheet point scaled by the junction's Is(T), or Is(T) of
 * the fit) is scaled by s, and the reversed supply must leave a stable junction at or below
 * Tj(max) − tjMarginK at the hottest ambient (reverse-steady.ts: Tj = Ta + Rth·VR·IR(Tj), the
 * lowest stable root). Stated as the leakage at VR and Tj = that target, the figure to hold
 * against a datasheet's IR(VR, Tj).
 */
export function leakageLimit(ctx: SizingContext, stage: StageModel): SpecItem {
  const req = ctx.requirement;
  const vr = req.reverseV;
  const target = stageTjMaxC(stage) - req.tjMarginK;
  const junction = behaviourOf(stage).blockingJunction(stage);
  const base = {
    id: "reverseLeakageMaxA",
    title: `largest reverse leakage at VR = ${fmt(vr)} V and Tj = ${fmt(target)} °C (steady reverse polarity at ${req.ambientMaxC} °C ambient)`,
    unit: "A",
    bound: "at-most" as const,
  };
  const source = { kind: "requirement" as const, field: "reverse, tjMarginK", severity: "fail" as const };
  if (!(vr > 0)) return { ...base, outcome: "not-required", reason: "the requirement has no steady reverse polarity" };
  if (junction === undefined)
    return {
      ...base,
      outcome: "not-required",
      reason: "the stage blocks without a junction: it has no reverse leakage to size",
    };
  if (req.ambientMaxC >= target) {
    return {
      ...base,
      outcome: "impossible",
      source,
      reason: `the ${req.ambientMaxC} °C ambient alone reaches the ${fmt(target)} °C junction target (Tj(max) − ${req.tjMarginK} K): no leakage is small enough`,
    };
  }
  const point: LeakagePoint = behaviourOf(stage).reverseLeakage(stage) ?? {
    currentA: junctionLeakageA(junction, vr, T25_K),
    tempK: T25_K,
  };
  const leakAt = (s: number, tC: number) => s * junctionLeakageA(junction, vr, cToK(tC), point);
  const g = (s: number): number | undefined => {
    const r = reverseSteady(stage, vr, req.ambientMaxC, scaleLeakage(point, s));
    return r.outcome === "blocks" ? (target - r.tjC) / target : undefined;
  };
  const search = largestScale(g, 1e-12, 1e12);
  const corner = `steady reverse polarity ${fmt(vr)} V at ${req.ambientMaxC} °C ambient`;
  if (search.kind === "unbounded")
    return {
      ...base,
      outcome: "unbounded",
      source,
      corner,
      reason: "even 10¹² times the template's leakage leaves the junction below its target",
    };
  if (search.kind === "impossible")
    return {
      ...base,
      outcome: "impossible",
      source,
      corner,
      reason: "even 10⁻¹² times the template's leakage does not hold the junction below its target",
    };
  return limitItem(base, leakAt(search.k, target), leakAt(1, target), {
    corner,
    conditions: { reverseV: vr, ambientC: req.ambientMaxC, junctionC: target, scaleFactor: search.k },
    source,
    reason: search.cliff
      ? `at this leakage the reverse junction reaches the edge of thermal runaway (no stable point beyond it) below the ${fmt(target)} °C target`
      : `at this leakage the reversed supply holds the junction at the ${fmt(target)} °C target (Tj(max) − ${req.tjMarginK} K)`,
  });
}
