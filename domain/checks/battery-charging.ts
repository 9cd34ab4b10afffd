import { ocvIntegralVs, ocvV } from "../physics/battery-ocv.js";
import { cToK, kToC } from "../physics/constants.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { integrateRk45 } from "../solve/ode-rk45.js";
import { type BranchState, branchCurrent } from "../solve/series-branch.js";
import { stageTjMaxC } from "../stages/stage-model.js";
import type { ChargingModel, StopReason, ReverseCheck, ChargingOutcome } from "./battery-charging-types.js";

/**
 * Quasi-static stage temperature: Tj = Ta + Rth·P(Tj) by Picard iteration (thermal τ ≪ charge
 * time), warm-started from startK. Returns the (limited) branch and the current the loop would
 * carry without the limit, whose crossing of the limit is a kink of the charge curve.
 */
function branchAt(
  m: ChargingModel,
  socS: number,
  socT: number,
  startK: number,
): { b: BranchState; unlimitedA: number; tK: number } | undefined {
  const taK = cToK(m.ambientC);
  const rth = totalRthKPerW(m.stage.thermal);
  const vs = ocvV(m.source, socS);
  const vt = ocvV(m.target, socT);
  const rs = m.source.internalResistanceOhm;
  const rt = m.target.internalResistanceOhm;
  const lim = m.currentLimitA;
  let tK = rth === 0 ? taK : startK;
  for (let k = 0; k < 200; k += 1) {
    const free = branchCurrent(m.stage, vs, rs, vt, rt, tK);
    const b = lim !== undefined && free.currentA > lim ? branchCurrent(m.stage, vs, rs, vt, rt, tK, lim) : free;
    const next = taK + rth * b.stageLossW;
    if (Math.abs(next - tK) < 1e-9 || rth === 0) return { b, unlimitedA: free.currentA, tK: next };
    if (next > cToK(1000)) return undefined;
    tK = next;
  }
  return undefined;
}

interface RawRun {
  readonly timeS: number;
  readonly chargeC: number;
  readonly stageLossJ: number;
  readonly resistanceLossJ: number;
  readonly limiterLossJ: number;
  readonly ended: boolean;
  readonly localErrorSum: readonly number[];
  readonly steps: number;
  readonly peakTK: number;
}

type At = (q: number) => { b: BranchState; unlimitedA: number; tK: number };

function integrateCharge(m: ChargingModel, rtol: number, at: At): RawRun | string {
  const unlimitedA = (q: number): number => at(q).unlimitedA;
  const socS = (q: number): number => m.source.initialSoc - q / m.source.capacityC;
  const socT = (q: number): number => m.target.initialSoc + q / m.target.capacityC;
  let peakTK = cToK(m.ambientC);
  const margins = (q: number, i: number): number =>
    Math.min(m.stop.targetSoc - socT(q), i - m.stop.minCurrentA, socS(q) - m.stop.sourceMinSoc);
  const rhs = (_t: number, y: readonly number[]): number[] => {
    const r = at(y[0] ?? 0);
    peakTK = Math.max(peakTK, r.tK);
    return [r.b.currentA, r.b.stageLossW, r.b.resistanceLossW, r.b.limiterLossW];
  };
  // The right-hand side is smooth between kinks: OCV breakpoints and the current limit taking
  // hold or letting go. Each smooth piece is integrated on its own, ended by an event at the kink.
  let t = 0;
  let y: readonly number[] = [0, 0, 0, 0];
  const errSum = [0, 0, 0, 0];
  let steps = 0;
  for (let segment = 0; segment < 1000; segment += 1) {
    const q0 = y[0] ?? 0;
    const bpT = Math.min(...m.target.ocvPoints.map((p) => p.soc).filter((x) => x > socT(q0) + 1e-12), 2);
    const bpS = Math.max(...m.source.ocvPoints.map((p) => p.soc).filter((x) => x < socS(q0) - 1e-12), -1);
    const lim = m.currentLimitA;
    const limSign = lim === undefined ? 0 : Math.sign(unlimitedA(q0) - lim) || 1;
    const kink = (q: number): number =>
      Math.min(bpT - socT(q), socS(q) - bpS, lim === undefined ? 1 : limSign * (unlimitedA(q) - lim));
    const res = integrateRk45(rhs, t, y, m.stop.maxTimeS, {
      rtol,
      atol: 1e-9 * m.target.capacityC,
      initialStepS: Math.min(1, m.stop.maxTimeS - t),
      maxStepS: m.stop.maxTimeS / 20,
      maxSteps: 200_000,
      event: (_t, yy) => Math.min(margins(yy[0] ?? 0, at(yy[0] ?? 0).b.currentA), kink(yy[0] ?? 0)),
    });
    if (res.outcome !== "event" && res.outcome !== "end")
      return `the adaptive integration stopped: ${res.outcome} at t = ${res.t} s`;
    res.localErrorSum.forEach((e, i) => {
      errSum[i] = (errSum[i] ?? 0) + e;
    });
    steps += res.steps;
    t = res.t;
    y = res.y;
    const q = y[0] ?? 0;
    if (res.outcome === "end" || !(margins(q, at(q).b.currentA) > 0)) {
      return {
        timeS: t,
        chargeC: q,
        stageLossJ: y[1] ?? 0,
        resistanceLossJ: y[2] ?? 0,
        limiterLossJ: y[3] ?? 0,
        ended: res.outcome === "end",
        localErrorSum: errSum,
        steps,
        peakTK,
      };
    }
  }
  return "more than 1000 smooth pieces: the charge current keeps switching";
}

/**
 * Battery-to-battery charging through a stage, integrated over time with Dormand-Prince 4(5)
 * (solve/ode-rk45.ts). State: charge moved q, stage, resistance and current-limiter loss energy.
 * The current at each instant solves OCV_s − I·R_s − drop(I) = OCV_t + I·R_t, capped at the
 * limit (solve/series-branch.ts), the stage temperature quasi-static. Energy balance (checked,
 * not imposed): ∫OCV_s dq (exact on the OCV points) = ∫OCV_t dq + all losses.
 * Error bound, per answer: the larger of (a) the sum of the embedded local error estimates
 * (for time: over the final current, since δt = δq/I at the stop) and (b) twice the change when
 * the run is repeated at a tenth of the tolerance (global error ∝ tolerance, so the change is
 * 0.9 of the coarse run's error). (b) covers the kinks of the right-hand side (OCV breakpoints,
 * the current limit taking hold), where the local estimates are not reliable.
 */
export function chargeBattery(m: ChargingModel): ChargingOutcome {
  const socS = (q: number): number => m.source.initialSoc - q / m.source.capacityC;
  const socT = (q: number): number => m.target.initialSoc + q / m.target.capacityC;
  let failed: string | undefined;
  // The event function and the next step's first stage ask for the same q: a small memo.
  const memo = new Map<number, { b: BranchState; unlimitedA: number; tK: number }>();
  let lastK = cToK(m.ambientC);
  const at: At = (q) => {
    const hit = memo.get(q);
    if (hit !== undefined) return hit;
    const r = branchAt(m, socS(q), socT(q), lastK);
    if (r === undefined) {
      failed = "the stage junction has no stable temperature (thermal runaway) at this current";
      return {
        b: {
          currentA: 0,
          stageV: 0,
          stageLossW: 0,
          resistanceLossW: 0,
          limiterLossW: 0,
          mode: "idle",
          blocks: false,
          currentLimited: false,
        },
        unlimitedA: 0,
        tK: cToK(m.ambientC),
      };
    }
    lastK = r.tK;
    if (memo.size > 64) memo.clear();
    memo.set(q, r);
    return r;
  };
  const i0 = at(0).b.currentA;
  if (failed !== undefined) return { outcome: "thermal-runaway", reason: failed };
  if (!(Math.min(m.stop.targetSoc - socT(0), i0 - m.stop.minCurrentA, socS(0) - m.stop.sourceMinSoc) > 0)) {
    return {
      outcome: "no-charge",
      reason: `no charging at the start: current ${i0.toPrecision(4)} A against the taper ${m.stop.minCurrentA} A, or a SoC limit already reached`,
      initialCurrentA: i0,
      reverse: reverseCheck(m, socT(0)),
    };
  }
  const run = integrateCharge(m, m.rtol, at);
  const fine = integrateCharge(m, m.rtol / 10, at);
  if (failed !== undefined) return { outcome: "thermal-runaway", reason: failed };
  if (typeof run === "string") return { outcome: "integration-failed", reason: run };
  if (typeof fine === "string") return { outcome: "integration-failed", reason: fine };
  const q = run.chargeC;
  const end = at(q).b;
  const stoppedBy: StopReason = run.ended ? "time-limit" : stopReason(m, socS(q), socT(q), end.currentA);
  const capT = m.target.capacityC;
  const sourceOutJ = m.source.capacityC * ocvIntegralVs(m.source, socS(q), m.source.initialSoc);
  const targetInJ = capT * ocvIntegralVs(m.target, m.target.initialSoc, socT(q));
  const losses = run.stageLossJ + run.resistanceLossJ + run.limiterLossJ;
  const chargeBound = Math.max(run.localErrorSum[0] ?? 0, 2 * Math.abs(fine.chargeC - q));
  const timeLocal =
    stoppedBy === "time-limit" ? 0 : (run.localErrorSum[0] ?? 0) / Math.max(Math.abs(end.currentA), 1e-300);
  return {
    outcome: "charged",
    stoppedBy,
    timeS: run.timeS,
    chargeMovedC: q,
    finalSourceSoc: socS(q),
    finalTargetSoc: socT(q),
    finalCurrentA: end.currentA,
    energy: {
      sourceOutJ,
      targetInJ,
      stageLossJ: run.stageLossJ,
      resistanceLossJ: run.resistanceLossJ,
      limiterLossJ: run.limiterLossJ,
      balanceResidual: (sourceOutJ - targetInJ - losses) / Math.max(Math.abs(sourceOutJ), 1e-300),
    },
    errorBound: {
      chargeC: chargeBound,
      targetSoc: chargeBound / capT,
      timeS: Math.max(timeLocal, 2 * Math.abs(fine.timeS - run.timeS)),
      stageLossJ: Math.max(run.localErrorSum[1] ?? 0, 2 * Math.abs(fine.stageLossJ - run.stageLossJ)),
    },
    peakStageTjC: kToC(run.peakTK),
    stageTjMaxC: stageTjMaxC(m.stage),
    overTemperature: kToC(run.peakTK) > stageTjMaxC(m.stage),
    steps: run.steps,
    reverse: reverseCheck(m, socT(q)),
  };
}

function stopReason(m: ChargingModel, sS: number, sT: number, i: number): StopReason {
  const c: [StopReason, number][] = [
    ["target-soc", m.stop.targetSoc - sT],
    ["taper-current", i - m.stop.minCurrentA],
    ["source-soc-floor", sS - m.stop.sourceMinSoc],
  ];
  return c.reduce((a, b) => (b[1] < a[1] ? b : a))[0];
}

/**
 * Can the target drain the source? The source at the bottom of its OCV curve (a flat battery)
 * against the target at the given SoC, through the same stage at ambient temperature.
 */
export function reverseCheck(m: ChargingModel, targetSoc: number): ReverseCheck {
  const sourceOcvV = ocvV(m.source, 0);
  const targetOcvV = ocvV(m.target, targetSoc);
  const b = branchCurrent(
    m.stage,
    sourceOcvV,
    m.source.internalResistanceOhm,
    targetOcvV,
    m.target.internalResistanceOhm,
    cToK(m.ambientC),
  );
  return { sourceOcvV, targetOcvV, backCurrentA: -b.currentA, blocks: b.blocks || b.currentA >= 0, mode: b.mode };
}
