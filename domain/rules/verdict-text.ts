import { metricDef, partParameterDef } from "./metric-vocabulary.js";
import { formatNumber, formatQuantity } from "./quantity-text.js";

/** How a rule's top-level comparison is written in a reason: its left side and the unit of each part. */
export interface ComparisonText {
  readonly lhs: string;
  readonly unit: string;
  readonly marginUnit: string;
}

const cache = new Map<string, ComparisonText | null>();

/** A vocabulary name's unit (metric or part.<name>); undefined for booleans and unknown names. */
export function unitOf(name: string): string | undefined {
  const d = name.startsWith("part.") ? partParameterDef(name.slice(5)) : metricDef(name);
  return d === undefined || d.type === "boolean" ? undefined : d.unit;
}

/** The text left of the top-level comparison operator (outside brackets), or undefined. */
function leftSide(text: string): string | undefined {
  let depth = 0;
  for (let i = 0; i < text.length; i += 1) {
    const ch = text[i];
    if (ch === "(" || ch === "[") depth += 1;
    else if (ch === ")" || ch === "]") depth -= 1;
    else if (depth === 0 && (ch === "<" || ch === ">" || ((ch === "=" || ch === "!") && text[i + 1] === "=")))
      return text.slice(0, i).trim();
  }
  return undefined;
}

/**
 * The unit of a comparison from the vocabulary names on its left side: one shared unit, a
 * difference of two temperatures in °C is in K, and a margin of °C values is in K; mixed or
 * unknown units give none (the numbers are then written bare).
 */
export function comparisonText(expression: string, exprNames: readonly string[]): ComparisonText | null {
  const hit = cache.get(expression);
  if (hit !== undefined) return hit;
  const lhs = leftSide(expression);
  let out: ComparisonText | null = null;
  if (lhs !== undefined) {
    const names = exprNames.filter((n) =>
      new RegExp(`(^|[^A-Za-z0-9_.])${n.replace(".", "\\.")}($|[^A-Za-z0-9_])`).test(lhs),
    );
    const units = [...new Set(names.map(unitOf))];
    const u = units.length === 1 ? units[0] : undefined;
    if (u !== undefined) {
      const celsius = names.filter((n) => unitOf(n) === "°C").length;
      out =
        u === "°C" && celsius >= 2 && lhs.includes("-")
          ? { lhs, unit: "K", marginUnit: "K" }
          : { lhs, unit: u, marginUnit: u === "°C" ? "K" : u };
    } else out = { lhs, unit: "", marginUnit: "" };
  }
  if (cache.size >= 10_000) cache.clear();
  cache.set(expression, out);
  return out;
}

/**
 * The reason of a failed comparison, with units and engineering prefixes, e.g.
 * "tjWorstC = 157.8 °C <= 150 °C does not hold (margin -7.803 K)". Full precision stays in the
 * verdict's numbers.
 */
export function comparisonReason(
  expression: string,
  names: readonly string[],
  op: string,
  lhs: number,
  rhs: number,
  margin: number,
): string {
  const t = comparisonText(expression, names);
  if (t === null)
    return `${formatNumber(lhs, 6)} ${op} ${formatNumber(rhs, 6)} does not hold (margin ${formatNumber(margin, 6)})`;
  return `${t.lhs} = ${formatQuantity(lhs, t.unit)} ${op} ${formatQuantity(rhs, t.unit)} does not hold (margin ${formatQuantity(margin, t.marginUnit)})`;
}
