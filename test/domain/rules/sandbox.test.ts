import { describe, expect, it } from "vitest";
import { COMPILE_CACHE_LIMITS, compileCacheSize, compileExpression } from "../../../domain/rules/sandbox.js";
import { EXPRESSION_LIMITS } from "../../../domain/rules/sandbox-whitelist.js";

const refused = (text: string) => {
  const out = compileExpression(text);
  if (out.ok) throw new Error(`expected '${text.slice(0, 60)}' to be refused`);
  return out.error;
};
const compiled = (text: string) => {
  const out = compileExpression(text);
  if (!out.ok) throw new Error(`expected '${text}' to compile: ${out.error.message}`);
  return out.compiled;
};

describe("sandbox: the attack list is refused with a clear error and position", () => {
  const cases: readonly (readonly [string, string, RegExp, number])[] = [
    ["constructor on a metric", "tjWorstC.constructor", /property access/, 1],
    ["constructor as a name", "constructor(1) <= 1", /'constructor' .*refused|not allowed/, 1],
    ["__proto__ on part", "part.__proto__ <= 1", /part\.__proto__/, 6],
    ["bracket property on part", 'part["tjMaxC"] <= 1', /property access/, 1],
    [
      "constructor chain through a function",
      'abs.constructor("return 1") <= 1',
      /only calls of the whitelisted functions/,
      16,
    ],
    ["import", "import({a: 1}) == 1", /function 'import'.*refused/, 1],
    ["createUnit", 'createUnit("foo") == 1', /function 'createUnit'.*refused/, 1],
    ["evaluate", 'evaluate("1+1") == 2', /function 'evaluate'.*refused/, 1],
    ["parse", 'tjWorstC <= parse("1")', /function 'parse'.*refused/, 13],
    ["compile / simplify / derivative / resolve", 'simplify("x") == derivative("x", "x")', /function 'simplify'/, 1],
    ["function definition", "f(x) = x + 1", /function definitions/, 6],
    ["nested function definition", "g(x) = (f(y) = y) (x)", /function definitions/, 6],
    ["assignment", "tjWorstC = 3", /assignment/, 10],
    ["two statements", "tjWorstC <= 1; tjWorstC <= 2", /only one expression/, 14],
    ["unit creation through a unit literal", "tjWorstC <= 5 furlong", /unknown name 'furlong'/, 15],
    ["unit conversion", "dropWorstV to mV <= 1", /operator 'to'/, 12],
    ["undefined name", "tjWorstC <= limitC", /unknown name 'limitC'/, 13],
    ["unknown part parameter", "tjWorstC <= part.tjMaxx", /unknown part parameter 'part.tjMaxx'/, 13],
    ["bare part", "part <= 1", /part\.<parameter>|followed by a parameter/, 1],
    ["string constant", 'tjWorstC == "hot"', /constants/, 13],
    ["matrix", "max([1, 2]) <= 3", /array syntax/, 5],
    ["object", "{a: 1} == 1", /object syntax/, 1],
    ["range", "1:3 == 1", /range syntax/, 2],
    ["chained comparison", "1 < tjWorstC < 3", /chained comparisons/, 3],
    ["a number, not a condition", "tjWorstC - 100", /must be a condition/, 1],
    ["syntax error", "tjWorstC <= ", /Unexpected end|Value expected/, 13],
    ["type mix: logic on numbers", "tjWorstC and lossWorstW", /needs a condition/, 10],
    ["type mix: arithmetic on a boolean", "parallelSources + 1 > 0", /needs a number/, 17],
  ];
  it.each(cases)("%s", (_label, text, message, column) => {
    const e = refused(text);
    expect(e.message).toMatch(message);
    expect(e.column).toBe(column);
  });

  it("a 1 MB expression is refused by length before it is parsed", () => {
    const big = `${"tjWorstC + ".repeat(100_000)}1 <= 0`;
    expect(big.length).toBeGreaterThan(1_000_000);
    const e = refused(big);
    expect(e.code).toBe("too-long");
    expect(e.message).toContain(`limit is ${EXPRESSION_LIMITS.maxLength}`);
  });
  it("a deeply nested expression is refused without overflowing the stack", () => {
    const deep = `${"(".repeat(500)}tjWorstC${")".repeat(500)} <= 1`;
    const e = refused(deep);
    expect(e.code).toBe("too-deep");
    expect(e.column).toBe(EXPRESSION_LIMITS.maxBracketDepth + 1);
  });
  it("a long chain of unary minus (deep without brackets) is refused by the depth limit", () => {
    const e = refused(`${"-".repeat(400)}tjWorstC <= 1`);
    expect(e.code).toBe("too-deep");
  });
  it("too many nodes is refused", () => {
    // 1 comparison + 1 min + 16 × (1 max + 16 constants) + 1 constant = 275 nodes, depth 4.
    const inner = `max(${Array(16).fill("1").join(",")})`;
    const wide = `min(${Array(16).fill(inner).join(",")}) <= 1`;
    expect(wide.length).toBeLessThan(EXPRESSION_LIMITS.maxLength);
    const e = refused(wide);
    expect(e.code).toBe("too-many-nodes");
  });
  it("the size limits a call gives hold, a cached text included (a deployment may set them: contracts/limits.ts)", () => {
    const text = "tjWorstC <= part.tjMaxC - 25 K";
    expect(compileExpression(text).ok).toBe(true); // cached under the defaults
    const short = compileExpression(text, { maxLength: text.length - 1, maxNodes: 256 });
    expect(short.ok ? undefined : short.error.code).toBe("too-long");
    const few = compileExpression(text, { maxLength: 2000, maxNodes: 3 });
    expect(few.ok ? undefined : few.error).toEqual({
      code: "too-many-nodes",
      message: "expression has more than 3 syntax nodes",
      column: 1,
    });
    const fresh = compileExpression("tjWorstC <= part.tjMaxC - 30 K", { maxLength: 2000, maxNodes: 3 }); // not cached
    expect(fresh.ok ? undefined : fresh.error.code).toBe("too-many-nodes");
    expect(compileExpression(text, { maxLength: text.length, maxNodes: 256 }).ok).toBe(true);
  });
});

describe("sandbox: what is allowed", () => {
  it("reads metrics and part parameters in order of first use, and compiles to the same truth as the formula", () => {
    const c = compiled("tjWorstC <= part.tjMaxC - 25 K and not (lossWorstW > 2)");
    expect(c.names).toEqual(["tjWorstC", "part.tjMaxC", "lossWorstW"]);
    expect(c.test([120, 150, 1])).toBe(true);
    expect(c.test([126, 150, 1])).toBe(false);
    expect(c.test([120, 150, 3])).toBe(false);
    expect(c.comparison).toBeNull();
  });
  it("unit symbols are SI scales: 500 mV is 0.5 and 100 uA is 1e-4", () => {
    const c = compiled("dropWorstV <= 500 mV");
    expect(c.comparison?.rhs([])).toBe(0.5);
    expect(compiled("quiescentA <= 100 uA").comparison?.rhs([])).toBeCloseTo(1e-4, 18);
  });
  it("min, max, abs, sqrt, exp, log, log10 and the conditional evaluate as Math does", () => {
    const c = compiled("max(dropWorstV, abs(-2), sqrt(16)) + log(exp(1)) + log10(100) + log(8, 2) == 10");
    expect(c.test([0.3])).toBe(true); // 4 + 1 + 2 + 3 = 10
    expect(compiled("(parallelSources ? 1 : 2) == 2").test([0])).toBe(true);
  });
  it("a top-level comparison keeps both sides for threshold and margin", () => {
    const c = compiled("(loadVMinV >= 1.05 * loadMinV)");
    expect(c.comparison?.op).toBe(">=");
    expect(c.comparison?.bound).toBe("lower");
    expect(c.comparison?.rhs([11, 10])).toBeCloseTo(10.5, 14);
  });
  it("the cache returns the same compiled object for the same text", () => {
    expect(compileExpression("tjWorstC <= 100")).toBe(compileExpression("tjWorstC <= 100"));
  });
  it("refused texts are not cached, and the cache stays inside its entry and byte bounds", () => {
    const before = compileCacheSize().entries;
    for (let i = 0; i < 50; i += 1) expect(compileExpression(`tjWorstC <= 1${"0".repeat(2000)}${i}`).ok).toBe(false); // too long
    for (let i = 0; i < 50; i += 1) expect(compileExpression(`tjWorstC <=> ${i}`).ok).toBe(false); // syntax
    expect(compileCacheSize().entries).toBe(before);
    for (let i = 0; i < COMPILE_CACHE_LIMITS.maxEntries + 10; i += 1)
      compileExpression(`tjWorstC <= ${i} + ${"1 + ".repeat(i % 40)}1`);
    const after = compileCacheSize();
    expect(after.entries).toBeLessThanOrEqual(COMPILE_CACHE_LIMITS.maxEntries);
    expect(after.bytes).toBeLessThanOrEqual(COMPILE_CACHE_LIMITS.maxBytes);
    expect(after.entries).toBeGreaterThan(0);
  });
});
