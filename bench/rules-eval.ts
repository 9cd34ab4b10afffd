/**
 * Benchmark: evaluating a 20-rule set on one metric record, once compiled (records per second on
 * one core; the loop is single-threaded). Run: npm run bench:rules. Also times the same
 * expressions compiled by mathjs's own compile() for comparison (the sandbox does not use it).
 */
import { all, create } from "mathjs";
import { builtInRuleSets } from "../domain/rules/built-in-sets.js";
import { compileRuleSet } from "../domain/rules/compile-rule-set.js";
import { evaluateRuleSet } from "../domain/rules/evaluate-rules.js";
import type { Rule, RuleSet } from "../domain/rules/rule-model.js";

const base = builtInRuleSets()[0]?.set;
if (base === undefined) throw new Error("no default set");
const extra: Rule[] = [
  {
    id: "x-loss",
    title: "loss",
    appliesTo: "all",
    expression: "lossWorstW <= 2 W",
    severity: "warn",
    source: "bench",
    rationale: "bench rule",
  },
  {
    id: "x-drop",
    title: "drop",
    appliesTo: "all",
    expression: "dropWorstV <= max(0.05 * supplyMinV, 300 mV)",
    severity: "warn",
    source: "bench",
    rationale: "bench rule",
  },
  {
    id: "x-power",
    title: "power",
    appliesTo: "all",
    expression: "lossWorstW / (loadVMinV * 3) <= 0.02",
    severity: "warn",
    source: "bench",
    rationale: "bench rule",
  },
  {
    id: "x-combo",
    title: "combo",
    appliesTo: "all",
    expression: "(tjWorstC <= part.tjMaxC - 40 K) or (lossWorstW < 0.5 and dropWorstV < 0.1)",
    severity: "warn",
    source: "bench",
    rationale: "bench rule",
  },
];
// The target names a 20-rule set: the default set's first 16 rules and the 4 above.
const set: RuleSet = { ...base, id: "bench", rules: [...base.rules.slice(0, 16), ...extra] };
const compiled = compileRuleSet(set);
if (!compiled.ok) throw new Error("bench set does not compile");
const rules = compiled.compiled;

const input = {
  stageKind: "nfet-ideal-diode",
  metrics: {
    tjWorstC: 96.4,
    lossWorstW: 0.12,
    dropWorstV: 0.04,
    loadVMinV: 5.9,
    loadMinV: 4.5,
    supplyMinV: 6,
    supplyMaxV: 16,
    reverseVMaxV: 14,
    reverseTransientVMaxV: 40,
    transientVMaxV: 35,
    gateDriveMinV: 7,
    startVoltageV: 2.8,
    quiescentA: 8e-5,
    standbyBudgetA: 1e-4,
    blocksReverseCurrent: true,
    parallelSources: false,
    holdUpRequired: true,
  },
  part: { tjMaxC: 175, vdsMaxV: 60, vgsMaxV: 20, vgsOnV: 4.5, maxInputV: 65 },
};

/**
 * Records per second of f: the best of several timed rounds after a warm-up (the machine is shared
 * and noisy; the best round is the one least disturbed), with the median beside it.
 */
function time(label: string, n: number, f: () => void): number {
  for (let i = 0; i < Math.min(n, 20_000); i += 1) f();
  const rounds: number[] = [];
  for (let r = 0; r < 7; r += 1) {
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < n; i += 1) f();
    rounds.push(n / (Number(process.hrtime.bigint() - t0) / 1e9));
  }
  rounds.sort((a, b) => b - a);
  const best = rounds[0] ?? 0;
  const median = rounds[3] ?? 0;
  process.stdout.write(
    `${label}: ${Math.round(best).toLocaleString("en-US")} records/s best of 7 rounds (${(1e9 / best).toFixed(0)} ns per record; median ${Math.round(median).toLocaleString("en-US")})\n`,
  );
  return best;
}

let sink = 0;
const full = time(`evaluateRuleSet, ${rules.rules.length} rules, full verdicts`, 100_000, () => {
  sink += evaluateRuleSet(rules, input).counts.pass;
});
const tests = rules.rules
  .map((r) => ({
    test: r.expression.test,
    slots: r.expression.names.map((n) =>
      Number(
        n.startsWith("part.")
          ? input.part[n.slice(5) as keyof typeof input.part]
          : input.metrics[n as keyof typeof input.metrics],
      ),
    ),
  }))
  .filter((t) => t.slots.every(Number.isFinite));
const bare = time(`compiled conditions only, ${tests.length} rules`, 300_000, () => {
  for (const t of tests) if (t.test(t.slots)) sink += 1;
});
const math = create(all ?? {});
const present = new Set([...Object.keys(input.metrics), ...Object.keys(input.part).map((k) => `part.${k}`)]);
const mj = rules.rules
  .filter((r) => r.expression.names.every((n) => present.has(n)))
  .map((r) => math.compile(r.rule.expression));
const scope = { ...input.metrics, part: input.part, K: 1, W: 1, mV: 1e-3 };
const mathjs = time(`mathjs compile().evaluate, ${mj.length} rules (reference, not used)`, 10_000, () => {
  for (const c of mj) if (c.evaluate(scope)) sink += 1;
});
process.stdout.write(
  `${JSON.stringify({ rules: rules.rules.length, recordsPerSecondFullVerdicts: Math.round(full), recordsPerSecondConditionsOnly: Math.round(bare), recordsPerSecondMathjsEvaluate: Math.round(mathjs), target: 200_000, sink: sink > 0 })}\n`,
);
