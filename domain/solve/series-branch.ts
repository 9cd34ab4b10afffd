import { type DiodeParams, diodeCurrentA, diodeVoltageV, emissionVoltageV } from "../physics/diode.js";
import { junctionLeakageA, type LeakagePoint } from "../checks/reverse-steady.js";
import { stageForward } from "../stages/forward.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";
import { bracketedRoot } from "./root-find.js";

/** How a branch conducts: forward through the stage, or backwards (and then how). */
export type BranchMode =
  | "forward"
  | "forward-body-diode-subthreshold"
  | "idle"
  | "reverse-junction-leakage"
  | "reverse-channel"
  | "reverse-blocked-ideal";

export interface BranchState {
  /** Current from the left terminal to the right one, A (negative: reverse). */
  readonly currentA: number;
  /** Stage voltage, left side minus right side, V. */
  readonly stageV: number;
  readonly stageLossW: number;
  readonly resistanceLossW: number;
  /** Heat in the current limiter: I·(excess voltage it drops) when the limit holds, W. */
  readonly limiterLossW: number;
  readonly mode: BranchMode;
  readonly forwardMode?: string;
  /** A reverse current is stopped by a junction or a controller (not a conducting channel). */
  readonly blocks: boolean;
  readonly currentLimited: boolean;
}

/**
 * A source of voltage leftV behind leftOhm, a stage, and a sink of voltage rightV behind
 * rightOhm, in series, at junction temperature tK. Forward (leftV > rightV): the current solves
 * leftV − rightV = I·(leftOhm + rightOhm) + drop(I) with the stage's forward model
 * (stages/forward.ts), capped at limitA. An ideal-diode controller regulating its drop to Vreg
 * releases the gate below Vreg: the body diode then carries the (sub-threshold) current.
 * Reverse (rightV > leftV): the stage's reverse law I(v) against the same loop —
 *   diode: the Shockley equation at negative bias (leakage → −Is(T));
 *   P-FET: the channel at |Vgs| = rightV (gate at ground, source on the output side) conducts;
 *   low-side N-FET: the channel at Vgs = leftV (gate held by the source side) conducts if on;
 *   ideal-diode controller: in steady state its gate is off in reverse: body-diode leakage;
 *   integrated switch: a plain switch (blocksReverseCurrent false) conducts through its channel;
 *   a blocking one leaks through its body diode, or not at all for back-to-back FETs.
 */
export function branchCurrent(
  stage: StageModel,
  leftV: number,
  leftOhm: number,
  rightV: number,
  rightOhm: number,
  tK: number,
  limitA?: number,
): BranchState {
  const rt = leftOhm + rightOhm;
  const dv = leftV - rightV;
  const make = (
    i: number,
    v: number,
    mode: BranchMode,
    blocks: boolean,
    limited: boolean,
    forwardMode?: string,
  ): BranchState => ({
    currentA: i,
    stageV: v,
    stageLossW: Math.abs(i * v),
    resistanceLossW: i * i * rt,
    limiterLossW: limited ? Math.max(0, i * (dv - i * rt - v)) : 0,
    mode,
    blocks,
    currentLimited: limited,
    ...(forwardMode === undefined ? {} : { forwardMode }),
  });
  if (dv === 0) return make(0, 0, "idle", false, false);
  if (dv > 0) {
    const drop = (i: number): { dropV: number; mode: string } => {
      const s = stageForward(stage, i, tK, leftV - i * leftOhm);
      // An "off" stage (below its start voltage, or opened by its cut-off) is given a drop beyond the available voltage.
      return { dropV: s.mode === "off" || s.mode === "cut-off" ? dv + 1 : s.dropV, mode: s.mode };
    };
    const hi = dv / rt;
    const g = (i: number): number => dv - i * rt - drop(i).dropV;
    const g0 = g(0);
    const idleMode = drop(0).mode;
    if (idleMode === "off" || idleMode === "cut-off") return make(0, dv, "idle", true, false, idleMode);
    const cap = (i: number): { i: number; limited: boolean } =>
      limitA !== undefined && i > limitA ? { i: limitA, limited: true } : { i, limited: false };
    const body = releasedGateDiode(stage);
    const gb = (x: number): number => dv - x * rt - (body === undefined ? 0 : diodeVoltageV(body, x, tK));
    // Body diode alone with the gate released: it carries the current while its drop is below
    // the regulation point, i.e. while it carries more than the regulated channel would.
    const iBody = body === undefined ? 0 : bracketedRoot(gb, 0, hi, gb(0), gb(hi), 1e-15 * hi, 400).x;
    const iOn = g0 > 0 ? bracketedRoot(g, 0, hi, g0, g(hi), 1e-15 * hi, 400).x : 0;
    if (iOn >= iBody && g0 > 0) {
      const c = cap(iOn);
      const d = drop(c.i);
      return make(c.i, d.dropV, "forward", false, c.limited, d.mode);
    }
    if (body === undefined) return make(0, dv, "idle", false, false);
    const c = cap(iBody);
    return make(c.i, diodeVoltageV(body, c.i, tK), "forward-body-diode-subthreshold", false, c.limited, "body-diode");
  }
  const rev = reverseLaw(stage, leftV, rightV, tK);
  if (rev.kind === "ideal-block") return make(0, dv, "reverse-blocked-ideal", true, false);
  const h = (v: number): number => rev.currentA(v) - (dv - v) / rt;
  const v = bracketedRoot(h, dv, 0, h(dv), h(0), 1e-15 * Math.abs(dv), 400).x;
  return make(
    rev.currentA(v),
    v,
    rev.kind === "channel" ? "reverse-channel" : "reverse-junction-leakage",
    rev.kind !== "channel",
    false,
  );
}

type ReverseLaw =
  | { readonly kind: "channel" | "junction"; readonly currentA: (v: number) => number }
  | { readonly kind: "ideal-block" };

function reverseLaw(stage: StageModel, leftV: number, rightV: number, tK: number): ReverseLaw {
  const c = behaviourOf(stage).reverseConduction(stage, leftV, rightV, tK);
  switch (c.kind) {
    case "junction": {
      const { diode, leakage } = c;
      return { kind: "junction", currentA: (v) => reverseJunctionA(diode, v, tK, leakage) };
    }
    case "channel": {
      const { ohm, bodyDiode } = c;
      if (bodyDiode === undefined) return { kind: "channel", currentA: (v) => v / ohm };
      return { kind: "channel", currentA: (v) => v / ohm + diodeCurrentA(bodyDiode, v, tK) };
    }
    case "ideal-block":
      return c;
  }
}

/**
 * Junction current at stage voltage v ≤ 0: the Shockley equation, or — with a datasheet leakage
 * point — that point scaled by Is(T)/Is(T_point) (reverse-steady.ts) and shaped by
 * (1 − e^(−|v|/(n·Vt))) so it falls continuously to zero at zero bias.
 */
export function reverseJunctionA(d: DiodeParams, v: number, tK: number, point?: LeakagePoint): number {
  if (point === undefined || v >= 0) return diodeCurrentA(d, v, tK);
  const shape = -Math.expm1(v / emissionVoltageV(d, tK));
  return -junctionLeakageA(d, -v, tK, point) * shape;
}

/** The diode that conducts when a regulating controller releases the gate. */
function releasedGateDiode(stage: StageModel): DiodeParams | undefined {
  return behaviourOf(stage).releasedGateDiode(stage);
}
