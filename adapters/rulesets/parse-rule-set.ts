import { createRequire } from "node:module";
import { ruleSetSchema, toRuleSet } from "../../contracts/rule-set.js";
import { issuesOf, pathText } from "../../contracts/zod-messages.js";
import { expressionErrorMessage, expressionSizeLimits } from "../../contracts/limits.js";
import { type CompiledRuleSet, compileRuleSet, formatRuleLoadError } from "../../domain/rules/compile-rule-set.js";
import type { RuleSetProblem } from "../../domain/rules/rule-set-store.js";

/** yaml, loaded when the first YAML rule file is read (a service without a rules folder never needs it; it is 30 ms of start-up). */
let yamlParse: typeof import("yaml").parse | undefined;
function parseYaml(text: string, options: { readonly maxAliasCount: number }): unknown {
  yamlParse ??= (createRequire(import.meta.url)("yaml") as typeof import("yaml")).parse;
  return yamlParse(text, options);
}

export type ParsedRuleSet =
  | { readonly ok: true; readonly compiled: CompiledRuleSet }
  | { readonly ok: false; readonly problems: readonly RuleSetProblem[] };

/** Validate a rule set given as data (inline in a request, or a parsed file) and compile it. */
export function ruleSetFromData(data: unknown, source: string): ParsedRuleSet {
  const shape = ruleSetSchema.safeParse(data);
  if (!shape.success) {
    return {
      ok: false,
      problems: issuesOf(shape.error.issues).map(({ path, message }) => {
        const ruleId = ruleIdAt(data, path);
        return {
          source,
          path,
          message: `${ruleId === undefined ? "" : `rule ${ruleId}: `}${path.length === 0 ? "(set)" : pathText(path)}: ${message}`,
          ...(ruleId === undefined ? {} : { ruleId }),
        };
      }),
    };
  }
  const set = toRuleSet(shape.data);
  const out = compileRuleSet(set, expressionSizeLimits());
  if (out.ok) return out;
  return {
    ok: false,
    problems: out.errors.map((e) => {
      const idx = set.rules.findIndex((r) => r.id === e.ruleId);
      return {
        source,
        ruleId: e.ruleId,
        path: ["rules", idx, e.field],
        column: e.column,
        message: formatRuleLoadError({ ...e, message: expressionErrorMessage(e.code, e.message) }),
      };
    }),
  };
}

/** Parse a rule-set file's text: JSON for `.json`, YAML for `.yaml`/`.yml`. */
export function ruleSetFromText(text: string, fileName: string): ParsedRuleSet {
  let data: unknown;
  try {
    data = /\.ya?ml$/i.test(fileName) ? parseYaml(text, { maxAliasCount: 50 }) : JSON.parse(text);
  } catch (e) {
    return {
      ok: false,
      problems: [
        {
          source: fileName,
          path: [],
          message: `not valid ${/\.ya?ml$/i.test(fileName) ? "YAML" : "JSON"}: ${e instanceof Error ? e.message : String(e)}`,
        },
      ],
    };
  }
  return ruleSetFromData(data, fileName);
}

function ruleIdAt(data: unknown, path: readonly (string | number)[]): string | undefined {
  if (path[0] !== "rules" || typeof path[1] !== "number") return undefined;
  const rules = (data as { rules?: unknown } | null)?.rules;
  const r = Array.isArray(rules) ? (rules[path[1]] as { id?: unknown } | undefined) : undefined;
  return typeof r?.id === "string" ? r.id : `#${path[1]}`;
}
