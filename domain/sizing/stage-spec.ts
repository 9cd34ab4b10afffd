import { blocksReverseCurrent } from "../checks/stage-ratings.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import { type StageKind, type StageModel, stageStartV } from "../stages/stage-model.js";
import type { Assessment, SizingContext } from "./assessment.js";
import { clampSpec } from "./clamp-spec.js";
import { forwardLimit } from "./forward-limit.js";
import { leakageLimit } from "./leakage-limit.js";
import { ruleLimitItem } from "./rule-limit.js";
import { fmt, type SpecItem } from "./spec-item.js";
import { startAlongProfileLimit } from "./start-limit.js";
import { thermalSpec } from "./thermal-spec.js";
import { turnOffDelayLimits } from "./turn-off-delay.js";
import { turnOffEventItems } from "./turn-off-event-items.js";

export interface StageSpecification {
  readonly stageKind: StageKind;
  readonly items: readonly SpecItem[];
  /** The template's own review, the values the rule limits hold fixed. */
  readonly template: Assessment;
}

/**
 * The limiting specification of a part like `stage` (its laws and thermal path held) for the
 * requirement and rule set, line by line, each with the corner and the rule (or requirement
 * field) that set it. Forward limits (Rds(on), forward drop) are solved through the review of
 * trial parts; rating and controller limits invert the rules on the template's review values.
 */
export function specifyStage(ctx: SizingContext, stage: StageModel): StageSpecification {
  const template = ctx.assess(stage);
  const set = ctx.ruleSet;
  const input = template.input;
  const num = (v: number | boolean | undefined) => (typeof v === "number" ? v : undefined);
  const part = (name: string) => num(input.part[name]);
  const metric = (name: string) => num(input.metrics[name]);
  const rule = (
    name: string,
    id: string,
    title: string,
    unit: string,
    bound: "at-most" | "at-least",
    value: number | undefined,
    corner: string,
  ) => ruleLimitItem(set, input, name, { id, title, unit, bound }, value, corner);
  const reverse = `steady reverse ${ctx.requirement.reverseV} V and the negative pulses of the set`;
  const items: SpecItem[] = [];
  const traits = behaviourOf(stage).sizing;
  items.push(forwardLimit(ctx, stage, template, traits.forward).item);
  if (traits.reverseRating === "vrrmV")
    items.push(
      rule(
        "part.vrrmV",
        "reverseRatingMinV",
        "smallest repetitive peak reverse voltage rating VRRM",
        "V",
        "at-least",
        part("vrrmV"),
        reverse,
      ),
    );
  if (traits.reverseRating === "vdsMaxV")
    items.push(
      rule(
        "part.vdsMaxV",
        "drainSourceRatingMinV",
        "smallest drain-source voltage rating",
        "V",
        "at-least",
        part("vdsMaxV"),
        reverse,
      ),
    );
  if (traits.gateFromSupply) {
    items.push(
      rule(
        "part.vgsMaxV",
        "gateSourceRatingMinV",
        "smallest gate-source voltage rating",
        "V",
        "at-least",
        part("vgsMaxV"),
        "highest steady supply and positive pulses, after the gate clamp",
      ),
    );
  }
  if (traits.ratedGateDrive) {
    items.push(
      rule(
        "part.vgsOnV",
        "ratedGateDriveMaxV",
        `gate drive at which Rds(on) is rated, at most the drive available at the lowest supply (${metric("gateDriveMinV") ?? "?"} V)`,
        "V",
        "at-most",
        part("vgsOnV"),
        `lowest supply ${ctx.requirement.supplyMinV} V, full load`,
      ),
    );
  }
  // The cold gate overdrive as the review computes it (reviewCandidate: the drive at the lowest
  // supply less Vth at the coldest ambient, at the datasheet maximum where given).
  const coldVth = template.review.gateThresholdColdV;
  if (coldVth !== undefined)
    items.push(
      rule(
        "gateOverdriveColdV",
        "gateOverdriveColdMinV",
        `smallest gate overdrive: the drive at the lowest supply (${metric("gateDriveMinV") ?? "?"} V) less the threshold at the coldest ambient (${fmt(coldVth)} V)`,
        "V",
        "at-least",
        metric("gateOverdriveColdV"),
        `lowest supply ${ctx.requirement.supplyMinV} V, coldest ambient ${ctx.requirement.ambientMinC} °C`,
      ),
    );
  if (traits.leakage) items.push(leakageLimit(ctx, stage));
  const startV = stageStartV(stage);
  if (traits.control && startV !== undefined) items.push(...controllerItems(ctx, stage, startV, rule, part, metric));
  items.push(...thermalSpec(ctx, template.review.thermalSizing));
  items.push(...clampSpec(ctx, stage));
  items.push(...turnOffEventItems(ctx, template));
  return { stageKind: stage.kind, items, template };
}

type RuleItem = (
  name: string,
  id: string,
  title: string,
  unit: string,
  bound: "at-most" | "at-least",
  value: number | undefined,
  corner: string,
) => SpecItem;

function controllerItems(
  ctx: SizingContext,
  stage: StageModel,
  startV: number,
  rule: RuleItem,
  part: (n: string) => number | undefined,
  metric: (n: string) => number | undefined,
): SpecItem[] {
  const req = ctx.requirement;
  const out: SpecItem[] = [
    rule(
      "part.maxInputV",
      "inputRatingMinV",
      "smallest input voltage rating of the controller (or switch)",
      "V",
      "at-least",
      part("maxInputV"),
      "highest steady supply and positive pulses",
    ),
    rule(
      "startVoltageV",
      "startVMaxV",
      "highest start voltage that still starts at the lowest supply",
      "V",
      "at-most",
      metric("startVoltageV"),
      `lowest supply ${req.supplyMinV} V`,
    ),
    startAlongProfileLimit(ctx, stage, startV),
  ];
  if (blocksReverseCurrent(stage)) {
    if (ctx.turnOff) out.push(...turnOffDelayLimits(ctx, stage, ctx.turnOff));
    else if (ctx.turnOffUnavailable !== undefined)
      out.push({
        id: "turnOffDelayMaxS",
        title: "longest turn-off delay",
        unit: "s",
        bound: "at-most",
        outcome: "not-determined",
        reason: ctx.turnOffUnavailable,
      });
    else
      out.push({
        id: "turnOffDelayMaxS",
        title: "longest turn-off delay",
        unit: "s",
        bound: "at-most",
        outcome: "not-required",
        reason: "no turn-off event (loop, capacitor and limits) was given",
      });
  }
  out.push(
    rule(
      "quiescentA",
      "quiescentMaxA",
      "largest quiescent current within the standby budget",
      "A",
      "at-most",
      metric("quiescentA"),
      "standby, supply present",
    ),
  );
  return out;
}
