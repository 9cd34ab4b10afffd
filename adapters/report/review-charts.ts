import { type Candidate, num, slug } from "./format.js";
import { type ChartLimit, type ChartMark, type ChartSeries, type ChartSpec, lineChart } from "./svg-chart.js";

/** One chart of a report: where it belongs, what it shows, and the SVG document. */
export interface ReportChart {
  readonly candidateIndex: number;
  readonly kind: ChartKind | (typeof BRIDGE_CHART_KINDS)[number];
  /** File name of the SVG on its own, unique within the report. */
  readonly file: string;
  readonly title: string;
  readonly spec: ChartSpec;
  readonly svg: string;
}

export const CHART_KINDS = [
  "drop-vs-current",
  "loss-vs-current",
  "tj-vs-current",
  "tj-vs-ambient",
  "startup-voltage",
  "startup-tj",
  "turnoff-current",
] as const;
export type ChartKind = (typeof CHART_KINDS)[number];
/** The AC bridge report's charts (bridge-report.ts). */
export const BRIDGE_CHART_KINDS = ["element-current", "voltages"] as const;

/** The metric of the rule vocabulary a chart's y axis shows, for drawing the rules' thresholds. */
const LIMIT_METRIC: Record<ChartKind, string> = {
  "drop-vs-current": "dropWorstV",
  "loss-vs-current": "lossWorstW",
  "tj-vs-current": "tjWorstC",
  "tj-vs-ambient": "tjWorstC",
  "startup-voltage": "loadVMinV",
  "startup-tj": "tjWorstC",
  "turnoff-current": "peakReverseCurrentA",
};

/** Thresholds of the applied rules whose left-hand side is the metric (e.g. `tjWorstC <= …`). */
export function ruleLimits(c: Candidate, metric: string, unit: string): ChartLimit[] {
  const lhs = new RegExp(`^\\s*${metric}\\s*(<=|>=|<|>)`);
  return c.rules.verdicts
    .filter((v) => v.outcome !== "not-applicable" && v.threshold !== null && lhs.test(v.expression))
    .map((v) => ({
      label: `${v.ruleId} (${v.comparison ?? ""} ${num(v.threshold)} ${unit})`,
      value: v.threshold ?? 0,
    }));
}

type Curves = NonNullable<Candidate["curves"]>;
type Row = Curves["load"][number] | Curves["ambient"][number];

/** A row plots where a stable operating point exists (solved or over-temperature); elsewhere the line breaks. */
export function plotted(r: Row): boolean {
  return r.outcome === "solved" || r.outcome === "over-temperature";
}

function at<R extends Row>(
  rows: readonly R[],
  x: (r: R) => number | undefined,
  y: (r: R) => number | undefined,
): [number, number | null][] {
  return rows.flatMap((r): [number, number | null][] => {
    const xv = x(r);
    if (xv === undefined) return [];
    return [[xv, plotted(r) ? (y(r) ?? null) : null]];
  });
}

function conditionsText(k: Curves["conditions"]): string {
  return `supply ${num(k.supplyV)} V, ${k.tolerance}`;
}

/** The candidate's charts, every plotted number taken from the review result as it stands. */
export function candidateCharts(c: Candidate, prefix = ""): ReportChart[] {
  const tag = `${prefix}c${c.index}-${slug(c.label)}`;
  const out: ReportChart[] = [];
  const add = (kind: ChartKind, title: string, where: string, spec: Omit<ChartSpec, "id" | "title" | "subtitle">) => {
    const id = `${tag}-${kind}`;
    const full: ChartSpec = { id, title, subtitle: `${c.label} · ${where}`, ...spec };
    out.push({ candidateIndex: c.index, kind, file: `${id}.svg`, title, spec: full, svg: lineChart(full) });
  };
  if (c.curves !== undefined) curveCharts(c, c.curves, add);
  startUpCharts(c, add);
  turnOffChart(c, add);
  return out;
}

type AddChart = (
  kind: ChartKind,
  title: string,
  where: string,
  spec: Omit<ChartSpec, "id" | "title" | "subtitle">,
) => void;

/** The load and ambient sweeps (present when the review was asked for `curves`). */
function curveCharts(c: Candidate, curves: Curves, add: AddChart): void {
  const k = curves.conditions;
  const curveCorner = c.corners.findIndex(
    (r) =>
      r.conditions.supply === k.supply &&
      r.conditions.ambient === k.ambient &&
      r.conditions.loadScale === k.loadScale &&
      r.conditions.tolerance === k.tolerance,
  );
  const corner = c.corners[curveCorner];
  const mark = (y: number | undefined): ChartMark[] =>
    corner?.currentA !== undefined && y !== undefined
      ? [{ label: `corner ${curveCorner}${k.basis === "worst-tj-corner" ? " (worst Tj)" : ""}`, x: corner.currentA, y }]
      : [];
  const load = curves.load;
  const where = `${conditionsText(k)}, ambient ${num(k.ambientC)} °C`;
  add("drop-vs-current", "Forward drop against load current", where, {
    xLabel: "Load current (A)",
    yLabel: "Forward drop (V)",
    series: [
      {
        name: "drop",
        points: at(
          load,
          (r) => r.currentA,
          (r) => r.dropV,
        ),
      },
    ],
    limits: ruleLimits(c, LIMIT_METRIC["drop-vs-current"], "V"),
    marks: mark(corner?.dropV),
  });
  add("loss-vs-current", "Stage loss against load current", where, {
    xLabel: "Load current (A)",
    yLabel: "Loss (W)",
    series: [
      {
        name: "loss",
        points: at(
          load,
          (r) => r.currentA,
          (r) => r.lossW,
        ),
      },
    ],
    limits: ruleLimits(c, LIMIT_METRIC["loss-vs-current"], "W"),
    marks: mark(corner?.lossW),
  });
  add("tj-vs-current", "Junction temperature against load current", where, {
    xLabel: "Load current (A)",
    yLabel: "Junction temperature (°C)",
    series: [
      {
        name: "Tj",
        points: at(
          load,
          (r) => r.currentA,
          (r) => r.tjC,
        ),
      },
    ],
    limits: ruleLimits(c, LIMIT_METRIC["tj-vs-current"], "°C"),
    marks: mark(corner?.tjC),
  });
  add("tj-vs-ambient", "Junction temperature against ambient", `${conditionsText(k)}, load ×${num(k.loadScale)}`, {
    xLabel: "Ambient temperature (°C)",
    yLabel: "Junction temperature (°C)",
    series: [
      {
        name: "Tj",
        points: at(
          curves.ambient,
          (r) => r.ambientC,
          (r) => r.tjC,
        ),
      },
    ],
    limits: ruleLimits(c, LIMIT_METRIC["tj-vs-ambient"], "°C"),
    marks: corner?.tjC === undefined ? [] : [{ label: `corner ${curveCorner}`, x: k.ambientC, y: corner.tjC }],
  });
}

/** The start-up profile charts (present when the requirement gave a profile and the review was asked for curves). */
function startUpCharts(c: Candidate, add: AddChart): void {
  const profiles = c.startUp.profiles.flatMap((p) =>
    p.result.samples === undefined ? [] : [{ ambientC: p.ambientC, samples: p.result.samples, result: p.result }],
  );
  const first = profiles[0];
  if (first !== undefined) {
    const spacing = 24;
    const supply: ChartSeries = {
      name: "supply",
      points: first.samples.map((s) => [s.timeS, s.supplyV]),
      markerSpacingPx: spacing,
    };
    add(
      "startup-voltage",
      "Start-up profile: supply and load voltage",
      `ambients ${profiles.map((p) => num(p.ambientC)).join(", ")} °C`,
      {
        xLabel: "Time (s)",
        yLabel: "Voltage (V)",
        series: [
          supply,
          ...profiles.map((p) => ({
            name: `load, ${num(p.ambientC)} °C`,
            points: p.samples.map((s) => [s.timeS, s.loadV] as [number, number]),
            markerSpacingPx: spacing,
          })),
        ],
        limits: ruleLimits(c, LIMIT_METRIC["startup-voltage"], "V"),
      },
    );
    add("startup-tj", "Start-up profile: junction temperature", `thermal model ${first.result.thermalModel}`, {
      xLabel: "Time (s)",
      yLabel: "Junction temperature (°C)",
      series: profiles.map((p) => ({
        name: `Tj, ${num(p.ambientC)} °C`,
        points: p.samples.map((s) => [s.timeS, s.tjC] as [number, number]),
        markerSpacingPx: spacing,
      })),
      limits: ruleLimits(c, LIMIT_METRIC["startup-tj"], "°C"),
    });
  }
}

/** A time axis in s, ms or µs, whichever keeps the largest time between 1 and 1000. */
export function timeUnit(maxS: number): { readonly label: string; readonly factor: number } {
  if (maxS < 1e-3) return { label: "µs", factor: 1e6 };
  if (maxS < 1) return { label: "ms", factor: 1e3 };
  return { label: "s", factor: 1 };
}

/** The turn-off event's reverse current against time (present when the review had a turn-off section and curves). */
function turnOffChart(c: Candidate, add: AddChart): void {
  const e = c.turnOff?.event;
  if (e === undefined || !("waveform" in e) || e.waveform === undefined) return;
  const w = e.waveform;
  const u = timeUnit(w.timeS.at(-1) ?? 0);
  const reverse = w.timeS.map((t, k): [number, number] => [t * u.factor, -(w.currentA[k] ?? 0)]);
  // A peak that is only a lower bound (still rising at the end of the searched span) is labelled so.
  const peakLabel =
    "peakReverseIsLowerBound" in e && e.peakReverseIsLowerBound === true
      ? `at least ${num(e.peakReverseCurrentA)} A (still rising at the window's end)`
      : `peak ${num(e.peakReverseCurrentA)} A`;
  const marks: ChartMark[] = [{ label: peakLabel, x: e.peakReverseTimeS * u.factor, y: e.peakReverseCurrentA }];
  if (e.outcome === "blocks")
    marks.push({
      label: "turn-off",
      x: e.turnOffS * u.factor,
      y: -(w.currentA[w.clampStartIndex ?? w.timeS.length - 1] ?? 0),
    });
  const t = c.turnOff;
  add("turnoff-current", "Turn-off: reverse current against time", `${e.outcome}, Tj ${num(t?.tjC)} °C at the event`, {
    xLabel: `Time after the input falls (${u.label})`,
    yLabel: "Reverse current (A)",
    series: [{ name: "reverse current", points: reverse, markerSpacingPx: 18 }],
    limits: ruleLimits(c, LIMIT_METRIC["turnoff-current"], "A"),
    marks,
  });
}
