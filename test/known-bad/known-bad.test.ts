import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { builtInRuleSets } from "../../domain/rules/built-in-sets.js";
import { demoContext } from "../helpers/app.js";
import { KNOWN_BAD, type KnownBad } from "./designs.js";

// Each known-bad design must fail under every built-in set where its hazard applies, with the
// named rule failing; its near twin must pass that rule and must not fail or be incomplete
// overall. The designs and the reason each is bad: test/known-bad/designs.ts.

interface Verdict {
  readonly ruleId: string;
  readonly outcome: string;
  readonly reason: string | null;
}
interface Judged {
  readonly verdict: string;
  readonly rules: readonly Verdict[];
}

const invoke = procedureInvoker(demoContext());
const SETS = builtInRuleSets().map((s) => s.stamp.id);

/** The verdict of the design's one candidate (stage) under a set, whatever the analysis. */
async function judge(d: KnownBad, input: Record<string, unknown>, set: string): Promise<Judged> {
  const call = invoke(d.procedure);
  if (call === undefined) throw new Error(`no procedure ${d.procedure}`);
  const out = (await call({ ...input, ruleSet: set })) as Record<string, unknown>;
  if (d.procedure === "review") {
    const c = (out["candidates"] as { verdict: string; rules: { verdicts: Verdict[] } }[])[0];
    if (c === undefined) throw new Error("no candidate");
    return { verdict: c.verdict, rules: c.rules.verdicts };
  }
  const rules = (d.procedure === "holdUp" ? (out["stages"] as { rules: unknown }[])[0]?.rules : out["rules"]) as {
    outcome: string;
    verdicts: Verdict[];
  };
  return { verdict: rules.outcome, rules: rules.verdicts };
}

async function judgeAll(d: KnownBad) {
  const sets = d.sets ?? SETS;
  return Promise.all(
    sets.map(async (set) => ({ set, bad: await judge(d, d.bad, set), twin: await judge(d, d.twin, set) })),
  );
}

describe("known-bad designs", () => {
  it("has at least 20 designs, each naming a rule every applicable set has", () => {
    expect(KNOWN_BAD.length).toBeGreaterThanOrEqual(20);
    expect(new Set(KNOWN_BAD.map((d) => d.id)).size).toBe(KNOWN_BAD.length);
    for (const d of KNOWN_BAD)
      for (const s of builtInRuleSets().filter((x) => (d.sets ?? SETS).includes(x.stamp.id)))
        expect(
          s.rules.map((r) => r.rule.id),
          `${s.stamp.id} lacks ${d.rule}`,
        ).toContain(d.rule);
  });
  describe.each(KNOWN_BAD.map((d) => [d.id, d] as const))("%s", (_id, d) => {
    it(`fails on ${d.rule} under every applicable set; its twin passes it`, async () => {
      for (const { set, bad, twin } of await judgeAll(d)) {
        const rb = bad.rules.find((v) => v.ruleId === d.rule);
        const rt = twin.rules.find((v) => v.ruleId === d.rule);
        expect(bad.verdict, `${set}: bad design's verdict`).toBe("fail");
        expect(rb?.outcome, `${set}: ${d.rule} on the bad design (${rb?.reason})`).toBe("fail");
        expect(rt?.outcome, `${set}: ${d.rule} on the twin (${rt?.reason})`).toBe("pass");
        const blocking = twin.rules.filter((v) => v.outcome === "fail").map((v) => `${v.ruleId}: ${v.reason}`);
        expect(blocking, `${set}: twin fails other rules`).toEqual([]);
        expect(["pass", "warn"], `${set}: twin's verdict ${twin.verdict}`).toContain(twin.verdict);
      }
    });
  });
});
