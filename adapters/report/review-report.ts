import { CORNER_HEADERS, cornerTable, worstLines } from "./corner-table.js";
import { type Block, toHtmlBody, toMarkdown } from "./doc.js";
import { type Candidate, escapeHtml, num, type Review, slug } from "./format.js";
import { htmlPage } from "./html-page.js";
import { inrushLines } from "./inrush-lines.js";
import { monteCarloBlocks } from "./monte-carlo-blocks.js";
import { candidateCharts, type ReportChart } from "./review-charts.js";
import { marginText, orderedVerdicts, outcomeLabel, outOfScope, outOfScopeSummary, valuesText } from "./verdicts.js";

export interface ReportOptions {
  /** The request id, shown in the title and used to name the SVG files. */
  readonly id?: string | number;
  /** Folder the Markdown links the SVGs under (relative to the .md file); default `<id>-charts`; null: no links (no files go with it). */
  readonly svgDir?: string | null;
}

export interface ReviewReport {
  readonly markdown: string;
  readonly html: string;
  readonly svgs: readonly { readonly file: string; readonly svg: string }[];
  readonly svgDir: string | null;
}

const tone = (verdict: string) =>
  verdict === "fail"
    ? "verdict-fail"
    : verdict === "warn"
      ? "verdict-warn"
      : verdict === "pass"
        ? "verdict-pass"
        : "verdict-other";

function candidateBlocks(c: Candidate, charts: readonly ReportChart[]): Block[] {
  // Rules out of scope are collapsed into one row; gaps in the evidence keep their own rows.
  const all = orderedVerdicts(c);
  const ordered = all.filter((v) => !outOfScope(v));
  const skipped = all.filter(outOfScope);
  const stage = [c.stage.kind, c.stage.partId ? `part ${c.stage.partId}` : undefined].filter(Boolean).join(", ");
  const b: Block[] = [
    { kind: "section-start", id: `candidate-${c.index}`, verdict: c.verdict },
    {
      kind: "heading",
      level: 2,
      text: `Rank ${c.rank} · candidate ${c.index + 1}: ${c.label} — ${outcomeLabel(c.verdict)}`,
    },
    { kind: "para", tone: tone(c.verdict), text: `${outcomeLabel(c.verdict)}. ${c.rankReason}` },
  ];
  const first = ordered[0];
  if (first && (first.outcome === "fail" || first.outcome === "warn")) {
    b.push({
      kind: "para",
      tone: "note",
      text: `${first.outcome === "fail" ? "Failing" : "Warning"} rule ${first.ruleId}: ${first.expression} — ${valuesText(first)}; ${marginText(first)}.`,
    });
  }
  b.push(
    {
      kind: "para",
      text: `Stage: ${stage}. Rule set ${c.rules.ruleSet.id} ${c.rules.ruleSet.version} (${c.rules.ruleSet.hash}): ${c.rules.outcome}; ${c.rules.counts.pass} pass, ${c.rules.counts.warn} warn, ${c.rules.counts.fail} fail, ${c.rules.counts.notApplicable} not applicable.`,
    },
    {
      kind: "table",
      cls: "verdicts",
      caption: "Verdicts, failing and warning rules first, with the values each rule read",
      headers: ["rule", "outcome", "values read", "threshold and margin", "expression", "source"],
      rows: [
        ...ordered.map((v) => [
          { text: v.ruleId },
          {
            text: v.outcome === "not-applicable" ? `n/a (${v.notApplicableCode ?? "?"})` : outcomeLabel(v.outcome),
            strong: v.outcome === "fail" || v.outcome === "warn",
          },
          { text: valuesText(v) },
          { text: marginText(v) },
          { text: v.expression },
          { text: v.source },
        ]),
        ...(skipped.length === 0
          ? []
          : [
              [
                { text: `${skipped.length} rules` },
                { text: "n/a" },
                { text: "" },
                { text: `out of scope (${outOfScopeSummary(skipped)})` },
                { text: "" },
                { text: "" },
              ],
            ]),
      ],
      rowTags: [
        ...ordered.map(
          (v) => `class="verdict ${v.outcome}" data-rule="${escapeHtml(v.ruleId)}" data-outcome="${v.outcome}"`,
        ),
        ...(skipped.length === 0 ? [] : ['class="verdict not-applicable collapsed"']),
      ],
    },
    { kind: "heading", level: 3, text: "Worst case over the corners" },
    { kind: "list", items: worstLines(c) },
    {
      kind: "table",
      cls: "corners",
      caption: "Corners (◆ marks the worst value of its column)",
      headers: [...CORNER_HEADERS],
      rows: cornerTable(c),
    },
    { kind: "heading", level: 3, text: "Curves" },
    {
      kind: "para",
      text:
        c.curves === undefined
          ? "No load or ambient sweeps in this result (the review was not asked for curves)."
          : `Drawn through corner conditions (${c.curves.conditions.basis}): supply ${c.curves.conditions.supply} ${num(c.curves.conditions.supplyV)} V, ambient ${num(c.curves.conditions.ambientC)} °C, load ×${num(c.curves.conditions.loadScale)}, ${c.curves.conditions.tolerance}. Dash-dot lines are the rule thresholds; the diamond is the corner the curves pass through.`,
    },
    { kind: "charts", charts },
  );
  const su = c.startUp.atMinSupply;
  b.push({
    kind: "list",
    items: [
      `start-up at the lowest supply: input ${num(su.inputV)} V${su.startMarginV === undefined ? "" : `, start margin ${num(su.startMarginV)} V`}${su.gateSourceV === undefined ? "" : `, gate drive ${num(su.gateSourceV)} V (margin ${num(su.gateDriveMarginV)} V)`}`,
      ...c.startUp.profiles.map(
        (p) =>
          `start-up profile at ${num(p.ambientC)} °C: lowest load voltage ${num(p.result.minLoadV)} V, highest Tj ${num(p.result.maxTjC)} °C, body-diode time ${num(p.result.bodyDiodeTimeS)} s, dropout ${num(p.result.dropoutTimeS)} s (${p.result.thermalModel})`,
      ),
      ...turnOffLines(c),
      ...inrushLines(c),
      ...(c.costTotal === undefined ? [] : [`cost ${num(c.costTotal)}`]),
    ],
  });
  b.push({ kind: "section-end" });
  return b;
}

/** The requirement's turn-off event for the candidate, in words (the chart draws its waveform). */
function turnOffLines(c: Candidate): string[] {
  const t = c.turnOff;
  if (t === undefined) return [];
  const e = t.event;
  const head = `turn-off event (Tj ${num(t.tjC)} °C, ${t.tjSource}): ${e.outcome}`;
  if (!("metrics" in e)) return [`${head}: ${e.reason}`];
  const clamp =
    e.outcome === "blocks" && e.clamp
      ? `, clamp ${num(e.clamp.clampV)} V absorbs ${num(e.clamp.absorbedJ)} J over ${num(e.clamp.durationS)} s${t.avalancheRatingJ === undefined ? " (no avalanche rating)" : ` (rating ${num(t.avalancheRatingJ)} J at 25 °C)`}`
      : "";
  const off = e.outcome === "blocks" ? `, turns off at ${num(e.turnOffS)} s` : "";
  return [
    `${head}: peak reverse current ${num(e.peakReverseCurrentA)} A at ${num(e.peakReverseTimeS)} s${off}${clamp}; output loses ${num(e.metrics.outputVoltageLostV)} V`,
  ];
}

function reportBlocks(r: Review, charts: readonly ReportChart[], title: string): Block[] {
  const sets = [...new Map(r.candidates.map((c) => [c.rules.ruleSet.hash, c.rules.ruleSet])).values()];
  const q = r.requirement;
  const b: Block[] = [
    { kind: "heading", level: 1, text: title },
    { kind: "para", tone: "caution", text: r.caution },
    {
      kind: "list",
      items: [
        `model version ${r.modelVersion}`,
        ...sets.map((s) => `rule set ${s.id} version ${s.version}, ${s.hash}`),
        `supply class ${q.supplyClass}: ${num(q.supplyMinV)} / ${num(q.supplyNominalV)} / ${num(q.supplyMaxV)} V (min / nominal / max), reverse ${num(q.reverseV)} V`,
        `transients: ${q.transients.length === 0 ? "none" : q.transients.join(", ")}`,
      ],
    },
    { kind: "heading", level: 2, text: "Ranking" },
    {
      kind: "table",
      cls: "ranking",
      headers: ["rank", "candidate", "verdict", "reason"],
      rows: r.ranking.map((e) => [
        { text: String(e.rank) },
        { text: `${e.index + 1}: ${e.label}` },
        { text: outcomeLabel(e.verdict), strong: e.verdict === "fail" },
        { text: e.reason },
      ]),
    },
  ];
  for (const e of r.ranking) {
    const c = r.candidates[e.index];
    if (c)
      b.push(
        ...candidateBlocks(
          c,
          charts.filter((x) => x.candidateIndex === c.index),
        ),
      );
  }
  b.push(...monteCarloBlocks(r));
  b.push(
    { kind: "heading", level: 2, text: "Sources and assumptions" },
    { kind: "list", items: [...q.sources, ...r.assumptions] },
    { kind: "para", tone: "caution", text: r.caution },
  );
  return b;
}

/**
 * The design-review report from a review result alone (no recomputation): Markdown, one
 * self-contained HTML page with the charts inline, and every chart as its own SVG document.
 * Deterministic: the same result gives the same bytes.
 */
export function renderReviewReport(r: Review, opts: ReportOptions = {}): ReviewReport {
  const name = slug(opts.id === undefined ? "review" : String(opts.id));
  const svgDir = opts.svgDir === undefined ? `${name}-charts` : opts.svgDir;
  const charts = r.candidates.flatMap((c) => candidateCharts(c));
  const title = `Design review${opts.id === undefined ? "" : ` ${opts.id}`}`;
  const blocks = reportBlocks(r, charts, title);
  return {
    markdown: toMarkdown(blocks, svgDir),
    html: htmlPage(title, toHtmlBody(blocks)),
    svgs: charts.map((c) => ({ file: c.file, svg: `<?xml version="1.0" encoding="UTF-8"?>\n${c.svg}\n` })),
    svgDir,
  };
}
