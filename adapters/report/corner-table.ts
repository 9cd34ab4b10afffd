import { type Candidate, num } from "./format.js";

export const CORNER_HEADERS = [
  "#",
  "supply",
  "supply V",
  "ambient °C",
  "load ×",
  "tolerance",
  "outcome",
  "mode",
  "current A",
  "drop V",
  "loss W",
  "Tj °C",
  "load V",
] as const;

export interface CornerCell {
  readonly text: string;
  /** This cell is the worst value of its column over the corners (the review's worst case). */
  readonly mark: boolean;
}

/** The corner table of a candidate; the worst Tj, loss, drop and lowest load voltage are flagged. */
export function cornerTable(c: Candidate): CornerCell[][] {
  const w = c.worst;
  return c.corners.map((r, i) => {
    const k = r.conditions;
    const cell = (text: string, mark = false): CornerCell => ({ text, mark });
    return [
      cell(String(i)),
      cell(k.supply),
      cell(num(k.supplyV)),
      cell(num(k.ambientC)),
      cell(num(k.loadScale)),
      cell(k.tolerance),
      cell(r.outcome),
      cell(r.mode ?? (r.reason === undefined ? "–" : "no operating point")),
      cell(num(r.currentA)),
      cell(num(r.dropV), w.dropV?.corner === i),
      // Tj and loss at the current limit that heats more where the switch has a minimum limit (hotterAtLimit)
      cell(hotter(r.hotterAtLimit, r.hotterAtLimit?.lossW, r.lossW), w.lossW?.corner === i),
      cell(hotter(r.hotterAtLimit, r.hotterAtLimit?.tjC, r.tjC), w.tjC?.corner === i),
      cell(num(r.loadV), w.loadMinV?.corner === i),
    ];
  });
}

/** A thermal figure of the corner: at the typical limit, so marked, where that heats more. */
function hotter(
  h: { readonly currentLimitA: number } | undefined,
  atLimit: number | undefined,
  own: number | undefined,
) {
  return h === undefined ? num(own) : `${num(atLimit)} (at ${num(h.currentLimitA)} A)`;
}

/** One line per worst-case metric, naming its corner. */
export function worstLines(c: Candidate): string[] {
  const w = c.worst;
  const line = (what: string, x: { value: number; corner: number } | undefined, unit: string) =>
    x ? [`${what}: ${num(x.value)} ${unit} at corner ${x.corner}`] : [];
  return [
    ...line("highest junction temperature", w.tjC, "°C"),
    ...line("highest loss", w.lossW, "W"),
    ...line("largest drop", w.dropV, "V"),
    ...line("lowest load voltage", w.loadMinV, "V"),
    ...(w.unsolvedCorners.length > 0 ? [`corners without an operating point: ${w.unsolvedCorners.join(", ")}`] : []),
  ];
}
