import type { BridgeAcOutput } from "../../contracts/bridge.js";
import { type Block, toHtmlBody, toMarkdown } from "./doc.js";
import { escapeHtml, num, slug } from "./format.js";
import { htmlPage } from "./html-page.js";
import { type BRIDGE_CHART_KINDS, type ReportChart, timeUnit } from "./review-charts.js";
import { lineChart, type ChartSpec } from "./svg-chart.js";
import { marginText, orderedVerdicts, outcomeLabel, valuesText } from "./verdicts.js";
import type { ReportOptions, ReviewReport } from "./review-report.js";

type Outcome = BridgeAcOutput["bridge"];
type Steady = Extract<Outcome, { steadyState: unknown }>["steadyState"];
type Rules = NonNullable<BridgeAcOutput["rules"]>;

const BRIDGE_POSITIONS = ["line1High", "line2High", "line1Low", "line2Low"] as const;

/** The bridge's charts over one period, every plotted number taken from the result's waveform. */
export function bridgeCharts(s: Steady, which: "bridge" | "compareTo", tag: string): ReportChart[] {
  const w = s.waveform;
  if (w === undefined) return [];
  const u = timeUnit(w.timeS.at(-1) ?? 0);
  const t = w.timeS.map((v) => v * u.factor);
  const out: ReportChart[] = [];
  const add = (
    kind: (typeof BRIDGE_CHART_KINDS)[number],
    title: string,
    spec: Omit<ChartSpec, "id" | "title" | "subtitle">,
  ) => {
    const id = `${tag}-${which}-${kind}`;
    const full: ChartSpec = {
      id,
      title,
      subtitle: `${which} · DC output ${num(s.dcOutputV)} V, ripple ${num(s.rippleVpp)} V p-p`,
      ...spec,
    };
    out.push({
      candidateIndex: which === "bridge" ? 0 : 1,
      kind,
      file: `${id}.svg`,
      title,
      spec: full,
      svg: lineChart(full),
    });
  };
  add("element-current", "Element current over one period", {
    xLabel: `Time from the source's rising zero (${u.label})`,
    yLabel: "Forward current (A)",
    series: BRIDGE_POSITIONS.map((p) => ({
      name: p,
      points: t.map((x, k): [number, number] => [x, w.elementCurrentA[p][k] ?? 0]),
      markerSpacingPx: 22,
    })),
    marks: s.elements
      .map((e) => {
        const k = w.elementCurrentA[e.position].indexOf(e.peakCurrentA);
        return { label: `${e.position} peak ${num(e.peakCurrentA)} A`, x: t[k] ?? 0, y: e.peakCurrentA };
      })
      .slice(0, 2),
  });
  add("voltages", "Source and output voltage over one period", {
    xLabel: `Time from the source's rising zero (${u.label})`,
    yLabel: "Voltage (V)",
    series: [
      { name: "source", points: t.map((x, k): [number, number] => [x, w.sourceV[k] ?? 0]), markerSpacingPx: 22 },
      { name: "output", points: t.map((x, k): [number, number] => [x, w.outputV[k] ?? 0]), markerSpacingPx: 22 },
    ],
  });
  return out;
}

function outcomeBlocks(
  which: "bridge" | "compareTo",
  r: Outcome,
  charts: readonly ReportChart[],
  rules: Rules | undefined,
): Block[] {
  const b: Block[] = [
    { kind: "section-start", id: which, verdict: rules?.outcome ?? r.outcome },
    { kind: "heading", level: 2, text: `${which === "bridge" ? "Bridge" : "Compared bridge"}: ${r.outcome}` },
  ];
  if ("reason" in r) b.push({ kind: "para", tone: "note", text: r.reason });
  if (rules !== undefined) {
    const ordered = orderedVerdicts({ rules });
    const first = ordered[0];
    b.push({
      kind: "para",
      tone:
        rules.outcome === "fail"
          ? "verdict-fail"
          : rules.outcome === "warn"
            ? "verdict-warn"
            : rules.outcome === "pass"
              ? "verdict-pass"
              : "verdict-other",
      text: `Rule set ${rules.ruleSet.id} ${rules.ruleSet.version} (${rules.ruleSet.hash}): ${outcomeLabel(rules.outcome)}; ${rules.counts.pass} pass, ${rules.counts.warn} warn, ${rules.counts.fail} fail, ${rules.counts.notApplicable} not applicable.`,
    });
    if (first && (first.outcome === "fail" || first.outcome === "warn"))
      b.push({
        kind: "para",
        tone: "note",
        text: `${first.outcome === "fail" ? "Failing" : "Warning"} rule ${first.ruleId}${first.element ? ` on ${first.element}` : ""}: ${first.expression} — ${valuesText(first)}; ${marginText(first)}.`,
      });
    b.push({
      kind: "table",
      cls: "verdicts",
      caption: "Verdicts, failing and warning rules first, with the element and the values each rule read",
      headers: ["rule", "outcome", "element", "values read", "threshold and margin", "expression", "source"],
      rows: ordered.map((v) => [
        { text: v.ruleId },
        {
          text: v.outcome === "not-applicable" ? `n/a (${v.notApplicableCode ?? "?"})` : outcomeLabel(v.outcome),
          strong: v.outcome === "fail" || v.outcome === "warn",
        },
        { text: v.element ?? "" },
        { text: valuesText(v) },
        { text: marginText(v) },
        { text: v.expression },
        { text: v.source },
      ]),
      rowTags: ordered.map(
        (v) => `class="verdict ${v.outcome}" data-rule="${escapeHtml(v.ruleId)}" data-outcome="${v.outcome}"`,
      ),
    });
  }
  if ("steadyState" in r) {
    const s = r.steadyState;
    b.push(
      {
        kind: "list",
        items: [
          `DC output ${num(s.dcOutputV)} V (${num(s.outputMinV)} … ${num(s.outputMaxV)} V, ripple ${num(s.rippleVpp)} V p-p)`,
          `load ${num(s.loadCurrentA)} A, ${num(s.loadPowerW)} W; efficiency ${num(s.efficiency * 100, 3)} %`,
          `source ${num(s.sourceRmsCurrentA)} A rms, ${num(s.sourcePeakCurrentA)} A peak, power factor ${num(s.sourcePowerFactor, 3)}`,
          `capacitor ripple current ${num(s.capacitorRippleCurrentRmsA)} A rms, ESR loss ${num(s.esrLossW)} W`,
          `elements ${num(s.totalElementLossW)} W in total; energy-balance residual ${num(s.energyBalance.relativeResidual, 2)}`,
        ],
      },
      {
        kind: "table",
        cls: "elements",
        caption: "Per element over the period (◆ marks the highest peak current and the hottest junction)",
        headers: [
          "position",
          "mode",
          "average (A)",
          "RMS (A)",
          "peak (A)",
          "conduction (°)",
          "loss (W)",
          "Tj (°C)",
          "Tj max (°C)",
          "reverse (V)",
          "rating (V)",
        ],
        rows: s.elements.map((e) => {
          const peakMax = Math.max(...s.elements.map((x) => x.peakCurrentA));
          const tjMax = Math.max(...s.elements.map((x) => x.tjC));
          return [
            { text: e.position },
            { text: e.mode },
            { text: num(e.averageCurrentA) },
            { text: num(e.rmsCurrentA) },
            { text: num(e.peakCurrentA), mark: e.peakCurrentA === peakMax },
            { text: num(e.conductionAngleDeg) },
            { text: num(e.lossW) },
            { text: num(e.tjC), mark: e.tjC === tjMax },
            { text: num(e.tjMaxC) },
            { text: num(e.maxReverseV) },
            { text: num(e.reverseRatingV) },
          ];
        }),
      },
      {
        kind: "para",
        text:
          s.waveform === undefined
            ? "No period waveform in this result (the analysis was not asked for it)."
            : `One period from the integrator's ${s.waveform.nodes} nodes (${s.waveform.timeS.length} drawn, each element's peak among them).`,
      },
      { kind: "charts", charts },
    );
  }
  b.push({ kind: "section-end" });
  return b;
}

/**
 * The AC bridge report from a bridgeAc result alone (no recomputation): Markdown, one
 * self-contained HTML page with the period charts inline, and each chart as its own SVG.
 */
export function renderBridgeAcReport(r: BridgeAcOutput, opts: ReportOptions = {}): ReviewReport {
  const name = slug(opts.id === undefined ? "bridge" : String(opts.id));
  const svgDir = opts.svgDir === undefined ? `${name}-charts` : opts.svgDir;
  const title = `AC bridge${opts.id === undefined ? "" : ` ${opts.id}`}`;
  const main = "steadyState" in r.bridge ? bridgeCharts(r.bridge.steadyState, "bridge", name) : [];
  const other =
    r.compareTo !== undefined && "steadyState" in r.compareTo
      ? bridgeCharts(r.compareTo.steadyState, "compareTo", name)
      : [];
  const blocks: Block[] = [
    { kind: "heading", level: 1, text: title },
    { kind: "para", tone: "caution", text: r.caution },
    {
      kind: "list",
      items: [
        `model version ${r.modelVersion}`,
        ...(r.rules
          ? [`rule set ${r.rules.ruleSet.id} version ${r.rules.ruleSet.version}, ${r.rules.ruleSet.hash}`]
          : ["no rule set was applied"]),
        ...(r.saving
          ? [
              `saving against compareTo: ${num(r.saving.lossSavingW)} W, hottest junction ${num(r.saving.hottestTjReductionK)} K cooler`,
            ]
          : []),
      ],
    },
    ...outcomeBlocks("bridge", r.bridge, main, r.rules),
    ...(r.compareTo === undefined ? [] : outcomeBlocks("compareTo", r.compareTo, other, r.compareToRules)),
    { kind: "heading", level: 2, text: "Assumptions" },
    { kind: "list", items: r.assumptions },
    { kind: "para", tone: "caution", text: r.caution },
  ];
  const charts = [...main, ...other];
  return {
    markdown: toMarkdown(blocks, svgDir),
    html: htmlPage(title, toHtmlBody(blocks)),
    svgs: charts.map((c) => ({ file: c.file, svg: `<?xml version="1.0" encoding="UTF-8"?>\n${c.svg}\n` })),
    svgDir,
  };
}
