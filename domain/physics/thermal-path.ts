/**
 * Steady-state thermal path from junction to ambient, JEDEC JESD51 definitions: either θJA as
 * one figure, or the series chain θJC + θCS + θSA (junction-case, case-sink, sink-ambient).
 */
export type ThermalPath =
  | { readonly kind: "junction-ambient"; readonly rthJaKPerW: number }
  | {
      readonly kind: "junction-case-sink";
      readonly rthJcKPerW: number;
      readonly rthCsKPerW: number;
      readonly rthSaKPerW: number;
    };

/** Total junction-to-ambient thermal resistance, K/W. */
export function totalRthKPerW(path: ThermalPath): number {
  return path.kind === "junction-ambient" ? path.rthJaKPerW : path.rthJcKPerW + path.rthCsKPerW + path.rthSaKPerW;
}
