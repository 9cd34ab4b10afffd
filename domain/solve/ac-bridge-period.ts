import type { AcBridgeCircuit, Snapshot } from "./ac-bridge-circuit.js";
import { offDecayOf, offGain } from "./ac-bridge-off-interval.js";
import { offStep } from "./ac-bridge-off-step.js";
import { solveStage } from "./ac-bridge-stage.js";
import { BDF_COEFF, BDF_W_GAMMA, BDF_W_N, GAMMA, LTE_COEFF, TR_COEFF } from "./tr-bdf2.js";
import { accumulate, newAccumulators } from "./ac-bridge-accumulators.js";
import type { PeriodOptions, PeriodOutcome } from "./ac-bridge-period-types.js";

/**
 * Integrate the AC bridge over one period (or its first half) from state x0 at t = 0 (the rising zero of the source)
 * by TR-BDF2 with local-error step control: the error estimate is LTE_COEFF·h³·|x‴|, with x‴ from
 * the second divided difference of f on the step's three nodes. The controllers' supply is the
 * reservoir voltage at the start of each step. Steps end on the source's peaks and zero
 * crossings. While no pair conducts, a resistive or constant-current load's discharge is one
 * exact step to the located onset of conduction (ac-bridge-off-interval.ts). Integrals use the quadrature on the same nodes, so
 * the pointwise power balance e·i = R·i² + Σ v·i + ESR·iC² + vC·iC + vout·iload + L·i·di/dt
 * carries over to the period integrals.
 */
export function integratePeriod(c: AcBridgeCircuit, x0: readonly number[], opt: PeriodOptions): PeriodOutcome {
  const period = 1 / c.frequencyHz;
  const endS = opt.halfPeriod === true ? period / 2 : period;
  const scale = [opt.rtol * opt.voltageScaleV, opt.rtol * opt.currentScaleA];
  const hMax = period / 25;
  const hMin = period * 1e-12;
  const acc = newAccumulators();
  const trace: Snapshot[] = [];
  let t = 0;
  let x = [...x0];
  let laws = c.pairLaws(x[0] ?? 0);
  const first = solveStage(c, laws, 0, 0, x, 0);
  if (first === undefined) return collapse(0);
  let s0: Snapshot = first;
  // Line-current slope over the last accepted step, A/s: extrapolated warm starts for the stages.
  let slopeAps = 0;
  let rejectedLast = false;
  if (opt.record) trace.push(s0);
  // First step T/200 (two orders below the period; the controller rejects it if conduction is under way).
  let h = period / 200;
  let steps = 0;
  const n = x.length;
  const sens = opt.jacobian === true;
  // Dx = ∂x/∂x0 and Df = ∂f/∂x0 at the step's start node, n×n row-major.
  // Dx = ∂x/∂x0 and Df = ∂f/∂x0 at the step's start node, 2×2 row-major (only [0] without
  // inductance); work buffers reused across steps.
  const dx = new Float64Array([1, 0, 0, n > 1 ? 1 : 0]);
  const df = new Float64Array(4);
  const db1 = new Float64Array(4);
  const dfg = new Float64Array(4);
  const db2 = new Float64Array(4);
  // Right-hand sides of the two stages (reused; solveStage reads them before returning).
  const rhs1: number[] = n > 1 ? [0, 0] : [0];
  const rhs2: number[] = n > 1 ? [0, 0] : [0];
  if (sens) mulSInto(df, c, s0, dx, n);
  // Breakpoints at the source's peaks and zero crossings: a short conduction pulse around a
  // peak always contains a node, so a long step cannot jump over it unseen.
  const breaks = [0.25, 0.5, 0.75, 1].map((q) => q * period).filter((b) => b <= endS * (1 + 1e-12));
  let nextBreak = 0;
  const decay = opt.generalOffInterval === true ? undefined : offDecayOf(c);
  while (t < endS) {
    while ((breaks[nextBreak] ?? endS) <= t * (1 + 1e-12)) nextBreak += 1;
    const target = breaks[nextBreak] ?? endS;
    if (decay !== undefined && s0.pair === 0) {
      // No pair conducts: one exact step to the onset of conduction (or the breakpoint).
      const off = offStep(c, decay, s0, t, target, period, acc, opt.record ? trace : undefined);
      if (off === "collapse") return collapse(t);
      if (off !== undefined) {
        if (sens) {
          const g = offGain(decay, off.t - t);
          dx[0] = (dx[0] ?? 0) * g;
          dx[1] = (dx[1] ?? 0) * g;
          dx[2] = 0;
          dx[3] = 0;
          mulSInto(df, c, off, dx, n);
          df[2] = 0;
          df[3] = 0;
        }
        t = off.t >= target - period * 1e-12 ? target : off.t;
        s0 = off;
        x = stateOf(off, n);
        slopeAps = 0;
        steps += 1;
        // Conduction starts from zero current: begin it with a short step.
        if (t < target) h = Math.min(h, period / 400);
        rejectedLast = false;
        continue;
      }
    }
    let last = t + h >= target - period * 1e-12;
    if (last) h = target - t;
    // Event: with inductance the line current falls to zero at the end of conduction and then
    // stays there (the blocking bridge), a kink in di/dt that no step straddles within the error
    // estimate. Step to just past the zero the present slope predicts (5 % beyond it), so the
    // step ends in the blocking state; such a step is judged on the capacitor voltage alone.
    let event = false;
    const tolA = scale[1] ?? 0;
    if (n > 1 && s0.pair !== 0 && Math.abs(s0.lineA) > tolA) {
      const di = s0.inductorV / c.leakageInductanceH;
      const toZeroS = di * s0.lineA < 0 ? -s0.lineA / di : Number.POSITIVE_INFINITY;
      if (1.05 * toZeroS < h) {
        h = 1.05 * toZeroS;
        last = false;
        event = true;
      }
    }
    laws = c.pairLaws(x[0] ?? 0);
    const a1 = TR_COEFF * h;
    rhs1[0] = x0v(x) + a1 * rateV(c, s0);
    if (n > 1) rhs1[1] = x1a(x) + a1 * rateA(c, s0);
    const sg = solveStage(c, laws, t + GAMMA * h, a1, rhs1, s0.lineA + GAMMA * h * slopeAps);
    if (sg !== undefined) {
      rhs2[0] = BDF_W_GAMMA * sg.capV + BDF_W_N * x0v(x);
      if (n > 1) rhs2[1] = BDF_W_GAMMA * sg.lineA + BDF_W_N * x1a(x);
    }
    const s1 =
      sg === undefined
        ? undefined
        : solveStage(c, laws, t + h, BDF_COEFF * h, rhs2, sg.lineA + ((1 - GAMMA) / GAMMA) * (sg.lineA - s0.lineA));
    if (sg === undefined || s1 === undefined) {
      h /= 4;
      if (h < hMin) return collapse(t);
      continue;
    }
    let errNorm = 0;
    // Without inductance the line current is algebraic (C·dv/dt plus the load), one order less
    // accurate than the voltage, and the voltage's error does not bound it: where the loop
    // resistance is small a volt-level error in the state is a large current error (a
    // capacitor-input bridge with Rs -> 0 rang in its first conduction step, its peak 10 % high).
    // Its error is judged on its own: the TR node's current against the straight line between
    // the step's ends, (1 - g)*i0 + g*i1, a defect of g*(1 - g)*h^2*|i''|/2 on a smooth current
    // (the interpolation remainder), large across a conduction edge that the step does not resolve.
    let currentNorm = 0;
    if (n === 1 && (opt.currentRtol ?? 0) > 0 && (s0.pair !== 0 || sg.pair !== 0 || s1.pair !== 0)) {
      const defect = Math.abs(sg.capA - ((1 - GAMMA) * s0.capA + GAMMA * s1.capA));
      currentNorm = defect / ((opt.currentRtol ?? 1) * opt.currentScaleA);
    }
    // A step that ends blocked (or within the current tolerance of it) after an event step or
    // from a start already that close: the current's error is below its tolerance by bound.
    const ends = Math.abs(s1.lineA) <= tolA && (event || Math.abs(s0.lineA) <= tolA);
    const judged = n > 1 && ends ? 1 : n;
    for (let j = 0; j < judged; j += 1) {
      const f0 = j === 0 ? rateV(c, s0) : rateA(c, s0);
      const fg = j === 0 ? rateV(c, sg) : rateA(c, sg);
      const f1 = j === 0 ? rateV(c, s1) : rateA(c, s1);
      const dd = ((f1 - fg) / ((1 - GAMMA) * h) - (fg - f0) / (GAMMA * h)) / h;
      const err = LTE_COEFF * h * h * h * 2 * Math.abs(dd);
      errNorm = Math.max(errNorm, err / (scale[j] ?? 1));
    }
    if (Math.max(errNorm, currentNorm) <= 1 || h <= hMin * 4) {
      if (sens) {
        const a2 = BDF_COEFF * h;
        for (let k = 0; k < 4; k += 1) db1[k] = (dx[k] ?? 0) + a1 * (df[k] ?? 0);
        mulSInto(dfg, c, sg, db1, n);
        for (let k = 0; k < 4; k += 1)
          db2[k] = BDF_W_GAMMA * ((db1[k] ?? 0) + a1 * (dfg[k] ?? 0)) + BDF_W_N * (dx[k] ?? 0);
        mulSInto(df, c, s1, db2, n);
        for (let k = 0; k < 4; k += 1) dx[k] = (db2[k] ?? 0) + a2 * (df[k] ?? 0);
        // A blocked node's current rate is zero whatever its neighbourhood (see solveStage).
        if (n > 1 && s1.pair === 0) {
          df[2] = 0;
          df[3] = 0;
        }
      }
      accumulate(acc, c, s0, sg, s1, h);
      if (opt.record) trace.push(sg, s1);
      t = last ? target : t + h;
      x = stateOf(s1, x.length);
      slopeAps = (s1.lineA - s0.lineA) / h;
      s0 = s1;
      steps += 1;
    }
    // No growth right after a rejection (Hairer, Nørsett and Wanner, Solving ODEs I, §II.4:
    // facmax = 1 after a rejected step): the estimate is least reliable where it just failed.
    const accepted = Math.max(errNorm, currentNorm) <= 1 || h <= hMin * 4;
    // The voltage's error is third order in h, the current's defect second order.
    const grow = Math.min(
      errNorm > 0 ? 0.9 / Math.cbrt(errNorm) : 4,
      currentNorm > 0 ? 0.9 / Math.sqrt(currentNorm) : 4,
    );
    h = Math.min(hMax, h * Math.min(accepted && !rejectedLast ? 4 : 1, Math.max(0.2, grow)));
    rejectedLast = !accepted;
  }
  const jacobian =
    n > 1
      ? [
          [dx[0] ?? 0, dx[1] ?? 0],
          [dx[2] ?? 0, dx[3] ?? 0],
        ]
      : [[dx[0] ?? 0]];
  return { ok: true, end: x, integrals: acc, steps, ...(opt.record ? { trace } : {}), ...(sens ? { jacobian } : {}) };
}

/** d(capV)/dt at a node, V/s. */
function rateV(c: AcBridgeCircuit, s: Snapshot): number {
  return s.capA / c.capacitanceF;
}

/** d(lineA)/dt at a node, A/s (only with inductance). */
function rateA(c: AcBridgeCircuit, s: Snapshot): number {
  return s.inductorV / c.leakageInductanceH;
}

function x0v(x: readonly number[]): number {
  return x[0] ?? 0;
}

function x1a(x: readonly number[]): number {
  return x[1] ?? 0;
}

/** out = S·D, S = ∂f/∂b of the node (f = [capA/C, vL/L]) and D = ∂b/∂x0 (2×2 row-major). */
function mulSInto(out: Float64Array, c: AcBridgeCircuit, s: Snapshot, d: Float64Array, n: number): void {
  const cap = c.capacitanceF;
  const s00 = s.dCapAdB0 / cap;
  const s01 = n > 1 ? s.dCapAdB1 / cap : 0;
  const s10 = n > 1 ? s.dVLdB0 / c.leakageInductanceH : 0;
  const s11 = n > 1 ? s.dVLdB1 / c.leakageInductanceH : 0;
  const d00 = d[0] ?? 0;
  const d01 = d[1] ?? 0;
  const d10 = d[2] ?? 0;
  const d11 = d[3] ?? 0;
  out[0] = s00 * d00 + s01 * d10;
  out[1] = s00 * d01 + s01 * d11;
  out[2] = s10 * d00 + s11 * d10;
  out[3] = s10 * d01 + s11 * d11;
}

function collapse(atS: number): PeriodOutcome {
  return {
    ok: false,
    code: "load-collapse",
    atS,
    reason: "the reservoir voltage cannot be held: the load draws more than the source can feed through the bridge",
  };
}

function stateOf(s: Snapshot, n: number): number[] {
  return n > 1 ? [s.capV, s.lineA] : [s.capV];
}
