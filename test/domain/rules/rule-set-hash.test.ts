import { createHash } from "node:crypto";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import defaultSet from "../../../rulesets/default.json" with { type: "json" };
import { builtInRuleSets } from "../../../domain/rules/built-in-sets.js";
import { compileRuleSet } from "../../../domain/rules/compile-rule-set.js";
import { evaluateRuleSet } from "../../../domain/rules/evaluate-rules.js";
import type { RuleSet } from "../../../domain/rules/rule-model.js";
import { canonicalJson, ruleSetHash } from "../../../domain/rules/rule-set-hash.js";
import { sha256Hex } from "../../../domain/rules/sha256.js";

describe("sha256 (pure)", () => {
  it("matches the FIPS 180-2 example vectors", () => {
    // FIPS 180-2 appendix B.1 and B.2, and the empty message.
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq")).toBe(
      "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1",
    );
    expect(sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  });
  it("matches node:crypto on arbitrary text (oracle), including multi-byte UTF-8 and block boundaries", () => {
    fc.assert(
      fc.property(
        fc.string({ unit: "binary", maxLength: 300 }),
        (s) => sha256Hex(s) === createHash("sha256").update(s, "utf8").digest("hex"),
      ),
      { numRuns: 300, seed: 7 },
    );
    for (const n of [55, 56, 63, 64, 65, 119, 120])
      expect(sha256Hex("x".repeat(n))).toBe(createHash("sha256").update("x".repeat(n)).digest("hex"));
  });
});

describe("rule-set hash", () => {
  const base = defaultSet as unknown as RuleSet;
  it("canonical JSON does not depend on key order", () => {
    expect(canonicalJson({ b: 1, a: [{ d: 2, c: 3 }] })).toBe('{"a":[{"c":3,"d":2}],"b":1}');
    const reordered = Object.fromEntries(Object.entries(base).reverse()) as unknown as RuleSet;
    expect(ruleSetHash(reordered)).toBe(ruleSetHash(base));
  });
  it("changes when one character of the set changes (expression, rationale, version)", () => {
    const h = ruleSetHash(base);
    const [first, ...rest] = base.rules;
    if (!first) throw new Error("empty set");
    const variants: RuleSet[] = [
      { ...base, rules: [{ ...first, expression: first.expression.replace("<=", "< ") }, ...rest] },
      { ...base, rules: [{ ...first, rationale: `${first.rationale.slice(0, -1)}!` }, ...rest] },
      { ...base, version: "1.0.1" },
    ];
    for (const v of variants) expect(ruleSetHash(v)).not.toBe(h);
  });
  it("the stamp on the built-in default set equals the hash of the file's content", () => {
    const set = builtInRuleSets()[0];
    expect(set?.stamp.hash).toBe(`sha256:${createHash("sha256").update(canonicalJson(defaultSet)).digest("hex")}`);
  });
});

describe("determinism", () => {
  it("the same set and metrics give byte-identical verdicts, across fresh compilations", () => {
    const input = {
      stageKind: "nfet-ideal-diode",
      metrics: {
        tjWorstC: 131.25,
        loadVMinV: 11.2,
        loadMinV: 10,
        supplyMinV: 6,
        supplyMaxV: 16,
        startVoltageV: 2.8,
        reverseVMaxV: 14,
        reverseTransientVMaxV: 39,
        parallelSources: true,
        blocksReverseCurrent: true,
        quiescentA: 80e-6,
        standbyBudgetA: 100e-6,
      },
      part: { tjMaxC: 175, vdsMaxV: 60, maxInputV: 60 },
    };
    const set = builtInRuleSets()[1];
    if (!set) throw new Error("no vehicle set");
    const a = JSON.stringify(evaluateRuleSet(set, input));
    const again = compileRuleSet(set.set);
    if (!again.ok) throw new Error("recompile failed");
    const b = JSON.stringify(
      evaluateRuleSet(again.compiled, {
        ...input,
        metrics: Object.fromEntries(Object.entries(input.metrics).reverse()),
      }),
    );
    expect(b).toBe(a);
  });
});
