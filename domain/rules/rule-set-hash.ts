import type { RuleSet } from "./rule-model.js";
import { sha256Hex } from "./sha256.js";

/**
 * Canonical JSON: object keys sorted by UTF-16 code unit order at every level, no whitespace,
 * arrays in order, undefined members dropped; numbers as JSON.stringify writes them. Equal
 * content gives equal text whatever order the file or the request listed the keys in.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    const s = JSON.stringify(value);
    return s === undefined ? "null" : s;
  }
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  const entries = Object.keys(value)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`);
  return `{${entries.join(",")}}`;
}

/** sha256 of the rule set's canonical JSON, prefixed "sha256:". */
export function ruleSetHash(set: RuleSet): string {
  return `sha256:${sha256Hex(canonicalJson(set))}`;
}
