import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../../adapters/project-root.js";
import { callProcedure } from "../../../api/procedure-registry.js";
import { createHash } from "node:crypto";
import { sha256Of } from "../../../api/record/verdict-record.js";
import { canonicalJson, canonicalJsonPieces } from "../../../domain/rules/rule-set-hash.js";
import { demoContext } from "../../helpers/app.js";

// The map/join definition canonicalJson had before the one-pass builder (commit 59a9cc0), kept here
// word for word as the oracle: the rule-set hashes, the catalog stamps and the verdict records filed
// before the rewrite were computed with it, so the new text must be the same byte for byte.
function former(value: unknown): string {
  if (value === null || typeof value !== "object") {
    const s = JSON.stringify(value);
    return s === undefined ? "null" : s;
  }
  if (Array.isArray(value)) return `[${value.map(former).join(",")}]`;
  const entries = Object.keys(value)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${former((value as Record<string, unknown>)[k])}`);
  return `{${entries.join(",")}}`;
}

const root = projectRoot();
const jsonFiles = (dir: string) =>
  readdirSync(join(root, dir))
    .filter((f) => f.endsWith(".json"))
    .map((f) => ({ name: `${dir}/${f}`, value: JSON.parse(readFileSync(join(root, dir, f), "utf8")) as unknown }));

/** any UTF-16 code unit, lone surrogates and control characters included */
const codeUnit = fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c));
const text = fc.oneof(
  fc.string({ unit: codeUnit, maxLength: 12 }),
  fc.string({ unit: "grapheme", maxLength: 8 }),
  fc.string({ maxLength: 8 }),
  fc.constantFrom("", '"', "\\", "\u2028", "\u007f", "\ud83d\ude00", "\ud83d", "\ude00x", "é", "ℵ", "\u0000"),
);
const number = fc.oneof(
  fc.double(),
  fc.integer(),
  fc.constantFrom(-0, 0, 5e-324, 1e-7, 1e21, 1.7976931348623157e308, -1e-300, 2 ** 53 + 2, Number.NaN, Infinity),
);
const leaf = fc.oneof(number, text, fc.boolean(), fc.constant(null), fc.constant(undefined));
const { tree } = fc.letrec<{ tree: unknown }>((tie) => ({
  tree: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    leaf,
    fc.array(tie("tree"), { maxLength: 5 }),
    fc.dictionary(text, tie("tree"), { maxKeys: 6 }),
  ),
}));

describe("canonicalJson (one pass) writes the text its former map/join definition wrote", () => {
  it("on every example request and its answer (record included), the demo catalog, every rule set file", () => {
    const requests = jsonFiles("examples/requests");
    const files = [...requests, ...jsonFiles("examples/catalog"), ...jsonFiles("rulesets")];
    expect(files.map((f) => f.name)).toContain("rulesets/default.json");
    for (const f of files) expect(canonicalJson(f.value), f.name).toBe(former(f.value));
    const ctx = demoContext();
    for (const { name, value } of requests) {
      const r = value as { procedure: string; input: unknown };
      const answer = callProcedure(r.procedure, ctx, r.input);
      expect(answer, name).toBeTypeOf("object");
      expect(canonicalJson(answer), name).toBe(former(answer));
    }
  });

  it("on fuzzed values: unicode keys and strings, nested arrays, undefined members, -0, huge and tiny numbers", () => {
    fc.assert(
      fc.property(tree, (v) => canonicalJson(v) === former(v)),
      { numRuns: 2000, seed: 21 },
    );
  });

  it("on the edges JSON.stringify decides: undefined, functions and symbols, holes, non-finite numbers", () => {
    const sparse: unknown[] = [1];
    sparse[3] = 2;
    const cases: unknown[] = [
      undefined,
      () => 1,
      Symbol("s"),
      [undefined, () => 1, Symbol("s"), Number.NaN, -Infinity],
      { a: undefined, b: () => 1, c: Symbol("s"), d: -0, "": 0, é: 1, e: 2, "\ud800": 3, 10: 4, 9: 5 },
      sparse,
      new Date(0),
      [[[[]]], {}, [{}]],
      { nested: { z: [1, { y: undefined, x: "\u001f" }] } },
    ];
    for (const c of cases) expect(canonicalJson(c)).toBe(former(c));
    expect(canonicalJson({ b: [1, -0, 1e21], a: "\u2028\ud800" })).toBe('{"a":"\u2028\\ud800","b":[1,0,1e+21]}');
  });
});

describe("canonical JSON in pieces, as a large value's digest takes it", () => {
  const joined = (v: unknown, chars: number) => {
    const pieces: string[] = [];
    canonicalJsonPieces(v, (p) => pieces.push(p), chars);
    return pieces;
  };
  it("joins to the same text at any piece size", () => {
    fc.assert(
      fc.property(tree, fc.integer({ min: 1, max: 64 }), (v, chars) => joined(v, chars).join("") === canonicalJson(v)),
      { numRuns: 500, seed: 22 },
    );
  });
  it("digests a review's answer (hundreds of kB, many pieces) as the SHA-256 of its whole text (FIPS 180-4 through node:crypto)", () => {
    const review = JSON.parse(readFileSync(join(projectRoot(), "examples/requests/review.json"), "utf8")) as {
      input: unknown;
    };
    const answer = callProcedure("review", demoContext(), review.input);
    const text = canonicalJson(answer);
    expect(joined(answer, 16_384).length).toBeGreaterThan(2);
    expect(sha256Of(answer)).toBe(`sha256:${createHash("sha256").update(text).digest("hex")}`);
    expect(sha256Of({ small: 1 })).toBe(`sha256:${createHash("sha256").update('{"small":1}').digest("hex")}`);
  });
});
