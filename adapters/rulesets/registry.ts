import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import { builtInRuleSets } from "./built-in.js";
import { type FolderLoad, loadRuleSetFolder } from "./folder.js";

/** Port implementation: the rule sets a request may name, and those that were refused at load. */
export interface RuleSetStore {
  get(id: string): { readonly ok: true; readonly set: CompiledRuleSet } | { readonly ok: false; readonly message: string };
  list(): readonly CompiledRuleSet[];
  refused(): FolderLoad["refused"];
}

export function createRuleSetStore(sets: readonly CompiledRuleSet[], refused: FolderLoad["refused"] = []): RuleSetStore {
  const byId = new Map(sets.map((s) => [s.stamp.id, s] as const));
  return {
    get(id) {
      const s = byId.get(id);
      if (s !== undefined) return { ok: true, set: s };
      const r = refused.find((f) => f.setId === id);
      if (r !== undefined) return { ok: false, message: `rule set '${id}' was refused at load (${r.file}): ${r.problems.map((p) => p.message).join("; ")}` };
      return { ok: false, message: `unknown rule set '${id}'; known: ${[...byId.keys()].join(", ")}` };
    },
    list: () => sets,
    refused: () => refused,
  };
}

/** Built-in sets, plus the company sets of `dir` when given (see folder.ts for the policy). */
export function loadRuleSetStore(dir?: string): RuleSetStore {
  const builtIn = builtInRuleSets();
  if (dir === undefined) return createRuleSetStore(builtIn);
  const folder = loadRuleSetFolder(dir, new Set(builtIn.map((s) => s.stamp.id)));
  return createRuleSetStore([...builtIn, ...folder.sets], folder.refused);
}

let builtInStore: RuleSetStore | undefined;
/** The built-in sets alone, compiled once. */
export function builtInRuleSetStore(): RuleSetStore {
  builtInStore ??= createRuleSetStore(builtInRuleSets());
  return builtInStore;
}
