import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";

/** One plotted series: points in data units; a null y breaks the line (no operating point there). */
export interface ChartSeries {
  readonly name: string;
  readonly points: readonly (readonly [number, number | null])[];
  /** Least horizontal distance between markers, px (default 0: a marker on every point). */
  readonly markerSpacingPx?: number;
}

/** A horizontal limit line, e.g. a rule's threshold. */
export interface ChartLimit {
  readonly label: string;
  readonly value: number;
}

/** A single emphasised point, e.g. the worst corner. */
export interface ChartMark {
  readonly label: string;
  readonly x: number;
  readonly y: number;
}

export interface ChartSpec {
  readonly id: string;
  readonly title: string;
  /** Second heading line: what and where (candidate, conditions). */
  readonly subtitle?: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly series: readonly ChartSeries[];
  readonly limits?: readonly ChartLimit[];
  readonly marks?: readonly ChartMark[];
}

export const CHART_WIDTH = 640;
export const CHART_HEIGHT = 380;
const M = { top: 46, right: 150, bottom: 52, left: 66 } as const;

/**
 * Ink and strokes: greyscale-safe by construction — each series differs in dash pattern and marker
 * shape, not only in tone; tones are ink-like and spread in lightness.
 */
const INKS = ["#20242b", "#8a4f1d", "#2f6a6a", "#6b3f7a", "#55606b"] as const;
const DASHES = ["", "7 4", "2 3", "10 3 2 3", "4 2 1 2"] as const;
const MARKERS = ["disc", "square", "triangle", "ring", "cross"] as const;
type Marker = (typeof MARKERS)[number];

const FONT = "font-family=\"'DejaVu Sans', 'Liberation Sans', Arial, sans-serif\"";

export function escapeXml(s: string): string {
  return s
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** Compact number for coordinates: finite, at most 3 decimals, no exponent. */
function px(v: number): string {
  return (Math.round(v * 1000) / 1000).toString();
}

function markerShape(kind: Marker, x: number, y: number, ink: string): string {
  const r = 3.6;
  switch (kind) {
    case "disc":
      return `<circle cx="${px(x)}" cy="${px(y)}" r="${r}" fill="${ink}"/>`;
    case "square":
      return `<rect x="${px(x - r)}" y="${px(y - r)}" width="${2 * r}" height="${2 * r}" fill="#ffffff" stroke="${ink}" stroke-width="1.6"/>`;
    case "triangle":
      return `<path d="M${px(x)},${px(y - r - 0.8)}L${px(x + r)},${px(y + r * 0.8)}L${px(x - r)},${px(y + r * 0.8)}Z" fill="${ink}"/>`;
    case "ring":
      return `<circle cx="${px(x)}" cy="${px(y)}" r="${r}" fill="#ffffff" stroke="${ink}" stroke-width="1.6"/>`;
    case "cross":
      return `<path d="M${px(x - r)},${px(y - r)}L${px(x + r)},${px(y + r)}M${px(x - r)},${px(y + r)}L${px(x + r)},${px(y - r)}" stroke="${ink}" stroke-width="1.8"/>`;
  }
}

function extent(values: readonly number[], fallback: readonly [number, number]): [number, number] {
  const finite = values.filter(Number.isFinite);
  if (finite.length === 0) return [fallback[0], fallback[1]];
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (hi - lo < 1e-12 * Math.max(1, Math.abs(hi))) {
    // a tenth of the value, unless that is so small that tick steps would underflow (d3's ticks then
    // ask for an array of impossible length): values within 1e-200 of zero read as a flat line at zero
    const pad = Math.abs(hi) > 1e-200 ? Math.abs(hi) * 0.1 : 1;
    lo -= pad;
    hi += pad;
  }
  return [lo, hi];
}

/**
 * A line chart as one standalone SVG document (no script, no external reference): linear axes
 * from d3-scale with "nice" ticks, lines from d3-shape, markers per series, limit lines and marks.
 * Each tick carries `data-value` and each series path `data-series`, so a reader (or a test) can
 * map the drawn coordinates back through the axis scale.
 */
export function lineChart(spec: ChartSpec): string {
  const xs = spec.series.flatMap((s) => s.points.map((p) => p[0]));
  const ys = [
    ...spec.series.flatMap((s) => s.points.map((p) => p[1]).filter((v): v is number => v !== null)),
    ...(spec.limits ?? []).map((l) => l.value),
    ...(spec.marks ?? []).map((m) => m.y),
  ];
  const x = scaleLinear()
    .domain(extent([...xs, ...(spec.marks ?? []).map((m) => m.x)], [0, 1]))
    .range([M.left, CHART_WIDTH - M.right])
    .nice(8);
  const y = scaleLinear()
    .domain(extent(ys, [0, 1]))
    .range([CHART_HEIGHT - M.bottom, M.top])
    .nice(6);
  const [x0, x1] = x.range() as [number, number];
  const [y0, y1] = y.range() as [number, number];
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" id="${escapeXml(spec.id)}" class="bs-chart" width="${CHART_WIDTH}" height="${CHART_HEIGHT}" viewBox="0 0 ${CHART_WIDTH} ${CHART_HEIGHT}" role="img" aria-label="${escapeXml(spec.title)}" ${FONT} font-size="11">`,
  );
  out.push(
    `<title>${escapeXml(spec.subtitle === undefined ? spec.title : `${spec.title} — ${spec.subtitle}`)}</title>`,
  );
  out.push(`<rect x="0" y="0" width="${CHART_WIDTH}" height="${CHART_HEIGHT}" fill="#fdfcf8"/>`);
  out.push(
    `<text x="${M.left}" y="18" font-size="13" font-weight="bold" fill="#1d1f24">${escapeXml(spec.title)}</text>`,
  );
  if (spec.subtitle !== undefined)
    out.push(`<text x="${M.left}" y="34" font-size="10.5" fill="#4a4e55">${escapeXml(spec.subtitle)}</text>`);

  // Grid and axes.
  const xTicks = x.ticks(8);
  const yTicks = y.ticks(6);
  const fx = x.tickFormat(8);
  const fy = y.tickFormat(6);
  out.push('<g class="axis x-axis" stroke="#c9c4b8" stroke-width="0.6">');
  for (const t of xTicks)
    out.push(`<line class="tick" data-value="${t}" x1="${px(x(t))}" x2="${px(x(t))}" y1="${px(y0)}" y2="${px(y1)}"/>`);
  out.push("</g>");
  out.push('<g class="axis y-axis" stroke="#c9c4b8" stroke-width="0.6">');
  for (const t of yTicks)
    out.push(`<line class="tick" data-value="${t}" x1="${px(x0)}" x2="${px(x1)}" y1="${px(y(t))}" y2="${px(y(t))}"/>`);
  out.push("</g>");
  out.push(
    `<rect x="${px(x0)}" y="${px(y1)}" width="${px(x1 - x0)}" height="${px(y0 - y1)}" fill="none" stroke="#3b3f46" stroke-width="1"/>`,
  );
  out.push('<g class="tick-labels" fill="#30343a">');
  for (const t of xTicks)
    out.push(`<text x="${px(x(t))}" y="${px(y0 + 16)}" text-anchor="middle">${escapeXml(fx(t))}</text>`);
  for (const t of yTicks)
    out.push(`<text x="${px(x0 - 6)}" y="${px(y(t) + 4)}" text-anchor="end">${escapeXml(fy(t))}</text>`);
  out.push("</g>");
  out.push(
    `<text class="x-label" x="${px((x0 + x1) / 2)}" y="${CHART_HEIGHT - 12}" text-anchor="middle" fill="#1d1f24">${escapeXml(spec.xLabel)}</text>`,
  );
  out.push(
    `<text class="y-label" x="${px(18)}" y="${px((y0 + y1) / 2)}" text-anchor="middle" fill="#1d1f24" transform="rotate(-90 18 ${px((y0 + y1) / 2)})">${escapeXml(spec.yLabel)}</text>`,
  );

  // Limits: dash-dot rule, its label just above it inside the plot (a pale halo keeps it legible).
  for (const l of spec.limits ?? []) {
    const yy = y(l.value);
    out.push(
      `<g class="limit" data-value="${l.value}"><line x1="${px(x0)}" x2="${px(x1)}" y1="${px(yy)}" y2="${px(yy)}" stroke="#9b1c1c" stroke-width="1.4" stroke-dasharray="12 3 2 3"/>` +
        `<text x="${px(x0 + 6)}" y="${px(yy - 4)}" fill="#9b1c1c" font-size="10" stroke="#fdfcf8" stroke-width="3" paint-order="stroke">${escapeXml(l.label)}</text></g>`,
    );
  }

  // Series.
  const path = line<readonly [number, number | null]>()
    .defined((p) => p[1] !== null && Number.isFinite(p[1]) && Number.isFinite(p[0]))
    .x((p) => x(p[0]))
    .y((p) => y(p[1] ?? 0))
    .digits(3);
  for (const [i, s] of spec.series.entries()) {
    const ink = INKS[i % INKS.length] ?? "#000000";
    const dash = DASHES[i % DASHES.length] ?? "";
    const marker = MARKERS[i % MARKERS.length] ?? "disc";
    const d = path(s.points) ?? "";
    out.push(`<g class="series" data-series="${escapeXml(s.name)}">`);
    if (d !== "")
      out.push(
        `<path class="series-line" d="${d}" fill="none" stroke="${ink}" stroke-width="1.8"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`,
      );
    const spacing = s.markerSpacingPx ?? 0;
    let lastX = Number.NEGATIVE_INFINITY;
    for (const p of s.points) {
      if (p[1] === null || !Number.isFinite(p[1]) || x(p[0]) - lastX < spacing) continue;
      lastX = x(p[0]);
      out.push(markerShape(marker, x(p[0]), y(p[1]), ink));
    }
    out.push("</g>");
    // Legend entry: line sample with its marker.
    const ly = M.top + 8 + i * 20;
    const lx = x1 + 8;
    out.push(
      `<g class="legend"><line x1="${px(lx)}" x2="${px(lx + 26)}" y1="${ly}" y2="${ly}" stroke="${ink}" stroke-width="1.8"${dash ? ` stroke-dasharray="${dash}"` : ""}/>${markerShape(marker, lx + 13, ly, ink)}` +
        `<text x="${px(lx + 32)}" y="${ly + 4}" fill="#1d1f24">${escapeXml(s.name)}</text></g>`,
    );
  }

  for (const m of spec.marks ?? []) {
    const mx = x(m.x);
    const my = y(m.y);
    out.push(
      `<g class="mark" data-x="${m.x}" data-y="${m.y}"><path d="M${px(mx)},${px(my - 8)}L${px(mx + 8)},${px(my)}L${px(mx)},${px(my + 8)}L${px(mx - 8)},${px(my)}Z" fill="none" stroke="#9b1c1c" stroke-width="1.6"/>` +
        `<text x="${px(mx + 10)}" y="${px(my - 8)}" fill="#9b1c1c" font-size="10">${escapeXml(m.label)}</text></g>`,
    );
  }
  out.push("</svg>");
  return out.join("\n");
}
