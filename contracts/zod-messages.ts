import { z } from "zod";
import { LIMITS } from "./limits.js";

/**
 * The wording of zod's refusals at backstop's edge, set once for every schema (zod's global error
 * map, `z.config({ customError })`): an unknown key names the nearest valid field, a missing field
 * says "required", an enum lists what to type. A schema's own message still wins.
 *
 * Every object of an input contract is a zod strict object (`z.strictObject`), so an unknown key is
 * zod's own `unrecognized_keys` issue; {@link issuesOf} turns it into one issue per key with the
 * key on the path, so the path names the field itself.
 */

/** Keys that reach an object's prototype when assigned; never a field of backstop's. */
export const PROTOTYPE_KEYS: ReadonlySet<string> = new Set(["__proto__", "constructor", "prototype"]);

/** Levenshtein distance, capped: returns > cap as soon as it is certain. */
function distance(a: string, b: string, cap: number): number {
  if (Math.abs(a.length - b.length) > cap) return cap + 1;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i += 1) {
    const row = [i];
    let best = i;
    for (let j = 1; j <= b.length; j += 1) {
      const v = Math.min(
        (prev[j] as number) + 1,
        (row[j - 1] as number) + 1,
        (prev[j - 1] as number) + (a[i - 1] === b[j - 1] ? 0 : 1),
      );
      row.push(v);
      if (v < best) best = v;
    }
    if (best > cap) return cap + 1;
    prev = row;
  }
  return prev[b.length] as number;
}

/** The valid name closest to `key` (case-insensitive; within a third of its length, at least 2 edits), or undefined. */
export function nearestName(key: string, names: readonly string[]): string | undefined {
  const k = key.toLowerCase();
  const cap = Math.max(2, Math.floor(k.length / 3));
  let best: string | undefined;
  let bestD = cap + 1;
  for (const n of names) {
    const d = distance(k, n.toLowerCase(), cap);
    if (d < bestD) {
      best = n;
      bestD = d;
    }
  }
  return best;
}

/** The message for one unknown key of an object whose valid keys are `known`. */
export function unknownFieldMessage(key: string, known: readonly string[]): string {
  if (PROTOTYPE_KEYS.has(key))
    return `unknown field \`${key}\`: this name is never a field (it would reach an object's prototype)`;
  const near = nearestName(key, known);
  if (near !== undefined) return `unknown field \`${key}\`; did you mean \`${near}\`?`;
  return known.length > 0 && known.length <= 24
    ? `unknown field \`${key}\`; valid fields here: ${known.join(", ")}`
    : `unknown field \`${key}\``;
}

/** An id that names nothing: the nearest known one, and the list (`no supply class "car-12"; did you mean "car-12v"? known: ...`). */
export function unknownIdMessage(what: string, id: string, known: readonly string[]): string {
  const near = nearestName(id, known);
  return `no ${what} "${id}"${near === undefined ? "" : `; did you mean "${near}"?`} known: ${known.join(", ")}`;
}

/** Between the per-key messages of one unrecognized_keys issue (split again by issuesOf). */
const KEY_MESSAGE_SEPARATOR = "; also ";

const quoted = (v: unknown) => (typeof v === "string" ? v : JSON.stringify(v));

type RawIssue = z.core.$ZodRawIssue & { inst?: { _zod?: { def?: { shape?: Record<string, unknown> } } } };

function customError(iss: RawIssue): string | undefined {
  switch (iss.code) {
    case "unrecognized_keys": {
      // hints for the keys an error answer lists, not for every key of a hostile input (limits.ts)
      const known = Object.keys(iss.inst?._zod?.def?.shape ?? {});
      return (iss.keys as string[])
        .slice(0, LIMITS.maxErrorIssues)
        .map((k) => unknownFieldMessage(k, known))
        .join(KEY_MESSAGE_SEPARATOR);
    }
    case "invalid_type":
      return iss.input === undefined
        ? `required (${iss.expected === "nonoptional" ? "a value" : `${/^[aeiou]/.test(iss.expected) ? "an" : "a"} ${iss.expected}`})`
        : undefined;
    case "invalid_value": {
      const values = (iss as { values?: unknown[] }).values;
      if (!values || values.length < 2) return undefined;
      return `expected one of ${values.map(quoted).join(", ")}${iss.input === undefined ? "" : ` (got ${JSON.stringify(iss.input)})`}`;
    }
    case "invalid_union": {
      const { options, discriminator } = iss as { options?: unknown[]; discriminator?: string };
      if (!options || discriminator === undefined) return undefined;
      const input = iss.input as Record<string, unknown> | undefined;
      const value =
        typeof input === "object" && input !== null && Object.hasOwn(input, discriminator)
          ? input[discriminator]
          : undefined;
      const list = options.map(quoted).join(", ");
      return value === undefined
        ? `required: one of ${list}`
        : `expected one of ${list} (got ${JSON.stringify(value)})`;
    }
    default:
      return undefined;
  }
}

z.config({ customError: customError as z.core.$ZodErrorMap });

export interface PlainIssue {
  readonly path: (string | number)[];
  readonly message: string;
}

const plainPath = (path: readonly PropertyKey[]): (string | number)[] =>
  path.map((p) => (typeof p === "symbol" ? String(p) : p));

/** The one branch of a union whose type the input matched (its issues are the ones to report), if exactly one did. */
function matchedBranch(i: z.core.$ZodIssue): z.core.$ZodIssue[] | undefined {
  if (i.code !== "invalid_union" || i.errors.length === 0) return undefined;
  const typed = i.errors.filter((branch) => !branch.every((b) => b.code === "invalid_type" && b.path.length === 0));
  return typed.length === 1 ? (typed[0] as z.core.$ZodIssue[]) : undefined;
}

/**
 * zod's issues as backstop reports them: an unknown key is one issue per key with the key on the
 * path; a union whose input matched one branch's type (an inline rule set given where an id or a
 * set may stand) reports that branch's issues, not "invalid input".
 */
export function issuesOf(issues: readonly z.core.$ZodIssue[], at: readonly PropertyKey[] = []): PlainIssue[] {
  const out: PlainIssue[] = [];
  for (const i of issues) {
    const path = [...at, ...i.path];
    if (i.code === "unrecognized_keys") {
      const parts = i.message.split(KEY_MESSAGE_SEPARATOR);
      const listed = Math.min(i.keys.length, LIMITS.maxErrorIssues);
      const each = parts.length === listed;
      for (let n = 0; n < listed; n += 1) {
        const k = i.keys[n] as string;
        out.push({ path: plainPath([...path, k]), message: each ? (parts[n] as string) : `unknown field \`${k}\`` });
      }
      continue;
    }
    const branch = matchedBranch(i);
    if (branch !== undefined) {
      out.push(...issuesOf(branch, path));
      continue;
    }
    out.push({ path: plainPath(path), message: i.message });
  }
  return out;
}

/**
 * How many issues {@link issuesOf} would report with no cap on unknown keys (it lists at most
 * `BACKSTOP_MAX_ERROR_ISSUES` keys of one object): the count an error answer states.
 */
export function countIssues(issues: readonly z.core.$ZodIssue[]): number {
  let n = 0;
  for (const i of issues) {
    if (i.code === "unrecognized_keys") n += i.keys.length;
    else {
      const branch = matchedBranch(i);
      n += branch === undefined ? 1 : countIssues(branch);
    }
  }
  return n;
}

/** A path as a user types it: `ruleSet.rules[3].severity` (the input itself: "(input)"). */
export function pathText(path: readonly (string | number)[]): string {
  let s = "";
  for (const p of path) s += typeof p === "number" ? `[${p}]` : s === "" ? p : `.${p}`;
  return s === "" ? "(input)" : s;
}
