/** Dimensions of rule quantities: exponents over V, A, s and K, and the two temperature kinds (see rule-dimensions.ts). */

export type Exps = readonly [number, number, number, number];
export type Dim =
  | { readonly kind: "free" }
  | { readonly kind: "bool" }
  | { readonly kind: "q"; readonly e: Exps }
  /** an absolute temperature in °C */
  | { readonly kind: "point" }
  /** a point or a difference, not yet known (a point combined with a bare number) */
  | { readonly kind: "temp?" };

export const FREE: Dim = { kind: "free" };
export const BOOL: Dim = { kind: "bool" };
export const POINT: Dim = { kind: "point" };
export const EITHER: Dim = { kind: "temp?" };
export const q = (v: number, a: number, s: number, k: number): Dim => ({ kind: "q", e: [v, a, s, k] });
export const KELVIN = q(0, 0, 0, 1);

/** Units of the vocabulary and of unit symbols, by their base (prefixes stripped for symbols). */
const UNIT_DIMS: ReadonlyMap<string, Dim> = new Map([
  ["1", q(0, 0, 0, 0)],
  ["-", BOOL],
  ["°C", POINT],
  ["degC", POINT],
  ["V", q(1, 0, 0, 0)],
  ["A", q(0, 1, 0, 0)],
  ["s", q(0, 0, 1, 0)],
  ["K", KELVIN],
  ["W", q(1, 1, 0, 0)],
  ["J", q(1, 1, 1, 0)],
  ["ohm", q(1, -1, 0, 0)],
  ["Ω", q(1, -1, 0, 0)],
  ["F", q(-1, 1, 1, 0)],
  ["H", q(1, -1, 1, 0)],
  ["Hz", q(0, 0, -1, 0)],
  ["K/W", q(-1, -1, 0, 1)],
]);

/** The dimension of a vocabulary unit, or undefined for a unit this checker does not know. */
export function unitDimension(unit: string): Dim | undefined {
  return UNIT_DIMS.get(unit);
}

/** The dimension of a unit symbol of the sandbox (`mA`, `kohm`, `degC`), by stripping one SI prefix. */
export function symbolDim(name: string): Dim | undefined {
  const direct = UNIT_DIMS.get(name);
  if (direct !== undefined) return direct;
  const base = name.slice(1);
  if (/^[pnumkMG]/.test(name) && base !== "" && base !== "degC") return UNIT_DIMS.get(base);
  return undefined;
}

const NAMES = ["V", "A", "s", "K"] as const;
export function show(d: Dim): string {
  if (d.kind === "point") return "a temperature in °C";
  if (d.kind === "temp?") return "a temperature";
  if (d.kind === "bool") return "a condition";
  if (d.kind === "free") return "a number";
  const known: [string, Dim][] = [
    ["V", q(1, 0, 0, 0)],
    ["A", q(0, 1, 0, 0)],
    ["W", q(1, 1, 0, 0)],
    ["J", q(1, 1, 1, 0)],
    ["s", q(0, 0, 1, 0)],
    ["K (a temperature difference)", KELVIN],
    ["ohm", q(1, -1, 0, 0)],
    ["a ratio", q(0, 0, 0, 0)],
  ];
  const hit = known.find(([, k]) => same(k, d));
  if (hit) return hit[0].startsWith("a ") ? hit[0] : `${hit[0]}`;
  return (
    d.e
      .map((x, i) => (x === 0 ? "" : x === 1 ? NAMES[i] : `${NAMES[i]}^${x}`))
      .filter((s) => s !== "")
      .join("·") || "a ratio"
  );
}

export const same = (a: Dim, b: Dim): boolean => a.kind === "q" && b.kind === "q" && a.e.every((x, i) => x === b.e[i]);
export const isDiff = (d: Dim) => d.kind === "q" && same(d, KELVIN);
export const temperatureLike = (d: Dim) => d.kind === "point" || d.kind === "temp?";
