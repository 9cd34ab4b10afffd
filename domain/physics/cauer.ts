import { mathjs } from "../rules/mathjs-bundle.js";
import type { FosterTerm } from "./foster.js";

/**
 * One stage of a Cauer (ladder) thermal network, junction first: the heat capacity Ci from node i
 * to ambient and the resistance Ri from node i to node i+1 (the last one to ambient). Unlike a
 * Foster network's, its nodes are physical, so a heatsink is cascaded by appending stages.
 */
export interface CauerStage {
  readonly rKPerW: number;
  readonly cJPerK: number;
}

/**
 * The Foster network with the same junction step response as a Cauer ladder (docs/references.md,
 * Thermal). The ladder obeys C·dT/dt = −G·T + P·e1 with G the tridiagonal conductance matrix; with
 * y = C^½·T, A = C^−½·G·C^−½ is symmetric, A = V·Λ·Vᵀ (mathjs eigs), and
 *   Zth(t) = Σi (V1i² / (C1·λi))·(1 − e^(−λi·t)),
 * so Ri = V1i²/(C1·λi) and τi = 1/λi; ΣRi = ΣR of the ladder (the steady path).
 */
export function cauerToFoster(ladder: readonly CauerStage[]): FosterTerm[] {
  const n = ladder.length;
  const g = ladder.map((s) => 1 / s.rKPerW);
  const a: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n; i++) {
    const ci = ladder[i]?.cJPerK ?? 1;
    const own = (g[i] ?? 0) + (i > 0 ? (g[i - 1] ?? 0) : 0);
    (a[i] as number[])[i] = own / ci;
    if (i + 1 < n) {
      const off = -(g[i] ?? 0) / Math.sqrt(ci * (ladder[i + 1]?.cJPerK ?? 1));
      (a[i] as number[])[i + 1] = off;
      (a[i + 1] as number[])[i] = off;
    }
  }
  const c1 = ladder[0]?.cJPerK ?? 1;
  if (n === 1) return [{ rKPerW: ladder[0]?.rKPerW ?? 0, tauS: (ladder[0]?.rKPerW ?? 0) * c1 }];
  const { eigenvectors } = mathjs().eigs(a) as unknown as { eigenvectors: { value: number; vector: number[] }[] };
  return eigenvectors
    .map(({ value, vector }) => {
      const norm = vector.reduce((s, x) => s + x * x, 0);
      return { rKPerW: (vector[0] ?? 0) ** 2 / norm / c1 / value, tauS: 1 / value };
    })
    .sort((x, y) => x.tauS - y.tauS);
}
