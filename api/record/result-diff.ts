/** A leaf of a result: its value, its path as text, and the rule it sits under (a verdict's ruleId). */
interface Leaf {
  readonly value: string | number | boolean | null;
  readonly depth: number;
  readonly ruleId: string | undefined;
  readonly verdict: boolean;
}

/** Keys whose string value is a verdict or an analysis outcome. */
const VERDICT_KEYS: ReadonlySet<string> = new Set(["outcome", "verdict"]);

/** An element's key in its array: `ruleId` or `index` where every element has a distinct one, else its place. */
function keyOf(items: readonly unknown[]): ((item: unknown, i: number) => string) | undefined {
  for (const field of ["ruleId", "index"] as const) {
    const seen = new Set<unknown>();
    const ok = items.every((it) => {
      const v = typeof it === "object" && it !== null ? (it as Record<string, unknown>)[field] : undefined;
      if ((typeof v !== "string" && typeof v !== "number") || seen.has(v)) return false;
      seen.add(v);
      return true;
    });
    if (ok && items.length > 0)
      return (it) => `[${field === "index" ? "index=" : ""}${String((it as Record<string, unknown>)[field])}]`;
  }
  return undefined;
}

/**
 * Every leaf of a JSON value by path (`candidates[index=2].rules.verdicts[tj-limit].outcome`): an
 * array of verdicts is keyed by rule id, of candidates by their index, so a rule added to a set or
 * a ranking reordered moves no other leaf.
 */
function leaves(value: unknown): Map<string, Leaf> {
  const out = new Map<string, Leaf>();
  const walk = (v: unknown, path: string, depth: number, ruleId: string | undefined, key: string): void => {
    if (v === null || typeof v !== "object") {
      const leaf = typeof v === "string" || typeof v === "number" || typeof v === "boolean" ? v : null;
      out.set(path, { value: leaf, depth, ruleId, verdict: typeof v === "string" && VERDICT_KEYS.has(key) });
      return;
    }
    if (Array.isArray(v)) {
      const k = keyOf(v);
      v.forEach((it, i) => {
        walk(it, `${path}${k === undefined ? `[${i}]` : k(it, i)}`, depth + 1, ruleId, key);
      });
      return;
    }
    const o = v as Record<string, unknown>;
    const rid = typeof o.ruleId === "string" ? o.ruleId : ruleId;
    for (const name of Object.keys(o)) walk(o[name], path === "" ? name : `${path}.${name}`, depth + 1, rid, name);
  };
  walk(value, "", 0, undefined, "");
  return out;
}

export interface ResultDiff {
  readonly verdict?: { path: string; from: string | null; to: string | null; rules: string[]; changed: number };
  readonly numbers?: { changed: number; largestRelativeChange: number; path: string };
  readonly fields?: { changed: number; path: string };
}

/**
 * What differs between a filed result and today's (both without their records): the verdicts and
 * outcomes that moved (the least nested one, and every rule id under which one moved), the numbers
 * that changed (the largest relative change |b − a| / max(|a|, |b|) and where), and any other value.
 */
export function diffResults(filed: unknown, today: unknown): ResultDiff {
  const a = leaves(filed);
  const b = leaves(today);
  let verdictChanged = 0;
  let top: { path: string; from: string | null; to: string | null; depth: number } | undefined;
  const rules = new Set<string>();
  let numbersChanged = 0;
  let largest = { rel: -1, path: "" };
  let fieldsChanged = 0;
  let firstField: string | undefined;
  const paths = new Set([...a.keys(), ...b.keys()]);
  for (const path of paths) {
    const x = a.get(path);
    const y = b.get(path);
    if (x !== undefined && y !== undefined && x.value === y.value) continue;
    if ((x?.verdict ?? false) || (y?.verdict ?? false)) {
      verdictChanged += 1;
      const depth = Math.min(x?.depth ?? Infinity, y?.depth ?? Infinity);
      if (top === undefined || depth < top.depth)
        top = {
          path,
          from: typeof x?.value === "string" ? x.value : null,
          to: typeof y?.value === "string" ? y.value : null,
          depth,
        };
      const rid = x?.ruleId ?? y?.ruleId;
      if (rid !== undefined) rules.add(rid);
      continue;
    }
    if (typeof x?.value === "number" && typeof y?.value === "number") {
      numbersChanged += 1;
      const rel = Math.abs(y.value - x.value) / Math.max(Math.abs(x.value), Math.abs(y.value));
      if (rel > largest.rel) largest = { rel, path };
      continue;
    }
    fieldsChanged += 1;
    firstField ??= path;
  }
  return {
    ...(top === undefined
      ? {}
      : { verdict: { path: top.path, from: top.from, to: top.to, rules: [...rules].sort(), changed: verdictChanged } }),
    ...(numbersChanged === 0
      ? {}
      : { numbers: { changed: numbersChanged, largestRelativeChange: largest.rel, path: largest.path } }),
    ...(firstField === undefined ? {} : { fields: { changed: fieldsChanged, path: firstField } }),
  };
}
