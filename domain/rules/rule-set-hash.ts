import type { RuleSet } from "./rule-model.js";
import { sha256Hex } from "./sha256.js";

/**
 * Code units JSON.stringify writes as they are: not `"`, `\\`, a control character (U+0000-U+001F)
 * or a surrogate (a lone one is escaped; a string with a pair goes through JSON.stringify as well).
 */
// biome-ignore lint/suspicious/noControlCharactersInRegex: the control characters are the ones JSON escapes
const NEEDS_NO_ESCAPE = /^[^"\\\u0000-\u001f\ud800-\udfff]*$/;

/** A string as JSON.stringify writes it. */
function quoted(s: string): string {
  return NEEDS_NO_ESCAPE.test(s) ? `"${s}"` : JSON.stringify(s);
}

/**
 * Canonical JSON: object keys sorted by UTF-16 code unit order at every level, no whitespace,
 * arrays in order, undefined members dropped; numbers as JSON.stringify writes them. Equal
 * content gives equal text whatever order the file or the request listed the keys in.
 *
 * Written in one pass into one string (no per-level arrays, closures or joins), a string that needs
 * no escape quoted without JSON.stringify: the verdict record digests three of these a call, and
 * this builder takes less than half the time of the map/join one it replaced, byte for byte the
 * same text (bench/record-cost.ts, docs/performance.md "The verdict record's cost"; the equality is
 * tested against that one in test/domain/rules/canonical-json.test.ts).
 * As JSON.stringify writes a value: a non-finite number, undefined, a function or a symbol in an
 * array or at the top is `null`; a member whose value is undefined is left out; a hole in an array
 * writes nothing between its commas (as `[].join` does).
 */
export function canonicalJson(value: unknown): string {
  if (typeof value === "object" && value !== null) {
    if (Array.isArray(value)) {
      let s = "[";
      for (let i = 0; i < value.length; i += 1) {
        if (i > 0) s += ",";
        if (i in value) s += canonicalJson(value[i]);
      }
      return `${s}]`;
    }
    const o = value as Record<string, unknown>;
    const keys = Object.keys(o).sort();
    let s = "{";
    for (const k of keys) {
      const v = o[k];
      if (v === undefined) continue;
      if (s.length > 1) s += ",";
      s += `${quoted(k)}:${canonicalJson(v)}`;
    }
    return `${s}}`;
  }
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "null";
  if (typeof value === "string") return quoted(value);
  const s = JSON.stringify(value);
  return s === undefined ? "null" : s;
}

/** sha256 of the rule set's canonical JSON, prefixed "sha256:". */
export function ruleSetHash(set: RuleSet): string {
  return `sha256:${sha256Hex(canonicalJson(set))}`;
}
