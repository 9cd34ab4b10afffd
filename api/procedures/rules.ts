import type { z } from "zod";
import {
  rulesEvaluateInput,
  rulesEvaluateOutput,
  rulesListInput,
  rulesListOutput,
  rulesShowInput,
  rulesShowOutput,
} from "../../contracts/rules.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";
import { METRICS, PART_PARAMETERS } from "../../domain/rules/metric-vocabulary.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { inputProblem } from "../input-problem.js";
import { resolveRuleSet, ruleSetsOf } from "../map/rule-set.js";
import { defineProcedure } from "../define-procedure.js";

/**
 * rules.evaluate, rules.list, rules.show: verdicts on caller metrics, and what rule sets and names
 * exist. Results have the shapes of contracts/rules.ts (checked in test/api/rules.test.ts).
 */
export const rules = [
  defineProcedure({
    name: "rules.evaluate",
    input: rulesEvaluateInput,
    output: rulesEvaluateOutput,
    handler: ({ input, ctx }) => {
      const set = resolveRuleSet(input.ruleSet, ctx, ["ruleSet"]);
      const result = evaluateRuleSet(set, {
        ...(input.stageKind === undefined ? {} : { stageKind: input.stageKind }),
        metrics: input.metrics,
        part: input.part,
      });
      return { modelVersion: MODEL_VERSION, caution: CAUTION, result };
    },
  }),
  defineProcedure({
    name: "rules.list",
    input: rulesListInput,
    output: rulesListOutput,
    handler: ({ ctx }): z.output<typeof rulesListOutput> => {
      const store = ruleSetsOf(ctx);
      return {
        ruleSets: store.list().map((s) => ({
          id: s.stamp.id,
          version: s.stamp.version,
          hash: s.stamp.hash,
          description: s.set.description,
          ...(s.set.basedOn === undefined ? {} : { basedOn: s.set.basedOn }),
          rules: s.rules.length,
        })),
        refused: store.refused().map((r) => ({
          file: r.file,
          ...(r.setId === undefined ? {} : { setId: r.setId }),
          problems: r.problems.map((p) => ({ message: p.message })),
        })),
        metrics: METRICS.map((m) => ({ ...m, stageKinds: m.stageKinds === "all" ? "all" : [...m.stageKinds] })),
        partParameters: PART_PARAMETERS.map((m) => ({
          ...m,
          stageKinds: m.stageKinds === "all" ? "all" : [...m.stageKinds],
        })),
      };
    },
  }),
  defineProcedure({
    name: "rules.show",
    input: rulesShowInput,
    output: rulesShowOutput,
    handler: ({ input, ctx }) => {
      const r = ruleSetsOf(ctx).get(input.id);
      if (!r.ok) throw inputProblem("unknown-rule-set", ["id"], r.message);
      const s = r.set.set;
      return {
        ruleSet: s,
        stamp: r.set.stamp,
      };
    },
  }),
] as const;
