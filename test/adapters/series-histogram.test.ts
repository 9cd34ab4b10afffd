import { Histogram, Registry } from "prom-client";
import { describe, expect, it } from "vitest";
import { PROCEDURE_BUCKETS_S } from "../../adapters/http/metrics.js";
import { seriesHistogram } from "../../adapters/http/series-histogram.js";

/** a deterministic sequence in [0, 1) (no unseeded randomness in tests) */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe("seriesHistogram", () => {
  // Oracle: prom-client's own Histogram fed the same observations; the exposition text must match line for line.
  it("exposes exactly what prom-client's histogram exposes for the same observations", async () => {
    const oursRegistry = new Registry();
    const theirsRegistry = new Registry();
    const name = "t_duration_seconds";
    const help = "test histogram";
    const ours = seriesHistogram({ name, help, buckets: PROCEDURE_BUCKETS_S, registry: oursRegistry });
    const theirs = new Histogram({ name, help, labelNames: ["procedure", "outcome", "adapter"] as const, buckets: [...PROCEDURE_BUCKETS_S], registers: [theirsRegistry] });
    const labelSets = [
      { procedure: "operatingPoint", outcome: "solved", adapter: "v1" },
      { procedure: "review", outcome: "ok", adapter: "trpc" },
      { procedure: "operatingPoint", outcome: "invalid-input", adapter: "v1-bulk" },
    ];
    const series = labelSets.map((l) => ours.series(l));
    const next = lcg(7);
    for (let i = 0; i < 5000; i += 1) {
      const k = Math.floor(next() * labelSets.length);
      // values across every bucket, bounds themselves included (le is inclusive), and above the last
      const v = i % 97 === 0 ? (PROCEDURE_BUCKETS_S[i % PROCEDURE_BUCKETS_S.length] as number) : 10 ** (-4.5 + 6 * next());
      series[k]?.observe(v);
      theirs.observe(labelSets[k] as (typeof labelSets)[number], v);
    }
    expect(await oursRegistry.metrics()).toBe(await theirsRegistry.metrics());
    expect(await oursRegistry.getMetricsAsJSON()).toEqual(await theirsRegistry.getMetricsAsJSON());
  });

  it("lists a series only once observed, drops every series on reset, and refuses a non-finite value", async () => {
    const registry = new Registry();
    const h = seriesHistogram({ name: "t_seconds", help: "h", buckets: [0.1, 1], registry });
    const a = h.series({ k: "a" });
    h.series({ k: "b" });
    a.observe(0.5);
    let text = await registry.metrics();
    expect(text).toContain('t_seconds_bucket{le="0.1",k="a"} 0\nt_seconds_bucket{le="1",k="a"} 1\nt_seconds_bucket{le="+Inf",k="a"} 1\nt_seconds_sum{k="a"} 0.5\nt_seconds_count{k="a"} 1');
    expect(text).not.toContain('k="b"');
    registry.resetMetrics();
    expect(await registry.metrics()).not.toContain('k="a"');
    a.observe(2);
    text = await registry.metrics();
    expect(text).toContain('t_seconds_bucket{le="1",k="a"} 0\nt_seconds_bucket{le="+Inf",k="a"} 1\nt_seconds_sum{k="a"} 2\nt_seconds_count{k="a"} 1');
    expect(() => a.observe(Number.NaN)).toThrow(TypeError);
    expect(() => a.observe(Number.POSITIVE_INFINITY)).toThrow(TypeError);
  });
});
