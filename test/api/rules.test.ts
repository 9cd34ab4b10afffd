import { describe, expect, it } from "vitest";
import { operatingPointOutput } from "../../contracts/operating-point.js";
import { rulesEvaluateOutput, rulesListOutput, rulesShowOutput } from "../../contracts/rules.js";
import { postTrpc, testApp } from "../helpers/app.js";

type ErrBody = {
  error: {
    data: {
      httpStatus: number;
      backstop: { code: string; message: string; issues: { path: (string | number)[]; message: string }[] };
    };
  };
};
const dataOf = (r: { body: Record<string, unknown> }) => (r.body as { result: { data: unknown } }).result.data;

const opPoint = {
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: "12 V",
  load: { kind: "constant-current", currentA: 3 },
  ambientC: 85,
};

describe("rules procedures over HTTP (tRPC)", () => {
  const { app } = testApp();

  it("rules.list lists the built-in sets and the vocabulary", async () => {
    const r = await postTrpc(app, "rules.list", {});
    expect(r.status).toBe(200);
    const out = rulesListOutput.parse(dataOf(r));
    expect(out.ruleSets.map((s) => s.id)).toEqual(["default", "vehicle", "consumer"]);
    expect(out.metrics.map((m) => m.name)).toContain("tjWorstC");
    expect(out.partParameters.map((m) => m.name)).toContain("tjMaxC");
  });

  it("rules.show returns the set and its stamp; an unknown id is a 400 naming the field", async () => {
    const r = await postTrpc(app, "rules.show", { id: "consumer" });
    const out = rulesShowOutput.parse(dataOf(r));
    expect(out.ruleSet.basedOn).toBe("default");
    expect(out.stamp.hash).toMatch(/^sha256:/);
    const bad = await postTrpc(app, "rules.show", { id: "nope" });
    expect(bad.status).toBe(400);
    expect((bad.body as ErrBody).error.data.backstop).toMatchObject({
      code: "unknown-rule-set",
      issues: [{ path: ["id"] }],
    });
  });

  it("rules.evaluate gives verdicts with values, threshold and margin, stamped with the set", async () => {
    const r = await postTrpc(app, "rules.evaluate", {
      ruleSet: "default",
      stageKind: "schottky-diode",
      metrics: { tjWorstC: 130 },
      part: { tjMaxC: 150 },
    });
    const out = rulesEvaluateOutput.parse(dataOf(r));
    const tj = out.result.verdicts.find((v) => v.ruleId === "tj-margin");
    // 130 °C against 150 − 25 = 125 °C: warn, margin −5 K (hand computed).
    expect(tj).toMatchObject({
      outcome: "warn",
      threshold: 125,
      margin: -5,
      values: { tjWorstC: 130, "part.tjMaxC": 150 },
    });
    expect(out.result.outcome).toBe("warn");
  });

  it("rules.evaluate with an inline set whose rule is unsafe is a 400 naming the rule and the column", async () => {
    const set = {
      id: "acme",
      version: "1",
      description: "inline",
      rules: [
        {
          id: "sneaky",
          title: "t",
          appliesTo: "all",
          expression: "tjWorstC <= import(1)",
          severity: "fail",
          source: "s",
          rationale: "r",
        },
      ],
    };
    const r = await postTrpc(app, "rules.evaluate", { ruleSet: set, metrics: { tjWorstC: 1 } });
    expect(r.status).toBe(400);
    const body = (r.body as ErrBody).error.data.backstop;
    expect(body.code).toBe("invalid-rule-set");
    expect(body.issues).toEqual([
      {
        path: ["ruleSet", "rules", 0, "expression"],
        message: "rule sneaky, column 13: function 'import' is refused in the rules sandbox",
      },
    ]);
  });

  it("rules.evaluate refuses a metric outside the vocabulary, naming its path", async () => {
    const r = await postTrpc(app, "rules.evaluate", { ruleSet: "default", metrics: { tjWorstc: 1 } });
    expect(r.status).toBe(400);
    expect((r.body as ErrBody).error.data.backstop.issues[0]?.path).toEqual(["metrics", "tjWorstc"]);
  });

  it("operatingPoint returns verdicts on its own point when a rule set is named", async () => {
    const r = await postTrpc(app, "operatingPoint", {
      ...opPoint,
      ruleSet: "default",
      ruleMetrics: { reverseVMaxV: 14, parallelSources: true, holdUpRequired: false },
    });
    expect(r.status).toBe(200);
    const out = operatingPointOutput.parse(dataOf(r));
    if (out.outcome !== "solved") throw new Error(`expected solved, got ${out.outcome}`);
    const rules = out.rules;
    if (rules === undefined) throw new Error("no verdicts");
    const tj = rules.verdicts.find((v) => v.ruleId === "tj-limit");
    expect(tj?.values["tjWorstC"]).toBeCloseTo(out.point.tjC, 12);
    expect(tj?.threshold).toBe(tj?.values["part.tjMaxC"]);
    // 14 V steady reverse on the 45 V demo Schottky: threshold 0.8·45 = 36 V, margin 22 V (hand computed).
    const rev = rules.verdicts.find((v) => v.ruleId === "diode-reverse-steady");
    expect(rev).toMatchObject({ outcome: "pass", threshold: 36, margin: 22 });
    expect(rules.verdicts.find((v) => v.ruleId === "reverse-current-blocking")?.outcome).toBe("pass");
    expect(rules.verdicts.find((v) => v.ruleId === "fet-vds-reverse-steady")?.notApplicableCode).toBe("stage-kind");
  });

  it("operatingPoint refuses ruleMetrics that the point computes", async () => {
    const r = await postTrpc(app, "operatingPoint", { ...opPoint, ruleSet: "default", ruleMetrics: { tjWorstC: 20 } });
    expect(r.status).toBe(400);
    expect((r.body as ErrBody).error.data.backstop.issues[0]?.path).toEqual(["ruleMetrics", "tjWorstC"]);
  });

  it("without a point (thermal runaway) the temperature rules are not applicable with the cause, and the set is never 'pass'", async () => {
    const r = await postTrpc(app, "operatingPoint", {
      ...opPoint,
      load: { kind: "constant-current", currentA: 5 },
      thermal: { kind: "junction-ambient", rthJaKPerW: 400 },
      ruleSet: "default",
    });
    const out = operatingPointOutput.parse(dataOf(r));
    expect(out.outcome).not.toBe("solved");
    const tj = out.rules?.verdicts.find((v) => v.ruleId === "tj-limit");
    expect(tj?.outcome).toBe("not-applicable");
    expect(tj?.reason).toContain("no operating point");
    expect(out.rules?.outcome).not.toBe("pass");
  });
});
