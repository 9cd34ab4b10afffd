/**
 * Numbers for people: a value with its unit and an engineering prefix, rounded to four
 * significant digits ("13.8 us" is written "13.8 µs", "0.00008 A" is "80 µA"). Only for text
 * (verdict reasons, reports); results keep full precision in their numbers. Latin-1 only (µ, °),
 * so an answer's JSON stays a one-byte string (DEVELOPERS.md, "Text in answers").
 */
const PREFIXES: readonly (readonly [number, string])[] = [
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
];

/** Units that take no prefix: temperatures, ratios and anything unknown. */
const NO_PREFIX = new Set(["°C", "K", "1", "-", "", "K/W"]);

export function formatNumber(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  return String(Number(x.toPrecision(digits)));
}

export function formatQuantity(x: number, unit: string, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  const u = unit === "1" || unit === "-" ? "" : unit;
  if (NO_PREFIX.has(unit) || x === 0) return u === "" ? formatNumber(x, digits) : `${formatNumber(x, digits)} ${u}`;
  const a = Math.abs(Number(x.toPrecision(digits)));
  const [scale, prefix] =
    PREFIXES.find(([s]) => a >= s * (1 - 1e-12)) ?? (PREFIXES[PREFIXES.length - 1] as readonly [number, string]);
  return `${formatNumber(x / scale, digits)} ${prefix}${u}`;
}
