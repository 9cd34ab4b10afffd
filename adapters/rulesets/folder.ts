import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { RefusedRuleSet, RuleSetProblem } from "../../domain/rules/rule-set-store.js";
import { ruleSetFromText } from "./parse-rule-set.js";

export interface FolderLoad {
  readonly sets: readonly CompiledRuleSet[];
  /** Files that were refused, each with every problem found in it. */
  readonly refused: readonly RefusedRuleSet[];
}

const RULE_FILE = /\.(json|ya?ml)$/i;

/**
 * Load every `.json`, `.yaml` and `.yml` file of a folder (in name order, not recursive). A file
 * is all or nothing: one bad rule refuses the whole file, so no verdict ever comes from a set
 * that is only partly loaded. The other files still load; the refused ones are reported and a
 * request that names a refused set gets an error citing the refusal (registry.ts). A set id
 * that is already taken (a built-in or an earlier file) refuses the later file.
 */
export function loadRuleSetFolder(dir: string, taken: ReadonlySet<string> = new Set()): FolderLoad {
  const files = readdirSync(dir, { withFileTypes: true })
    .filter((d) => d.isFile() && RULE_FILE.test(d.name))
    .map((d) => d.name)
    .sort();
  const sets: CompiledRuleSet[] = [];
  const refused: { file: string; setId?: string; problems: RuleSetProblem[] }[] = [];
  const ids = new Set(taken);
  for (const file of files) {
    const text = readFileSync(join(dir, file), "utf8");
    const parsed = ruleSetFromText(text, file);
    if (!parsed.ok) {
      const setId = declaredId(text);
      refused.push({ file, ...(setId === undefined ? {} : { setId }), problems: [...parsed.problems] });
      continue;
    }
    const id = parsed.compiled.stamp.id;
    if (ids.has(id)) {
      refused.push({
        file,
        setId: id,
        problems: [
          {
            source: file,
            path: ["id"],
            message: `rule-set id '${id}' is already taken by a built-in set or an earlier file`,
          },
        ],
      });
      continue;
    }
    ids.add(id);
    sets.push(parsed.compiled);
  }
  return { sets, refused };
}

/** The `id` a refused file declares, when it can be read, so requests naming it learn why. */
function declaredId(text: string): string | undefined {
  // JSON that parses (refused for its rules, not its syntax): its own top-level id, wherever the key
  // stands; a file written on one line has no line that starts with it
  try {
    const v = JSON.parse(text) as { id?: unknown } | null;
    if (typeof v?.id === "string") return v.id;
  } catch {
    // not JSON (YAML, or JSON that does not parse): the first line that declares an id, or the first key of a one-line object
  }
  const m = /^[\s{]*"?id"?\s*:\s*"?([A-Za-z0-9][A-Za-z0-9._-]*)"?/m.exec(text);
  return m?.[1];
}
