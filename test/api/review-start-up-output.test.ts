import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { callProcedure } from "../../api/procedure-registry.js";
import { reviewOutput } from "../../contracts/review.js";
import { builtInRuleSets } from "../../domain/rules/built-in-sets.js";
import { demoContext } from "../helpers/app.js";

// The review answers each start-up profile's figures and its extreme samples; every sample only
// with `curves`. What the rules read is computed before the answer is shaped, so the rule results
// and metrics must be the same either way, and the default answer must be the full one minus the
// chart data (the samples, the sweeps, the turn-off waveform), nothing else.

const example = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
  input: Record<string, unknown>;
};
const ctx = demoContext();
type Rec = Record<string, unknown>;
const review = (input: Rec): Rec => callProcedure("review", ctx, input) as Rec;

// canonical JSON written out here (keys sorted at every level) and SHA-256 from node:crypto (FIPS 180-4)
function canonical(v: unknown): string {
  if (v === null || typeof v !== "object") return JSON.stringify(v) ?? "null";
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  const o = v as Rec;
  return `{${Object.keys(o)
    .filter((k) => o[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
    .join(",")}}`;
}
const sha = (v: unknown) => `sha256:${createHash("sha256").update(canonical(v)).digest("hex")}`;

/** The full answer without its chart data and record: what the default answer must be. */
function withoutChartData(a: Rec): Rec {
  const { record: _, ...rest } = JSON.parse(JSON.stringify(a)) as Rec;
  for (const c of rest.candidates as Rec[]) {
    delete c.curves;
    const event = (c.turnOff as { event?: Rec } | undefined)?.event;
    if (event !== undefined) delete event.waveform;
    for (const p of (c.startUp as { profiles: { result: Rec }[] }).profiles) delete p.result.samples;
  }
  return rest;
}

describe("review: start-up profile samples only with curves", () => {
  const sets = builtInRuleSets().map((s) => s.stamp.id);

  it.each(sets)(
    "rule set %s: the same rules and metrics, and the default answer is the full one minus chart data",
    (id) => {
      const summary = review({ ...example.input, ruleSet: id, curves: false });
      const full = review({ ...example.input, ruleSet: id, curves: true });
      const cs = summary.candidates as Rec[];
      const cf = full.candidates as Rec[];
      expect(cs.length).toBeGreaterThan(1);
      cs.forEach((c, i) => {
        expect((c.rules as { ruleSet: { id: string } }).ruleSet.id).toBe(id);
        expect(c.rules).toEqual(cf[i]?.rules);
        expect(c.metrics).toEqual(cf[i]?.metrics);
        expect(c.verdict).toBe(cf[i]?.verdict);
      });
      expect(summary.ranking).toEqual(full.ranking);
      const { record: _, ...rest } = JSON.parse(JSON.stringify(summary)) as Rec;
      expect(rest).toEqual(withoutChartData(full));
    },
  );

  it("each profile keeps its figures, its sample count and its first lowest-load and hottest samples", () => {
    const full = reviewOutput.parse(review({ ...example.input, curves: true }));
    const summary = reviewOutput.parse(review(example.input));
    let profiles = 0;
    full.candidates.forEach((c, i) => {
      c.startUp.profiles.forEach((p, j) => {
        profiles += 1;
        const samples = p.result.samples ?? [];
        const s = summary.candidates[i]?.startUp.profiles[j]?.result;
        expect(s?.samples).toBeUndefined();
        expect(s?.sampleCount).toBe(samples.length);
        expect(s?.minLoadV).toBe(Math.min(...samples.map((x) => x.loadV)));
        expect(s?.maxTjC).toBe(Math.max(...samples.map((x) => x.tjC)));
        expect(s?.lowestLoad).toEqual(samples.find((x) => x.loadV === s?.minLoadV));
        expect(s?.hottest).toEqual(samples.find((x) => x.tjC === s?.maxTjC));
      });
    });
    expect(profiles).toBeGreaterThan(1);
    // the example's profile is two cranks of a built-in profile: hundreds of samples each
    expect(full.candidates[0]?.startUp.profiles[0]?.result.samples?.length).toBeGreaterThan(100);
  });

  it("the record's result digest covers the answer as sent, in both forms", () => {
    const digests = [false, true].map((curves) => {
      const sent = JSON.parse(JSON.stringify(review({ ...example.input, curves }))) as Rec;
      const { record, ...rest } = sent;
      expect((record as Rec).resultSha256).toBe(sha(rest));
      return (record as Rec).resultSha256;
    });
    expect(digests[0]).not.toBe(digests[1]);
  });

  it("the default answer of the example is under 40 % of the full one", () => {
    const size = (a: Rec) => JSON.stringify(a).length;
    const summary = review(example.input);
    const full = review({ ...example.input, curves: true });
    expect(size(summary) / size(full)).toBeLessThan(0.4);
  });
});
