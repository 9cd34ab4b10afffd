import type { Registry } from "prom-client";

export interface SeriesHistogramOptions {
  readonly name: string;
  readonly help: string;
  /** upper bounds, ascending (the +Inf bucket is implied) */
  readonly buckets: readonly number[];
  readonly registry: Registry;
}

/** One labelled series: observing costs a bucket search and three additions. */
export interface HistogramSeries {
  observe(value: number): void;
}

interface SeriesState {
  readonly labels: Readonly<Record<string, string>>;
  /** observations per bucket (not cumulative); index buckets.length is above the last bound */
  readonly counts: Float64Array;
  sum: number;
  count: number;
  /** the reset generation the series was last listed in */
  generation: number;
}

/**
 * A Prometheus histogram whose labelled series are handed out once and then observed directly.
 * prom-client's own histogram validates and hashes the label set on every observation, even through
 * a series it handed out (a few microseconds, on every call of every bulk item). This one registers
 * in the same prom-client registry and exposes the same text: test/adapters/series-histogram.test.ts
 * checks it line for line against prom-client's histogram fed the same observations.
 */
export function seriesHistogram(o: SeriesHistogramOptions): { series(labels: Readonly<Record<string, string>>): HistogramSeries } {
  const bounds = [...o.buckets];
  for (let i = 1; i < bounds.length; i += 1) if (!((bounds[i] as number) > (bounds[i - 1] as number))) throw new Error(`${o.name}: bucket bounds must ascend`);
  let all: SeriesState[] = [];
  let generation = 0;

  const exportValues = () => {
    const values: { labels: Record<string, string | number>; sharedLabels: Readonly<Record<string, string>>; value: number; metricName: string }[] = [];
    for (const s of all) {
      let cumulative = 0;
      for (let i = 0; i < bounds.length; i += 1) {
        cumulative += s.counts[i] as number;
        values.push({ labels: { le: bounds[i] as number }, sharedLabels: s.labels, value: cumulative, metricName: `${o.name}_bucket` });
      }
      values.push({ labels: { le: "+Inf" }, sharedLabels: s.labels, value: s.count, metricName: `${o.name}_bucket` });
      values.push({ labels: {}, sharedLabels: s.labels, value: s.sum, metricName: `${o.name}_sum` });
      values.push({ labels: {}, sharedLabels: s.labels, value: s.count, metricName: `${o.name}_count` });
    }
    return values;
  };
  const metric = {
    name: o.name,
    help: o.help,
    type: "histogram",
    aggregator: "sum",
    getForPromString: async () => ({ name: o.name, help: o.help, type: "histogram", values: exportValues(), aggregator: "sum" }),
    get: async () => ({
      name: o.name,
      help: o.help,
      type: "histogram",
      // as prom-client's: bucket lines carry a null exemplar, the sum and count lines none
      values: exportValues().map((v) => ({ value: v.value, metricName: v.metricName, exemplar: v.metricName.endsWith("_bucket") ? null : undefined, labels: { ...v.labels, ...v.sharedLabels } })),
      aggregator: "sum",
    }),
    reset: () => {
      // as prom-client's reset: every series is dropped until it is observed again
      all = [];
      generation += 1;
    },
  };
  o.registry.registerMetric(metric as unknown as Parameters<Registry["registerMetric"]>[0]);

  return {
    series(labels) {
      const state: SeriesState = { labels: { ...labels }, counts: new Float64Array(bounds.length + 1), sum: 0, count: 0, generation: -1 };
      return {
        observe(value: number) {
          if (!Number.isFinite(value)) throw new TypeError(`${o.name}: not a finite number: ${value}`);
          if (state.generation !== generation) {
            state.counts.fill(0);
            state.sum = 0;
            state.count = 0;
            state.generation = generation;
            all.push(state);
          }
          let i = 0;
          while (i < bounds.length && value > (bounds[i] as number)) i += 1;
          state.counts[i] = (state.counts[i] as number) + 1;
          state.sum += value;
          state.count += 1;
        },
      };
    },
  };
}
