import { TYPICAL } from "../helpers/stages.js";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { reviewOutput } from "../../contracts/review.js";
import { demoContext, postTrpc, testApp } from "../helpers/app.js";

type Verdict = { ruleId: string; outcome: string; notApplicableCode: string | null };
type Cand = {
  label: string;
  verdict: string;
  rules: { verdicts: Verdict[] };
  metrics: Record<string, number | boolean>;
};
type Out = { candidates: Cand[]; ranking: { index: number; verdict: string }[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};
const verdictOf = (c: Cand | undefined, id: string) => c?.rules.verdicts.find((v) => v.ruleId === id);

const base = {
  supply: { class: "vehicle-24v-f" },
  load: { kind: "constant-current", currentA: 10 },
  ambient: { minC: -40, maxC: 70 },
  transients: [],
};
const schottky = { stage: { kind: "catalog-part", partId: "demo-schottky-10a-60v" } };
const idealDiode = { stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" }, datasheetMax: TYPICAL };
const pfet = { stage: { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" }, datasheetMax: TYPICAL };

describe("design review", () => {
  // Common practice (docs/references.md, facts of the trade): a Schottky drops about 0.5 V at 10 A, several watts; an ideal
  // diode of a few milliohms dissipates a few hundred milliwatts.
  it("a Schottky fails on loss at 10 A where an ideal-diode stage passes", async () => {
    const r = await call({ requirement: { ...base, lossBudgetW: 2 }, candidates: [schottky, idealDiode] });
    expect(verdictOf(r.candidates[0], "loss-budget")?.outcome).toBe("fail");
    expect(verdictOf(r.candidates[1], "loss-budget")?.outcome).toBe("pass");
    expect(r.candidates[0]?.metrics["lossWorstW"]).toBeGreaterThan(3);
    expect(r.candidates[1]?.metrics["lossWorstW"]).toBeLessThan(0.6);
    expect(r.ranking[0]?.index).toBe(1);
  });

  it("a P-FET fails the reverse-current rule where sources are paralleled", async () => {
    const r = await call({
      requirement: { ...base, load: { kind: "constant-current", currentA: 3 }, parallelSources: true },
      candidates: [pfet, idealDiode],
    });
    expect(verdictOf(r.candidates[0], "reverse-current-blocking")?.outcome).toBe("fail");
    expect(verdictOf(r.candidates[1], "reverse-current-blocking")?.outcome).toBe("pass");
    expect(r.candidates[0]?.verdict).toBe("fail");
  });

  it("a budget the requirement does not set puts its rule out of scope, not in doubt", async () => {
    const r = await call({
      requirement: { ...base, load: { kind: "constant-current", currentA: 3 } },
      candidates: [idealDiode],
    });
    expect(verdictOf(r.candidates[0], "standby-quiescent")?.notApplicableCode).toBe("not-required");
    expect(r.candidates[0]?.verdict).not.toBe("incomplete");
  });

  it("the example review is deterministic and matches the output contract", async () => {
    const line = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
      input: unknown;
    };
    const a = JSON.stringify(await call(line.input));
    const b = JSON.stringify(await call(line.input));
    expect(a).toBe(b);
    expect(reviewOutput.safeParse(JSON.parse(a)).success).toBe(true);
  });

  // Consistency, by construction of the default (100 %) and vehicle (90 %) transient rules in
  // rulesets/: the clamp window sized by the review is the one the rule set then accepts.
  it("sizes the clamp window to the rule set's transient allowance, and a clamp at its edge passes", async () => {
    type Tr = { pulseId: string; clamp: { needed: unknown; clampMaxV?: number } };
    const req12 = {
      supply: { class: "vehicle-12v-b" },
      load: { kind: "constant-current", currentA: 3 },
      ambient: { minC: -40, maxC: 85 },
      transients: ["iso7637-2-pulse-1-12v"],
    };
    const windowOf = async (extra: Record<string, unknown>, ruleSet?: string) => {
      const r = await call({
        requirement: { ...req12, ...extra },
        candidates: [idealDiode],
        ...(ruleSet ? { ruleSet } : {}),
      });
      const t = (r.candidates[0] as unknown as { transients: Tr[] }).transients[0];
      return t?.clamp.clampMaxV;
    };
    const held = 13.5; // nominal supply held at the output (vehicle-12v-b)
    // The tighter rule is the breakdown at the coldest ambient (fet-vds-reverse-transient-cold):
    // 60 V·(1 + 0.001·(−40 − 25)) = 56.1 V at the default +0.1 %/K (closed form of the linear coefficient).
    const coldV = 60 * (1 + 0.001 * (-40 - 25));
    expect(await windowOf({})).toBeCloseTo(coldV - held, 9);
    expect(await windowOf({}, "vehicle")).toBeCloseTo(0.9 * coldV - held, 9);
    expect(await windowOf({ deratingFactor: 0.8 })).toBeCloseTo(0.8 * 60 - held, 9);
    // At a 25 °C lowest ambient the cold rule is the rating itself.
    expect(await windowOf({ ambient: { minC: 25, maxC: 85 } })).toBeCloseTo(60 - held, 9);
    const clampV = coldV - held;
    const r = await call({
      requirement: { ...req12, inputClamp: { standoffV: 16, clampV } },
      candidates: [idealDiode],
    });
    expect(verdictOf(r.candidates[0], "fet-vds-reverse-transient")?.outcome).toBe("pass");
    expect(verdictOf(r.candidates[0], "fet-vds-reverse-transient-cold")?.outcome).toBe("pass");
  });

  const { app } = testApp();
  const bad: [string, unknown, string][] = [
    [
      "min above max",
      {
        requirement: { ...base, supply: { class: "custom", minV: 30, nominalV: 24, maxV: 20 } },
        candidates: [idealDiode],
      },
      "requirement.supply.minV",
    ],
    [
      "ambient min above max",
      { requirement: { ...base, ambient: { minC: 90, maxC: 20 } }, candidates: [idealDiode] },
      "requirement.ambient.minC",
    ],
    ["an empty candidate list", { requirement: base, candidates: [] }, "candidates"],
    [
      "a profile whose time does not increase",
      {
        requirement: {
          ...base,
          startProfile: [
            { timeS: 0, voltageV: 24 },
            { timeS: 0.1, voltageV: 12 },
            { timeS: 0.1, voltageV: 24 },
          ],
        },
        candidates: [idealDiode],
      },
      "requirement.startProfile.2.timeS",
    ],
    [
      "an unknown supply class",
      { requirement: { ...base, supply: { class: "moon-base" } }, candidates: [idealDiode] },
      "requirement.supply.class",
    ],
    [
      "an unknown transient",
      { requirement: { ...base, transients: ["no-such-pulse"] }, candidates: [idealDiode] },
      "requirement.transients.0",
    ],
  ];
  it.each(bad)("rejects %s with 400 naming the field", async (_what, input, path) => {
    const r = await postTrpc(app, "review", input);
    expect(r.status).toBe(400);
    const issues = (r.body as { error: { data: { backstop: { issues: { path: (string | number)[] }[] } } } }).error.data
      .backstop.issues;
    expect(issues.map((i) => i.path.join("."))).toContain(path);
  });
});
