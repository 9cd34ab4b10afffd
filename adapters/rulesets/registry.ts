import { builtInRuleSets } from "../../domain/rules/built-in-sets.js";
import { createRuleSetStore, type RuleSetStore } from "../../domain/rules/rule-set-store.js";
import { loadRuleSetFolder } from "./folder.js";

/** Built-in sets, plus the company sets of `dir` when given (see folder.ts for the policy). */
export function loadRuleSetStore(dir?: string): RuleSetStore {
  // Without a folder nothing can be refused: the built-in sets compile on first use.
  if (dir === undefined) return createRuleSetStore(builtInRuleSets);
  const builtIn = builtInRuleSets();
  const folder = loadRuleSetFolder(dir, new Set(builtIn.map((s) => s.stamp.id)));
  return createRuleSetStore([...builtIn, ...folder.sets], folder.refused);
}
