import type { RuleSetSpec } from "../../contracts/rule-set.js";
import { builtInRuleSetStore } from "../../domain/rules/built-in-sets.js";
import { type CompiledRuleSet, compileRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { RuleSetStore } from "../../domain/rules/rule-set-store.js";
import { toRuleSet } from "../../contracts/rule-set.js";
import { expressionErrorMessage, expressionSizeLimits, isLimitMessage } from "../../contracts/limits.js";
import type { Context } from "../context.js";
import { InputProblem } from "../input-problem.js";
import { TRPCError } from "@trpc/server";

export function ruleSetsOf(ctx: Context): RuleSetStore {
  return ctx.ruleSets ?? builtInRuleSetStore();
}

/**
 * The compiled rule set a request names (by id) or carries inline. An unknown id, a set refused
 * at load, or an inline set whose rules do not compile is an input problem naming the path,
 * the rule id and the column in its expression; an expression over a size limit is refused for
 * that alone (`limit-exceeded`, naming the limit).
 */
export function resolveRuleSet(ref: string | RuleSetSpec, ctx: Context, path: (string | number)[]): CompiledRuleSet {
  if (typeof ref === "string") {
    const r = ruleSetsOf(ctx).get(ref);
    if (r.ok) {
      ctx.uses?.ruleSet(r.set.stamp);
      return r.set;
    }
    throw problem("unknown-rule-set", r.message, [{ path, message: r.message }]);
  }
  const out = compileRuleSet(toRuleSet(ref), expressionSizeLimits());
  if (out.ok) {
    ctx.uses?.ruleSet(out.compiled.stamp);
    return out.compiled;
  }
  const issues = out.errors.map((e) => {
    const idx = ref.rules.findIndex((r) => r.id === e.ruleId);
    return {
      path: [...path, "rules", idx, e.field],
      message: `rule ${e.ruleId}${e.field === "when" || e.field === "expression" ? `, column ${e.column}` : ""}: ${expressionErrorMessage(e.code, e.message)}`,
    };
  });
  const over = issues.filter((i) => isLimitMessage(i.message));
  return (() => {
    if (over.length > 0)
      throw problem(
        "limit-exceeded",
        `rule set '${ref.id}' over a limit: ${over.map((i) => i.message).join("; ")}`,
        over,
      );
    throw problem(
      "invalid-rule-set",
      `invalid rule set '${ref.id}': ${issues.map((i) => i.message).join("; ")}`,
      issues,
    );
  })();
}

function problem(
  code: "unknown-rule-set" | "invalid-rule-set" | "limit-exceeded",
  message: string,
  issues: { path: (string | number)[]; message: string }[],
): TRPCError {
  return new TRPCError({ code: "BAD_REQUEST", message, cause: new InputProblem(code, message, issues) });
}
