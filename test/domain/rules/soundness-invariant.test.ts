import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../../adapters/batch/run-batch.js";
import { projectRoot } from "../../../adapters/project-root.js";
import { ANALYSIS_COMPUTES, RESULT_FLAGS } from "../../../domain/rules/computed-metrics.js";
import { builtInRuleSets } from "../../../domain/rules/built-in-sets.js";
import type { CompiledRuleSet } from "../../../domain/rules/compile-rule-set.js";
import {
  type MetricDef,
  METRIC_ROLES,
  METRICS,
  type NotAssessed,
  PART_NOT_ASSESSED,
  PART_PARAMETERS,
  STAGE_KIND_LIST,
} from "../../../domain/rules/metric-vocabulary.js";
import { demoContext } from "../../helpers/app.js";
import { KNOWN_BAD } from "../../known-bad/designs.js";

// The soundness invariant: a limit that a check computes is a limit a rule reads. Each analysis
// declares what it computes (domain/rules/computed-metrics.ts), each vocabulary metric its role and
// where it is deliberately not assessed (metric-vocabulary.ts); this walks them against every
// built-in rule set. (Common practice: a release gate must not pass what a computed figure shows
// destroyed.)

const sets = builtInRuleSets();
const kindsOf = (m: MetricDef) => (m.stageKinds === "all" ? STAGE_KIND_LIST : m.stageKinds);
const exempt = (na: NotAssessed | undefined, kind: string) =>
  na !== undefined && (na.stageKinds === "all" || na.stageKinds.includes(kind as never));

/** Rules of the set whose condition (not only the precondition) reads `name` and cover `kind`. */
function rulesReading(set: CompiledRuleSet, name: string, kind?: string) {
  return set.rules.filter(
    (c) =>
      c.expression.names.includes(name) &&
      (kind === undefined || c.rule.appliesTo === "all" || c.rule.appliesTo.includes(kind)),
  );
}

/** Every (set, metric, kind) where a computed limit is left unruled, as readable lines. */
function unruledLimits(): string[] {
  const out: string[] = [];
  for (const set of sets) {
    for (const m of METRICS) {
      const role = METRIC_ROLES[m.name];
      if (role?.role === "computed") {
        for (const k of kindsOf(m))
          if (!exempt(role.notAssessed, k) && rulesReading(set, m.name, k).length === 0)
            out.push(`${set.stamp.id}: ${m.name} is computed for ${k} and no rule reads it`);
      } else if (role?.role === "requirement" && !set.rules.some((c) => c.names.includes(m.name)))
        out.push(`${set.stamp.id}: requirement ${m.name} is read by no rule`);
    }
    for (const p of PART_PARAMETERS) {
      for (const k of kindsOf(p))
        if (!exempt(PART_NOT_ASSESSED[p.name], k) && rulesReading(set, `part.${p.name}`, k).length === 0)
          out.push(`${set.stamp.id}: part.${p.name} of ${k} is compared by no rule`);
    }
  }
  return out;
}

describe("soundness invariant: every computed limit is ruled", () => {
  it("every vocabulary metric declares its role, and only vocabulary metrics do", () => {
    expect(Object.keys(METRIC_ROLES).sort()).toEqual(METRICS.map((m) => m.name).sort());
    for (const [name, na] of Object.entries(PART_NOT_ASSESSED)) {
      expect(PART_PARAMETERS.map((p) => p.name)).toContain(name);
      expect(na.reason.length).toBeGreaterThan(20);
    }
    for (const r of Object.values(METRIC_ROLES))
      if (r.notAssessed) expect(r.notAssessed.reason.length).toBeGreaterThan(20);
  });

  it("each analysis declares only vocabulary names, and every computed metric is computed by some analysis", () => {
    const declared = new Set(Object.values(ANALYSIS_COMPUTES).flat());
    for (const n of declared) expect(METRIC_ROLES[n], `${n} is not in the vocabulary`).toBeDefined();
    for (const m of METRICS)
      if (METRIC_ROLES[m.name]?.role === "computed")
        expect(declared.has(m.name), `${m.name} is computed by no analysis`).toBe(true);
  });

  it("every computed metric is read by a rule of every built-in set for every stage kind it applies to (or is declared not assessed, with why)", () => {
    expect(unruledLimits()).toEqual([]);
  });

  // Every boolean a result carries is declared: the metric that takes its limit into the rules,
  // or why it is no limit. Walks the example requests and the known-bad designs.
  it("every boolean field of every result is declared in RESULT_FLAGS, and each names a vocabulary metric", async () => {
    const invoke = procedureInvoker(demoContext());
    const dir = join(projectRoot(), "examples", "requests");
    const cases = [
      "review",
      "turnOff",
      "holdUp",
      "oring",
      "batteryCharge",
      "bridgeDc",
      "bridgeAc",
      "operatingPoint",
    ].map((p) => JSON.parse(readFileSync(join(dir, `${p}.json`), "utf8")) as { procedure: string; input: unknown });
    for (const d of KNOWN_BAD)
      cases.push({ procedure: d.procedure, input: d.bad }, { procedure: d.procedure, input: d.twin });
    const unknown = new Set<string>();
    const vocabulary = new Set([...METRICS.map((m) => m.name), ...PART_PARAMETERS.map((p) => `part.${p.name}`)]);
    const walk = (o: unknown, inValues: boolean) => {
      if (Array.isArray(o)) for (const x of o) walk(x, inValues);
      else if (o !== null && typeof o === "object") {
        for (const [k, v] of Object.entries(o)) {
          if (typeof v === "boolean" && !inValues && !vocabulary.has(k) && RESULT_FLAGS[k] === undefined)
            unknown.add(k);
          walk(v, k === "values" || k === "metrics");
        }
      }
    };
    for (const c of cases) walk(await invoke(c.procedure)?.(c.input), false);
    expect([...unknown]).toEqual([]);
    for (const f of Object.values(RESULT_FLAGS)) if ("metric" in f) expect(METRIC_ROLES[f.metric]).toBeDefined();
  });

  it("the design review's rule input holds only what it declares it computes, requirement and stage metrics", async () => {
    const invoke = procedureInvoker(demoContext());
    const ex = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
      input: unknown;
    };
    const inputs = [ex.input, ...KNOWN_BAD.filter((d) => d.procedure === "review").flatMap((d) => [d.bad, d.twin])];
    for (const input of inputs) {
      const out = (await invoke("review")?.(input)) as { candidates: { metrics: Record<string, unknown> }[] };
      for (const c of out.candidates) {
        for (const n of Object.keys(c.metrics)) {
          const role = METRIC_ROLES[n]?.role;
          expect(
            role === "requirement" || role === "stage" || ANALYSIS_COMPUTES["review"]?.includes(n),
            `review puts ${n} in its rule input without declaring it`,
          ).toBe(true);
        }
      }
    }
  });
});
