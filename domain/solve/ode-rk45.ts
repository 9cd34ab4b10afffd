/**
 * Embedded Runge-Kutta 4(5) of Dormand and Prince (J. Comput. Appl. Math. 6, 1980), with local
 * extrapolation (the 5th-order solution is propagated) and the standard step-size controller
 * h_new = h·min(5, max(0.2, 0.9·err^(−1/5))) (Hairer, Nørsett & Wanner, Solving ODEs I, II.4).
 * err is the RMS of |y5 − y4| / (atol + rtol·|y|). An event g(t, y) = 0 ends the integration:
 * the crossing step is located by bisection on the step length (each trial a full RK step).
 *
 * The result carries localErrorSum: the component-wise sum of the |y5 − y4| estimates over the
 * accepted steps. The estimate is that of the 4th-order solution, so for the propagated
 * 5th-order one it is pessimistic; for a contracting (dissipative) system the global error is
 * bounded by the sum of the local errors.
 */
export interface Rk45Options {
  readonly rtol: number;
  readonly atol: number;
  readonly initialStepS: number;
  readonly maxStepS: number;
  readonly maxSteps: number;
  /** Stop where event(t, y) changes sign from its value at the start. */
  readonly event?: (t: number, y: readonly number[]) => number;
}

export type Rk45Outcome =
  | {
      readonly outcome: "event" | "end";
      readonly t: number;
      readonly y: readonly number[];
      readonly steps: number;
      readonly rejected: number;
      readonly localErrorSum: readonly number[];
    }
  | {
      readonly outcome: "too-many-steps" | "step-underflow" | "non-finite";
      readonly t: number;
      readonly y: readonly number[];
      readonly steps: number;
    };

type Rhs = (t: number, y: readonly number[]) => number[];

const C = [0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1, 1];
const A: readonly (readonly number[])[] = [
  [],
  [1 / 5],
  [3 / 40, 9 / 40],
  [44 / 45, -56 / 15, 32 / 9],
  [19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729],
  [9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656],
  [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84],
];
const B5 = [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84, 0];
const B4 = [5179 / 57600, 0, 7571 / 16695, 393 / 640, -92097 / 339200, 187 / 2100, 1 / 40];

/** One Dormand-Prince step: the 5th-order result and the embedded error vector. */
export function dp45Step(f: Rhs, t: number, y: readonly number[], h: number): { y5: number[]; err: number[] } {
  const k: number[][] = [];
  for (let s = 0; s < 7; s += 1) {
    const row = A[s] ?? [];
    const ys = y.map((yi, i) => yi + h * row.reduce((acc, a, j) => acc + a * (k[j]?.[i] ?? 0), 0));
    k.push(f(t + (C[s] ?? 0) * h, ys));
  }
  const y5 = y.map((yi, i) => yi + h * B5.reduce((acc, b, j) => acc + b * (k[j]?.[i] ?? 0), 0));
  const err = y.map((_, i) => h * B5.reduce((acc, b, j) => acc + (b - (B4[j] ?? 0)) * (k[j]?.[i] ?? 0), 0));
  return { y5, err };
}

export function integrateRk45(f: Rhs, t0: number, y0: readonly number[], tEnd: number, o: Rk45Options): Rk45Outcome {
  let t = t0;
  let y = [...y0];
  let h = Math.min(o.initialStepS, o.maxStepS, tEnd - t0);
  const errSum = y.map(() => 0);
  const g0 = o.event?.(t, y);
  let steps = 0;
  let rejected = 0;
  const norm = (err: readonly number[], ya: readonly number[], yb: readonly number[]): number => {
    let s = 0;
    for (let i = 0; i < err.length; i += 1) {
      const sc = o.atol + o.rtol * Math.max(Math.abs(ya[i] ?? 0), Math.abs(yb[i] ?? 0));
      s += ((err[i] ?? 0) / sc) ** 2;
    }
    return Math.sqrt(s / Math.max(err.length, 1));
  };
  while (t < tEnd) {
    if (steps >= o.maxSteps) return { outcome: "too-many-steps", t, y, steps };
    if (!(h > 1e-14 * Math.max(Math.abs(t), 1e-300))) return { outcome: "step-underflow", t, y, steps };
    h = Math.min(h, tEnd - t);
    const { y5, err } = dp45Step(f, t, y, h);
    if (!y5.every(Number.isFinite)) {
      h /= 4;
      rejected += 1;
      if (rejected > 10 * o.maxSteps) return { outcome: "non-finite", t, y, steps };
      continue;
    }
    const e = norm(err, y, y5);
    if (e <= 1) {
      if (o.event && g0 !== undefined && g0 !== 0) {
        const g1 = o.event(t + h, y5);
        if (Math.sign(g1) !== Math.sign(g0)) return locateEvent(f, o.event, g0, t, y, h, errSum, err, steps, rejected);
      }
      t += h;
      y = y5;
      for (let i = 0; i < errSum.length; i += 1) errSum[i] = (errSum[i] ?? 0) + Math.abs(err[i] ?? 0);
      steps += 1;
    } else {
      rejected += 1;
    }
    const factor = e === 0 ? 5 : Math.min(5, Math.max(0.2, 0.9 * e ** -0.2));
    h = Math.min(h * (e <= 1 ? factor : Math.min(1, factor)), o.maxStepS);
  }
  return { outcome: "end", t, y, steps, rejected, localErrorSum: errSum };
}

function locateEvent(
  f: Rhs,
  event: (t: number, y: readonly number[]) => number,
  g0: number,
  t: number,
  y: readonly number[],
  h: number,
  errSum: number[],
  lastErr: readonly number[],
  steps: number,
  rejected: number,
): Rk45Outcome {
  let lo = 0;
  let hi = h;
  let best = dp45Step(f, t, y, h);
  for (let i = 0; i < 60 && hi - lo > 1e-13 * Math.max(Math.abs(t), h); i += 1) {
    const mid = 0.5 * (lo + hi);
    const trial = dp45Step(f, t, y, mid);
    if (Math.sign(event(t + mid, trial.y5)) === Math.sign(g0)) lo = mid;
    else {
      hi = mid;
      best = trial;
    }
  }
  // The shorter step's error is below the accepted full step's; the larger one is kept.
  const sum = errSum.map((s, i) => s + Math.max(Math.abs(best.err[i] ?? 0), Math.abs(lastErr[i] ?? 0)));
  return { outcome: "event", t: t + hi, y: best.y5, steps: steps + 1, rejected, localErrorSum: sum };
}
