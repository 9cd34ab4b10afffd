import { describe, expect, it } from "vitest";
import { testApp } from "../helpers/app.js";

/**
 * The rule-expression attack list (test/domain/rules/sandbox.test.ts) and more, sent as inline rule
 * sets to rules.evaluate over /v1 and /trpc: each is a 400 invalid-rule-set naming the rule's
 * expression (or precondition) path (one over a size limit: a 422 limit-exceeded naming the limit),
 * nothing leaks into the process, and the server still answers.
 */
const { app, logs } = testApp();
const metrics = { tjWorstC: 96.4, lossWorstW: 0.12, dropWorstV: 0.04, parallelSources: false };
const part = { tjMaxC: 175 };

/** attacks over a size limit (contracts/limits.ts), with the limit each one names */
const OVER_A_LIMIT = new Map([
  [`${"tjWorstC + ".repeat(100_000)}1 <= 0`, "BACKSTOP_MAX_EXPRESSION_CHARS"],
  [
    `min(${Array(16)
      .fill(`max(${Array(16).fill("1").join(",")})`)
      .join(",")}) <= 1`,
    "BACKSTOP_MAX_EXPRESSION_NODES",
  ],
]);

const ATTACKS = [
  // the sandbox unit test's list
  "tjWorstC.constructor",
  "constructor(1) <= 1",
  "part.__proto__ <= 1",
  'part["tjMaxC"] <= 1',
  'abs.constructor("return 1") <= 1',
  "import({a: 1}) == 1",
  'createUnit("foo") == 1',
  'evaluate("1+1") == 2',
  'tjWorstC <= parse("1")',
  'simplify("x") == derivative("x", "x")',
  "f(x) = x + 1",
  "g(x) = (f(y) = y) (x)",
  "tjWorstC = 3",
  "tjWorstC <= 1; tjWorstC <= 2",
  "tjWorstC <= 5 furlong",
  "dropWorstV to mV <= 1",
  "tjWorstC <= limitC",
  "tjWorstC <= part.tjMaxx",
  "part <= 1",
  'tjWorstC == "hot"',
  "max([1, 2]) <= 3",
  "{a: 1} == 1",
  "1:3 == 1",
  "1 < tjWorstC < 3",
  "tjWorstC - 100",
  "tjWorstC <= ",
  "tjWorstC and lossWorstW",
  "parallelSources + 1 > 0",
  ...OVER_A_LIMIT.keys(),
  `${"(".repeat(500)}tjWorstC${")".repeat(500)} <= 1`,
  `${"-".repeat(400)}tjWorstC <= 1`,
  // more found for the HTTP surface
  'constructor.constructor("return process")() == 1',
  "tjWorstC.constructor.constructor == 1",
  "__proto__.polluted == 1",
  "toString() == 1",
  "valueOf <= 1",
  "hasOwnProperty(1) == 1",
  "process.exit(1) == 1",
  'require("fs") == 1',
  'eval("1") == 1',
  'Function("return 1") == 1',
  "this == 1",
  "config({number: 1}) == 1",
  'help("sqrt") == 1',
  "chain(1) == 1",
  "compile == 1",
  "reviver == 1",
  "typeOf(1) == 1",
  "pi.constructor <= 1",
  "part.tjMaxC.constructor <= 1",
  "part.constructor <= 1",
  "part.toString <= 1",
  "e[1] <= 1",
  "tjWorstC[0] <= 1",
  "tjWorstC'' <= 1",
  "tjWorstC <= 1 ? 2 : 3",
  "`1` <= 1",
  ["$", "{tjWorstC} <= 1"].join(""), // a template placeholder
  "tjWorstC <= 1\u0000",
  "tj\u0057orstC <= 1 and tjWorstC.a",
  "",
  " ",
  "\n",
];

function inline(expression: string, when?: string) {
  return {
    stageKind: "nfet-ideal-diode",
    metrics,
    part,
    ruleSet: {
      id: "attack",
      version: "1",
      description: "attack",
      rules: [
        {
          id: "a",
          title: "a",
          appliesTo: "all",
          ...(when === undefined ? {} : { when }),
          expression,
          severity: "fail",
          source: "test",
          rationale: "test",
        },
      ],
    },
  };
}
const post = (path: string, body: unknown) =>
  app.request(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });

describe("sandbox attacks over HTTP (rules.evaluate with an inline rule set)", () => {
  it.each(ATTACKS.map((a, i) => [i, a.length > 60 ? `${a.slice(0, 60)}… (${a.length} chars)` : a, a] as const))(
    "attack %i: %s",
    async (_i, _label, attack) => {
      for (const [where, body] of [
        ["expression", inline(attack)],
        ["when", inline("tjWorstC <= 150", attack)],
      ] as const) {
        const v1 = await post("/v1/rules.evaluate", body);
        const problem = (await v1.json()) as { code: string; issues: { path: (string | number)[]; message: string }[] };
        const limit = OVER_A_LIMIT.get(attack);
        if (limit === undefined) {
          expect(v1.status, JSON.stringify(problem).slice(0, 300)).toBe(400);
          expect(["invalid-rule-set", "invalid-input"]).toContain(problem.code);
        } else {
          expect(v1.status, JSON.stringify(problem).slice(0, 300)).toBe(422);
          expect(problem.code).toBe("limit-exceeded");
          expect(problem.issues.every((i) => i.message.endsWith(`(limit ${limit})`))).toBe(true);
        }
        expect(problem.issues.some((i) => i.path.join(".") === `ruleSet.rules.0.${where}`)).toBe(true);
        const trpc = await post("/trpc/rules.evaluate", body);
        expect(trpc.status).toBe(limit === undefined ? 400 : 422);
        const t = (await trpc.json()) as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } };
        expect(t.error.data.backstop.issues.map((i) => i.path.join("."))).toContain(`ruleSet.rules.0.${where}`);
      }
    },
  );

  it("nothing leaked into the process and the server still answers", async () => {
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect((Object.prototype as unknown as Record<string, unknown>).polluted).toBeUndefined();
    const ok = await post("/v1/rules.evaluate", inline("tjWorstC <= part.tjMaxC - 25 K"));
    expect(ok.status).toBe(200);
    expect(((await ok.json()) as { result: { outcome: string } }).result.outcome).toBe("pass");
    expect(logs.filter((l) => /"level":50/.test(l))).toEqual([]);
  });

  it("a rule set named by a path or a prototype key is an unknown rule set, not a file read", async () => {
    for (const name of ["../../etc/passwd", "__proto__", "constructor", "default/../vehicle"]) {
      const r = await post("/v1/rules.evaluate", { stageKind: "nfet-ideal-diode", metrics, part, ruleSet: name });
      expect(r.status).toBe(400);
      expect(((await r.json()) as { code: string }).code).toBe("unknown-rule-set");
    }
  });
});
