import { describe, expect, it } from "vitest";
import { gaussLegendre, gaussLegendreEach } from "../../../domain/physics/rlc-series.js";

// The composite 5-point Gauss-Legendre rule written out here, one integrand at a time, as
// rlc-series.ts defined it before it took several integrands at once (nodes and weights: the
// 5-point rule's closed form, ±√(5 ∓ 2√(10/7))/3 and (322 ± 13√70)/900, 128/225).
function oneAtATime(f: (t: number) => number, a: number, b: number, n: number): number {
  const xs = [0, -0.5384693101056831, 0.5384693101056831, -0.906179845938664, 0.906179845938664];
  const ws = [0.5688888888888889, 0.4786286704993665, 0.4786286704993665, 0.2369268850561891, 0.2369268850561891];
  const h = (b - a) / n;
  let sum = 0;
  for (let i = 0; i < n; i += 1) {
    const mid = a + (i + 0.5) * h;
    for (let j = 0; j < 5; j += 1) sum += (ws[j] ?? 0) * f(mid + 0.5 * h * (xs[j] ?? 0));
  }
  return 0.5 * h * sum;
}

const integrands: ((t: number) => number)[] = [
  (t) => Math.exp(-t / 3e-3) * Math.sin(2e3 * t),
  (t) => (1 - t) ** 2,
  (t) => 1 / (1 + 1e4 * t),
];

describe("gaussLegendreEach: several integrands in one pass", () => {
  it("gives each integrand's sum bit for bit as the rule one integrand at a time", () => {
    for (const [a, b, n] of [
      [0, 1e-3, 200],
      [2e-4, 5e-2, 1234],
      [0, 1, 7],
    ] as const) {
      const all = gaussLegendreEach(
        (t, out) => {
          integrands.forEach((f, k) => {
            out[k] = f(t);
          });
        },
        a,
        b,
        n,
        integrands.length,
      );
      integrands.forEach((f, k) => {
        expect(all[k]).toBe(oneAtATime(f, a, b, n));
        expect(gaussLegendre(f, a, b, n)).toBe(oneAtATime(f, a, b, n));
      });
    }
  });

  it("is exact for a polynomial of degree 9 (closed form: ∫₀² t⁹ dt = 2¹⁰/10)", () => {
    expect(gaussLegendre((t) => t ** 9, 0, 2, 1)).toBeCloseTo(102.4, 10);
    // and not for degree 10, which the 5-point rule does not integrate exactly: 2¹¹/11
    expect(Math.abs(gaussLegendre((t) => t ** 10, 0, 2, 1) - 2048 / 11)).toBeGreaterThan(1e-6);
  });
});
