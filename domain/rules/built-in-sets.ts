import consumer from "../../rulesets/consumer.json" with { type: "json" };
import defaultSet from "../../rulesets/default.json" with { type: "json" };
import vehicle from "../../rulesets/vehicle.json" with { type: "json" };
import { type CompiledRuleSet, compileRuleSet, formatRuleLoadError } from "./compile-rule-set.js";
import type { RuleSet } from "./rule-model.js";
import { createRuleSetStore, type RuleSetStore } from "./rule-set-store.js";

/**
 * The rule sets shipped under version control in rulesets/ (default, vehicle, consumer). Their
 * shape is checked against the rule-set contract in the tests; a set that does not compile is a
 * bug, so this throws.
 */
const FILES: readonly (readonly [string, unknown])[] = [
  ["rulesets/default.json", defaultSet],
  ["rulesets/vehicle.json", vehicle],
  ["rulesets/consumer.json", consumer],
];

let compiled: readonly CompiledRuleSet[] | undefined;

export function builtInRuleSets(): readonly CompiledRuleSet[] {
  compiled ??= FILES.map(([name, data]) => {
    const r = compileRuleSet(data as RuleSet);
    if (!r.ok) throw new Error(`built-in rule set ${name} is invalid: ${r.errors.map(formatRuleLoadError).join("; ")}`);
    return r.compiled;
  });
  return compiled;
}

let store: RuleSetStore | undefined;
/** The built-in sets alone. */
export function builtInRuleSetStore(): RuleSetStore {
  store ??= createRuleSetStore(builtInRuleSets());
  return store;
}

/** The built-in files as data, for the contract check of their shape. */
export function builtInRuleSetFiles(): readonly (readonly [string, unknown])[] {
  return FILES;
}
