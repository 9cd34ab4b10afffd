import consumer from "../../rulesets/consumer.json" with { type: "json" };
import defaultSet from "../../rulesets/default.json" with { type: "json" };
import vehicle from "../../rulesets/vehicle.json" with { type: "json" };
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import { ruleSetFromData } from "./parse-rule-set.js";

/** The rule sets shipped under version control in rulesets/; a broken one is a bug (throws). */
export function builtInRuleSets(): readonly CompiledRuleSet[] {
  return [
    ["rulesets/default.json", defaultSet],
    ["rulesets/vehicle.json", vehicle],
    ["rulesets/consumer.json", consumer],
  ].map(([name, data]) => {
    const r = ruleSetFromData(data, String(name));
    if (!r.ok) throw new Error(`built-in rule set ${String(name)} is invalid: ${r.problems.map((p) => p.message).join("; ")}`);
    return r.compiled;
  });
}
