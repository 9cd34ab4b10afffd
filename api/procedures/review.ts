import type { ReviewOutput } from "../../contracts/review.js";
import { DEFAULT_VDS_TEMPCO_PER_K, stageMosfet } from "../../domain/checks/breakdown-temperature.js";
import { reviewInput, reviewOutput } from "../../contracts/review.js";
import { type CornerResult, cornerUnsolved } from "../../domain/checks/corners.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { type CandidateReview, reviewCandidate } from "../../domain/review/candidate-review.js";
import { reviewCurves } from "../../domain/review/curves.js";
import { type CandidateVerdict, rankCandidates } from "../../domain/review/ranking.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { formatQuantity } from "../../domain/rules/quantity-text.js";
import type { RuleSetResult } from "../../domain/rules/rule-model.js";
import { withPartCorner } from "../map/part-corner.js";
import { resolveStage } from "../map/resolve-stage.js";
import { reviewCandidateInputs } from "../map/review-candidate.js";
import { cornerRow, pointRow } from "../map/review-rows.js";
import { turnOffEventFields } from "../map/turn-off-output.js";
import { startUpOutput } from "../map/start-up-output.js";
import { toReviewRequirement } from "../map/requirement.js";
import { reviewRuleInput } from "../../domain/rules/metrics-of-review.js";
import { reviewMonteCarlo } from "../map/review-monte-carlo.js";
import { resolveRuleSet } from "../map/rule-set.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

export const review = defineProcedure({
  name: "review",
  input: reviewInput,
  output: reviewOutput,
  handler: ({ input, ctx }): Answer<ReviewOutput> => {
    const assumptions: string[] = [];
    const req = toReviewRequirement(input.requirement, assumptions);
    const set = resolveRuleSet(input.ruleSet ?? "default", ctx, ["ruleSet"]);
    if (input.ruleSet === undefined) assumptions.push("rule set: the built-in default (common practice)");
    const flags = {
      parallelSources: input.requirement.parallelSources ?? false,
      holdUpRequired: input.requirement.holdUpRequired ?? false,
      ...(input.requirement.standbyBudgetA === undefined ? {} : { standbyBudgetA: input.requirement.standbyBudgetA }),
      ...(input.requirement.lossBudgetW === undefined ? {} : { lossBudgetW: input.requirement.lossBudgetW }),
    };

    const evaluated = input.candidates.map((sent, index) => {
      const path = ["candidates", index, "stage"];
      const stage = resolveStage(sent.stage, ctx.catalog, path, assumptions, sent.thermal);
      const c = withPartCorner(sent, stage, path, assumptions);
      const fet = stageMosfet(stage.model);
      if (fet !== undefined && fet.vdsTempCoPerK === undefined) {
        assumptions.push(
          `${path.join(".")}: mosfet.vdsTempCoPerK ${DEFAULT_VDS_TEMPCO_PER_K} /K (+0.1 %/K, memory): the breakdown at the coldest ambient ${req.model.ambientMinC} °C is vdsMaxV scaled by it`,
        );
      }
      if (fet !== undefined && fet.channel.thresholdTempCoVPerK === undefined) {
        assumptions.push(
          `${path.join(".")}: mosfet.thresholdTempCoVPerK not given: the gate threshold is held at its 25 °C value at every corner (a power MOSFET's falls about 2–7 mV/K, memory; it is highest at the coldest ambient ${req.model.ambientMinC} °C): give it or thresholdAtTj`,
        );
      }
      if (stage.model.kind === "integrated-switch" && stage.model.thermalShutdownC !== undefined) {
        const after = stage.model.afterThermalShutdown;
        assumptions.push(
          `${path.join(".")}: a steady corner or a start-up profile at or above the ${stage.model.thermalShutdownC} °C thermal shutdown is the switch turned off and the load interrupted (thermalShutdownInService), ${after === undefined ? "the part taken as latched off: no afterThermalShutdown given" : after.mode === "latched" ? "the part latched off (afterThermalShutdown)" : `the part retrying once cooled by ${after.hysteresisK} K (afterThermalShutdown): it cycles, the load powered only part of the time`}`,
        );
      }
      const { candidate: inputs } = reviewCandidateInputs(
        input.requirement,
        req,
        set,
        stage,
        c,
        path.slice(0, 2),
        assumptions,
      );
      const datasheetMax = inputs.datasheetMax;
      const r = reviewCandidate(req.model, {
        stage: stage.model,
        ...inputs,
        ...(input.curves ? { turnOffWaveform: true } : {}),
      });
      const ruleInput = reviewRuleInput(stage.model, req.model, flags, r);
      const rules = evaluateRuleSet(set, ruleInput);
      const { verdict, reason } = verdictOf(r, rules);
      const heatsink =
        r.thermalSizing.outcome === "heatsink-needed" || r.thermalSizing.outcome === "better-path-needed";
      const cost =
        stage.spec.costEach === undefined ? undefined : stage.spec.costEach + (heatsink ? (c.heatsinkCost ?? 0) : 0);
      const worstLossW = r.worst.unsolvedCornerIndexes.length === 0 ? r.worst.lossW?.value : undefined;
      const m = req.model;
      const curveSpace = {
        supplyMinV: m.supplyMinV,
        ambientMinC: m.ambientMinC,
        ambientMaxC: m.ambientMaxC,
        loadScales: m.loadScales,
        sourceResistanceOhm: m.sourceResistanceOhm,
        load: m.load,
      };
      const curves = input.curves
        ? reviewCurves(stage.model, datasheetMax ? { ...curveSpace, datasheetMax } : curveSpace, r.corners, r.worst)
        : undefined;
      return { index, c, stage, r, ruleInput, rules, verdict, reason, cost, worstLossW, curves };
    });

    const ranked = rankCandidates(
      evaluated.map((e) => ({
        index: e.index,
        verdict: e.verdict,
        ...(e.worstLossW === undefined ? {} : { worstLossW: e.worstLossW }),
        ...(e.cost === undefined ? {} : { cost: e.cost }),
      })),
    );
    const rankOf = new Map(ranked.map((e, i) => [e.index, i + 1]));
    const label = (e: (typeof evaluated)[number]) =>
      e.c.label ?? e.stage.spec.name ?? e.stage.partId ?? `candidate ${e.index + 1}`;
    const rankReason = (e: (typeof evaluated)[number]) =>
      `${e.reason}; worst-case loss ${e.worstLossW === undefined ? "undefined (a corner has no operating point)" : formatQuantity(e.worstLossW, "W")}${e.cost === undefined ? "" : `; cost ${e.cost}`}`;

    const mc = input.monteCarlo;
    if (mc !== undefined && mc.candidate === undefined)
      assumptions.push("monteCarlo.candidate: 0 (the first candidate, default)");
    const mcTarget = mc ? evaluated[mc.candidate ?? 0] : undefined;
    return {
      modelVersion: MODEL_VERSION,
      caution: CAUTION,
      requirement: {
        supplyClass: req.supplyClass,
        supplyMinV: req.model.supplyMinV,
        supplyNominalV: req.model.supplyNominalV,
        supplyMaxV: req.model.supplyMaxV,
        reverseV: req.model.reverseV,
        transients: req.model.transients.map((t) => t.id),
        sources: req.sources,
      },
      ranking: ranked.map((r, i) => {
        const e = evaluated[r.index];
        if (e === undefined) throw new Error("unreachable: ranked index out of range");
        return { rank: i + 1, index: e.index, label: label(e), verdict: e.verdict, reason: rankReason(e) };
      }),
      candidates: evaluated.map((e) => ({
        index: e.index,
        label: label(e),
        stage: {
          kind: e.stage.model.kind,
          ...(e.stage.spec.name === undefined ? {} : { name: e.stage.spec.name }),
          ...(e.stage.partId === undefined ? {} : { partId: e.stage.partId }),
        },
        rank: rankOf.get(e.index) ?? 0,
        verdict: e.verdict,
        rankReason: rankReason(e),
        // Object.assign: a literal that opens with a spread and then gets fields is V8's slow path.
        worst: Object.assign(
          {},
          e.r.worst.tjC ? { tjC: { value: e.r.worst.tjC.value, corner: e.r.worst.tjC.cornerIndex } } : {},
          e.r.worst.lossW ? { lossW: { value: e.r.worst.lossW.value, corner: e.r.worst.lossW.cornerIndex } } : {},
          e.r.worst.dropV ? { dropV: { value: e.r.worst.dropV.value, corner: e.r.worst.dropV.cornerIndex } } : {},
          e.r.worst.loadMinV
            ? { loadMinV: { value: e.r.worst.loadMinV.value, corner: e.r.worst.loadMinV.cornerIndex } }
            : {},
          {
            unsolvedCorners: [...e.r.worst.unsolvedCornerIndexes],
            cornersWithoutOperatingPoint: e.r.worst.unsolvedCornerIndexes.flatMap((i) => {
              const c = e.r.corners[i];
              return c === undefined || "point" in c.result
                ? []
                : [{ corner: i, name: describe(c), outcome: c.result.outcome, reason: c.result.reason }];
            }),
          },
        ),
        corners: e.r.corners.map(cornerRow),
        startUp: startUpOutput(e.r.startUp, input.curves ?? false),
        ...(e.curves === undefined
          ? {}
          : {
              curves: {
                conditions: e.curves.conditions,
                load: e.curves.load.map((p) => ({ loadScale: p.loadScale, ...pointRow(p.result) })),
                ambient: e.curves.ambient.map((p) => ({ ambientC: p.ambientC, ...pointRow(p.result) })),
              },
            }),
        ...(e.r.turnOff === undefined
          ? {}
          : {
              turnOff: {
                tjC: e.r.turnOff.tjC,
                tjSource: e.r.turnOff.tjSource,
                ...(e.r.turnOff.avalancheRatingJ === undefined
                  ? {}
                  : { avalancheRatingJ: e.r.turnOff.avalancheRatingJ }),
                event: turnOffEventFields(e.r.turnOff.result, req.model.turnOff?.outputV ?? 0, e.r.turnOff.waveform),
                ...(e.r.turnOff.train === undefined ? {} : { train: e.r.turnOff.train }),
              },
            }),
        ...(e.r.pulseBackConduction === undefined ? {} : { pulseBackConduction: [...e.r.pulseBackConduction] }),
        reverse: e.r.reverse,
        transients: e.r.transients,
        ...(e.r.inrush === undefined ? {} : { inrush: e.r.inrush }),
        loadOvervoltage: e.r.loadOvervoltage,
        ...(e.r.thermalShutdownCycle === undefined ? {} : { thermalShutdownCycle: e.r.thermalShutdownCycle }),
        thermalSizing: e.r.thermalSizing,
        ...(e.r.energy ? { energy: e.r.energy } : {}),
        standby: e.r.standby,
        metrics: e.ruleInput.metrics,
        rules: e.rules,
        ...(e.cost === undefined ? {} : { costTotal: e.cost }),
      })),
      ...(mc && mcTarget
        ? {
            monteCarlo: reviewMonteCarlo(
              mc,
              mcTarget.stage.model,
              req.model,
              mcTarget.ruleInput,
              set,
              mcTarget.c.datasheetMax,
              ["candidates", mcTarget.index, "datasheetMax"],
              assumptions,
            ),
          }
        : {}),
      assumptions,
    };
  },
});

/** A corner without an operating point fails outright; otherwise the rule set decides. */
function verdictOf(r: CandidateReview, rules: RuleSetResult): { verdict: CandidateVerdict; reason: string } {
  const first = r.worst.unsolvedCornerIndexes[0];
  const corner = first === undefined ? undefined : r.corners[first];
  const unsolved = corner === undefined ? undefined : cornerUnsolved(corner);
  if (corner && unsolved) {
    return {
      verdict: "fail",
      reason: `fail: corner ${first} (${describe(corner)}) has no operating point: ${unsolved.reason}`,
    };
  }
  const failing = rules.verdicts.find((v) => v.outcome === "fail") ?? rules.verdicts.find((v) => v.outcome === "warn");
  switch (rules.outcome) {
    case "pass":
      return { verdict: "pass", reason: `pass: ${rules.counts.pass} rules passed` };
    case "fail":
    case "warn":
      return {
        verdict: rules.outcome,
        reason: `${rules.outcome}: ${failing?.ruleId ?? "?"} (${failing?.reason ?? failing?.title ?? ""})`,
      };
    default: {
      const gap = rules.verdicts.find(
        (v) => v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite",
      );
      return {
        verdict: "incomplete",
        reason: `incomplete: ${gap ? `${gap.ruleId} could not be evaluated (${gap.reason ?? ""})` : "no rule applied"}`,
      };
    }
  }
}

function describe(c: CornerResult): string {
  const k = c.conditions;
  return `supply ${k.supply} ${k.supplyV} V, ambient ${k.ambient} ${k.ambientC} °C, load ×${k.loadScale}, ${k.tolerance}`;
}
