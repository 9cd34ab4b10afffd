import { cToK } from "../physics/constants.js";
import { diodeVoltageV } from "../physics/diode.js";
import type { CompiledRule } from "../rules/compile-rule-set.js";
import { evaluateRule } from "../rules/evaluate-rules.js";
import { scaleStage, UNSCALED } from "../stages/scale-stage.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import type { Assessment, SizingContext } from "./assessment.js";
import { cornerOf } from "./corner-of.js";
import { largestScale } from "./largest-scale.js";
import { fmt, limitItem, type SpecItem, type SpecSource } from "./spec-item.js";

/** Metrics that rise (or, for the load voltage, fall) with a part's on-resistance or forward drop. */
export const FORWARD_METRICS = ["tjWorstC", "lossWorstW", "dropWorstV", "loadVMinV"] as const;

interface Constraint {
  readonly id: string;
  readonly metric: string;
  readonly source: SpecSource;
  /** Relative margin at an assessment (≥ 0 passes); undefined: no value (it fails); null: out of scope. */
  readonly margin: (a: Assessment) => number | undefined | null;
  readonly failReason: (a: Assessment) => string;
}

function ruleConstraint(c: CompiledRule, ctx: SizingContext): Constraint {
  const stamp = ctx.ruleSet.stamp;
  const metric = FORWARD_METRICS.find((m) => c.names.includes(m)) ?? "lossWorstW";
  return {
    id: c.rule.id,
    metric,
    source: {
      kind: "rule",
      ruleId: c.rule.id,
      expression: c.rule.expression,
      severity: c.rule.severity,
      threshold: null,
      ruleSet: stamp,
    },
    margin: (a) => {
      const v = evaluateRule(c, a.input, stamp);
      if (v.outcome === "not-applicable")
        return v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite" ? undefined : null;
      if (v.margin === null || v.threshold === null) return v.outcome === "pass" ? 1 : -1;
      return v.margin / Math.max(Math.abs(v.threshold), 1e-12);
    },
    failReason: (a) => {
      const v = evaluateRule(c, a.input, stamp);
      return `${c.rule.id}: ${v.reason ?? v.outcome}`;
    },
  };
}

/** The rules that read a forward metric and are in scope for the template, plus requirement limits no rule covers. */
export function forwardConstraints(ctx: SizingContext, stage: StageModel, template: Assessment): Constraint[] {
  const out: Constraint[] = [];
  for (const c of ctx.ruleSet.rules) {
    if (!FORWARD_METRICS.some((m) => c.names.includes(m))) continue;
    const k = ruleConstraint(c, ctx);
    if (k.margin(template) !== null) out.push(k);
  }
  const ruled = (m: string) =>
    out.some((k) => k.metric === m || ctx.ruleSet.rules.some((r) => r.rule.id === k.id && r.names.includes(m)));
  const metric = (a: Assessment, m: string) => {
    const v = a.input.metrics[m];
    return typeof v === "number" ? v : undefined;
  };
  if (!ruled("tjWorstC")) {
    const limit = stageTjMaxC(stage) - ctx.requirement.tjMarginK;
    out.push({
      id: "requirement.tjMarginK",
      metric: "tjWorstC",
      source: { kind: "requirement", field: "tjMarginK", severity: "fail" },
      margin: (a) => {
        const t = metric(a, "tjWorstC");
        return t === undefined ? undefined : (limit - t) / Math.max(Math.abs(limit), 1e-12);
      },
      failReason: (a) =>
        `the worst junction ${fmt(metric(a, "tjWorstC") ?? Number.NaN)} °C exceeds Tj(max) − ${ctx.requirement.tjMarginK} K = ${fmt(limit)} °C`,
    });
  }
  const budget = ctx.lossBudgetW;
  if (budget !== undefined && !ruled("lossWorstW")) {
    out.push({
      id: "requirement.lossBudgetW",
      metric: "lossWorstW",
      source: { kind: "requirement", field: "lossBudgetW", severity: "fail" },
      margin: (a) => {
        const p = metric(a, "lossWorstW");
        return p === undefined ? undefined : (budget - p) / budget;
      },
      failReason: (a) =>
        `the worst-case loss ${fmt(metric(a, "lossWorstW") ?? Number.NaN)} W exceeds the ${budget} W budget`,
    });
  }
  return out;
}

export type ForwardParameter = "rdsOn" | "forwardVoltage";

/** The part scaled by k in the forward parameter (Rds(on) points, or the diode's forward voltage). */
export function scaledForward(stage: StageModel, p: ForwardParameter, k: number): StageModel {
  return scaleStage(stage, p === "rdsOn" ? { ...UNSCALED, rdsOnFactor: k } : { ...UNSCALED, forwardVoltageFactor: k });
}

/** The on-resistance at 25 °C at the rated (highest characterised) gate drive, ohm, and that drive. */
export function ratedRdsOn(stage: StageModel): { ohm: number; gateSourceV: number } | undefined {
  const top = behaviourOf(stage).ratedRdsOn(stage);
  return top === undefined ? undefined : { ohm: top.rdsOnOhm, gateSourceV: top.gateSourceV };
}

export interface ForwardLimit {
  readonly item: SpecItem;
  /** The part exactly at the limit and its review (absent unless the outcome is a limit). */
  readonly atLimit?: { readonly k: number; readonly stage: StageModel; readonly assessment: Assessment };
}

/**
 * The largest Rds(on) (MOSFET, integrated switch) or forward drop (diode) that meets every
 * forward rule: the part's own laws (Rds(on) against temperature and gate drive, the diode's
 * Is(T)) and its thermal path are held, one factor k scales the parameter, and every trial is
 * reviewed in full — each corner is the self-consistent electrothermal point
 * (domain/solve/electrothermal-point.ts) — so the limit is where the first rule's margin is zero.
 */
export function forwardLimit(
  ctx: SizingContext,
  stage: StageModel,
  template: Assessment,
  p: ForwardParameter,
): ForwardLimit {
  const constraints = forwardConstraints(ctx, stage, template);
  const rated = ratedRdsOn(stage);
  const base =
    p === "rdsOn"
      ? {
          id: "rdsOnMaxOhm",
          title: `largest Rds(on) at 25 °C${rated ? ` at Vgs = ${rated.gateSourceV} V` : ""} (the template's temperature law and thermal path held)`,
          unit: "ohm",
          bound: "at-most" as const,
        }
      : {
          id: "forwardDropMaxV",
          title: "largest forward drop at the worst-case current and junction temperature",
          unit: "V",
          bound: "at-most" as const,
        };
  if (constraints.length === 0)
    return {
      item: {
        ...base,
        outcome: "not-required",
        reason:
          "no rule of the set reads the junction temperature, loss, drop or load voltage, and the requirement sets no budget",
      },
    };
  const trials = new Map<number, Assessment>();
  const trial = (k: number): Assessment => {
    const hit = trials.get(k);
    if (hit) return hit;
    const a = ctx.assess(scaledForward(stage, p, k));
    trials.set(k, a);
    return a;
  };
  const worst = (a: Assessment) => {
    let best: { v: number | undefined; c: Constraint } | undefined;
    for (const c of constraints) {
      const m = c.margin(a);
      if (m === null) continue;
      if (m === undefined) return { v: undefined, c };
      if (best === undefined || (best.v !== undefined && m < best.v)) best = { v: m, c };
    }
    return best;
  };
  const search = largestScale((k) => worst(trial(k))?.v, 1e-4, 1e4);
  const what = p === "rdsOn" ? "Rds(on)" : "forward drop";
  if (search.kind === "unbounded")
    return {
      item: {
        ...base,
        outcome: "unbounded",
        reason: `even ${search.kMax}× the template's ${what} meets every forward rule`,
      },
    };
  if (search.kind === "impossible") {
    const a = trial(search.kMin);
    const w = worst(a);
    return {
      item: { ...base, outcome: "impossible", reason: impossibleReason(ctx, stage, w?.c, a, what, search.kMin) },
    };
  }
  const limitStage = scaledForward(stage, p, search.k);
  const a = trial(search.k);
  const lim = worst(a)?.c ?? constraints[0];
  if (lim === undefined) throw new Error("unreachable: a limit without a constraint");
  const where = cornerOf(a.review, lim.metric);
  const source: SpecSource =
    lim.source.kind === "rule" ? { ...lim.source, threshold: thresholdOf(ctx, lim.id, a) } : lim.source;
  const why = `${lim.id} sets it${search.cliff ? " (at the edge where the operating point vanishes)" : ""}: the part at the limit has margin ${fmt(lim.margin(a) ?? Number.NaN)} (relative) there`;
  let value: number;
  let templateValue: number | undefined;
  const extra: Record<string, number | string> = {};
  if (p === "rdsOn") {
    value = (rated?.ohm ?? 1) * search.k;
    templateValue = rated?.ohm;
  } else {
    const d = behaviourOf(stage).forwardDiode(stage);
    const ld = behaviourOf(limitStage).forwardDiode(limitStage);
    const i = where.currentA ?? 0;
    const tK = cToK(where.tjC ?? 25);
    value = ld ? diodeVoltageV(ld, i, tK) : Number.NaN;
    templateValue = d ? diodeVoltageV(d, i, tK) : undefined;
    extra["atCurrentA"] = i;
    extra["atJunctionC"] = where.tjC ?? 25;
  }
  const item = limitItem(base, value, templateValue, {
    corner: where.corner,
    conditions: { ...(where.conditions ?? {}), ...extra, scaleFactor: search.k },
    source,
    reason: why,
  });
  return { item, atLimit: { k: search.k, stage: limitStage, assessment: a } };
}

function thresholdOf(ctx: SizingContext, ruleId: string, a: Assessment): number | null {
  const c = ctx.ruleSet.rules.find((r) => r.rule.id === ruleId);
  return c === undefined ? null : evaluateRule(c, a.input, ctx.ruleSet.stamp).threshold;
}

function impossibleReason(
  ctx: SizingContext,
  stage: StageModel,
  c: Constraint | undefined,
  a: Assessment,
  what: string,
  kMin: number,
): string {
  if (c === undefined) return `no ${what} meets the rules`;
  const ambient = ctx.requirement.ambientMaxC;
  const thr = c.source.kind === "rule" ? thresholdOf(ctx, c.id, a) : stageTjMaxC(stage) - ctx.requirement.tjMarginK;
  if (c.metric === "tjWorstC" && thr !== null && ambient >= thr) {
    return `the ${ambient} °C ambient alone reaches the ${fmt(thr)} °C junction limit of ${c.id}: no ${what} can hold the junction below it, whatever the thermal path`;
  }
  return `even at ${kMin}× the template's ${what} ${c.failReason(a)}`;
}
