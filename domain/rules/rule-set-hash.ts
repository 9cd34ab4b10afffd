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

/** Where canonical JSON goes piece by piece: `add` a piece; `end` once after the last. */
class Pieces {
  private text = "";
  /** `flush` takes the text gathered so far whenever it passes `flushAtChars`, and the rest at the end. */
  constructor(
    private readonly flush: (text: string) => void,
    private readonly flushAtChars: number,
  ) {}
  add(piece: string): void {
    this.text += piece;
    if (this.text.length >= this.flushAtChars) {
      this.flush(this.text);
      this.text = "";
    }
  }
  end(): void {
    this.flush(this.text);
    this.text = "";
  }
}

function write(value: unknown, out: Pieces): void {
  if (typeof value === "object" && value !== null) {
    if (Array.isArray(value)) {
      out.add("[");
      for (let i = 0; i < value.length; i += 1) {
        if (i > 0) out.add(",");
        if (i in value) write(value[i], out);
      }
      out.add("]");
      return;
    }
    const o = value as Record<string, unknown>;
    const keys = Object.keys(o).sort();
    out.add("{");
    let first = true;
    for (const k of keys) {
      const v = o[k];
      if (v === undefined) continue;
      out.add(first ? `${quoted(k)}:` : `,${quoted(k)}:`);
      first = false;
      write(v, out);
    }
    out.add("}");
    return;
  }
  if (typeof value === "number") out.add(Number.isFinite(value) ? String(value) : "null");
  else if (typeof value === "string") out.add(quoted(value));
  else {
    const s = JSON.stringify(value);
    out.add(s === undefined ? "null" : s);
  }
}

/**
 * Canonical JSON: object keys sorted by UTF-16 code unit order at every level, no whitespace,
 * arrays in order, undefined members dropped; numbers as JSON.stringify writes them. Equal
 * content gives equal text whatever order the file or the request listed the keys in.
 *
 * Written in one pass (no per-level arrays, closures or joins), a string that needs no escape
 * quoted without JSON.stringify, byte for byte the text of the map/join definition it replaced
 * (tested against it in test/domain/rules/canonical-json.test.ts). As JSON.stringify writes a
 * value: a non-finite number, undefined, a function or a symbol in an array or at the top is
 * `null`; a member whose value is undefined is left out; a hole in an array writes nothing between
 * its commas (as `[].join` does).
 */
export function canonicalJson(value: unknown): string {
  let text = "";
  const out = new Pieces((t) => {
    text += t;
  }, Number.POSITIVE_INFINITY);
  write(value, out);
  out.end();
  return text;
}

/**
 * The same canonical JSON handed to `sink` in pieces of about `pieceChars` characters (the last
 * one shorter, possibly empty), so that a digest of a large value never holds its whole text: a
 * review's answer runs to about a megabyte.
 */
export function canonicalJsonPieces(value: unknown, sink: (piece: string) => void, pieceChars = 16_384): void {
  const out = new Pieces(sink, pieceChars);
  write(value, out);
  out.end();
}

/** sha256 of the rule set's canonical JSON, prefixed "sha256:". */
export function ruleSetHash(set: RuleSet): string {
  return `sha256:${sha256Hex(canonicalJson(set))}`;
}
