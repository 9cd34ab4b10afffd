import type { CompiledRuleSet } from "./compile-rule-set.js";

/** One problem with one rule-set source: where (file, rule, field path, column) and what. */
export interface RuleSetProblem {
  readonly source: string;
  readonly ruleId?: string;
  readonly path: readonly (string | number)[];
  readonly column?: number;
  readonly message: string;
}

/** A rule-set source refused at load, with every problem found in it. */
export interface RefusedRuleSet {
  readonly file: string;
  readonly setId?: string;
  readonly problems: readonly RuleSetProblem[];
}

/** Port: the rule sets a request may name (built-in and company), and those refused at load. */
export interface RuleSetStore {
  get(
    id: string,
  ): { readonly ok: true; readonly set: CompiledRuleSet } | { readonly ok: false; readonly message: string };
  list(): readonly CompiledRuleSet[];
  refused(): readonly RefusedRuleSet[];
}

/**
 * A store of compiled sets and the refused ones. `sets` may be a function: the sets are then
 * compiled on first use (the built-in sets, which cannot be refused, need not hold up start-up).
 */
export function createRuleSetStore(
  sets: readonly CompiledRuleSet[] | (() => readonly CompiledRuleSet[]),
  refused: readonly RefusedRuleSet[] = [],
): RuleSetStore {
  let all: readonly CompiledRuleSet[] | undefined = typeof sets === "function" ? undefined : sets;
  let byIdCache: Map<string, CompiledRuleSet> | undefined;
  const list = (): readonly CompiledRuleSet[] => {
    all ??= (sets as () => readonly CompiledRuleSet[])();
    return all;
  };
  const byIdMap = (): Map<string, CompiledRuleSet> => {
    byIdCache ??= new Map(list().map((s) => [s.stamp.id, s] as const));
    return byIdCache;
  };
  return {
    get(id) {
      const byId = byIdMap();
      const s = byId.get(id);
      if (s !== undefined) return { ok: true, set: s };
      const r = refused.find((f) => f.setId === id);
      if (r !== undefined)
        return {
          ok: false,
          message: `rule set '${id}' was refused at load (${r.file}): ${r.problems.map((p) => p.message).join("; ")}`,
        };
      return { ok: false, message: `unknown rule set '${id}'; known: ${[...byId.keys()].join(", ")}` };
    },
    list,
    refused: () => refused,
  };
}
