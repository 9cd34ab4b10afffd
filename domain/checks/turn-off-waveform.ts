import {
  extremaTimes,
  type Linear2,
  loopSystem,
  outputV,
  type RlcLoop,
  stateAt,
  type Vec2,
} from "../physics/rlc-series.js";
import { inputDecayOf, type TurnOffModel, type TurnOffOutcome } from "./turn-off-event.js";
import { clampPhaseLoop } from "./turn-off-clamp-phase.js";
import { heldStart } from "./turn-off-input-clamp.js";
import { loadLine } from "./turn-off-loop.js";

/** Time samples of the turn-off event, column by column (same length each). */
export interface TurnOffWaveform {
  readonly timeS: readonly number[];
  /** Loop current, positive forward (negative: reverse current), A. */
  readonly currentA: readonly number[];
  readonly outputV: readonly number[];
  readonly capacitorV: readonly number[];
  /** Index of the turn-off instant, shared by both phases: the clamp phase runs from it on; absent without a clamp phase. */
  readonly clampStartIndex?: number;
  readonly pointsPerPhase: number;
}

/** Default evenly spaced samples per phase (the extrema and the event instants come on top). */
export const TURN_OFF_WAVEFORM_POINTS = 200;

/**
 * The turn-off event as time samples, from the same closed form as `turnOffEvent`
 * (domain/physics/rlc-series.ts: x(t) = xp + e^(At)·(x0 − xp), exact at every sample, no
 * integration): the conduction phase [0, end of the window] on the loop with the stage in it
 * (for a stage that keeps conducting, on to the reverse peak where that comes later),
 * then — when the stage blocks with reverse current — the clamp phase on the loop with Vs + Vcl
 * as source, from the turn-off state until the current is back at zero. Each phase has `points`
 * evenly spaced samples including both ends, plus the extrema of the loop current inside it
 * (extremaTimes, so the first reverse peak is a sample, not an interpolation), the reported peak
 * time, the trip (detect) time, the turn-off instant and the window's end. Outcomes without a loop response
 * (clamp-below-drive, invalid-load-line, unstable-loop) have no waveform.
 */
export function turnOffWaveform(
  m: TurnOffModel,
  r: TurnOffOutcome,
  points = TURN_OFF_WAVEFORM_POINTS,
): TurnOffWaveform | undefined {
  if (r.outcome === "clamp-below-drive" || r.outcome === "invalid-load-line" || r.outcome === "unstable-loop")
    return undefined;
  const n = Math.max(2, Math.floor(points));
  const line = loadLine(m.load, m.outputV);
  const free: RlcLoop = {
    sourceV: m.inputAfterV,
    ...inputDecayOf(m),
    loopResistanceOhm: r.loop.totalResistanceOhm,
    inductanceH: m.loopInductanceH,
    capacitanceF: m.capacitanceF,
    esrOhm: m.esrOhm,
    loadCurrentA: line.currentA,
    loadConductanceS: line.conductanceS,
  };
  const x0: Vec2 = [r.initialCurrentA, m.outputV];
  // The input clamp's hold, as the event found it (the same function on the same loop).
  const held = heldStart(m.inputClamp, free, m.loopResistanceOhm, r.loop.stageResistanceOhm, x0);
  const loop: RlcLoop = held === undefined ? free : { ...free, hold: held.held };
  const s = loopSystem(loop);
  // A stage that keeps conducting: to the end of the window or the reverse peak past it, whichever is later.
  const endS = r.outcome === "blocks" ? r.turnOffS : Math.max(r.end.timeS, r.peakReverseTimeS);
  const extra = [
    r.peakReverseTimeS,
    ...(r.outcome === "blocks" ? (r.detectS !== undefined ? [r.detectS] : []) : [r.end.timeS]),
  ];
  const cols = { timeS: [] as number[], currentA: [] as number[], outputV: [] as number[], capacitorV: [] as number[] };
  const push = (p: RlcLoop, sys: Linear2, start: Vec2, offsetS: number, times: readonly number[]): void => {
    for (const t of times) {
      const x = stateAt(sys, start, t);
      cols.timeS.push(offsetS + t);
      cols.currentA.push(x[0]);
      cols.outputV.push(outputV(p, x));
      cols.capacitorV.push(x[1]);
    }
  };
  push(loop, s, x0, 0, phaseTimes(s, x0, endS, n, extra));
  const clamp = r.outcome === "blocks" ? r.clamp : undefined;
  if (clamp === undefined || r.outcome !== "blocks") return { ...cols, pointsPerPhase: n };
  const clampLoop: RlcLoop = clampPhaseLoop(m, loop, clamp.clampV, r.turnOffS);
  const sc = loopSystem(clampLoop);
  const xOff = stateAt(s, x0, r.turnOffS);
  // The turn-off instant closes the conduction phase and opens the clamp phase (the state is continuous).
  const clampStartIndex = cols.timeS.length - 1;
  push(clampLoop, sc, xOff, r.turnOffS, phaseTimes(sc, xOff, clamp.durationS, n, []).slice(1));
  return { ...cols, clampStartIndex, pointsPerPhase: n };
}

/** n even times on [0, end] with the current's extrema and the given instants, ascending, distinct. */
function phaseTimes(s: Linear2, x0: Vec2, end: number, n: number, extra: readonly number[]): number[] {
  if (!(end > 0)) return [0];
  const even = Array.from({ length: n }, (_, k) => (k === n - 1 ? end : (end * k) / (n - 1)));
  const ext = extremaTimes(s, x0, [1, 0], end, 64);
  const all = [...even, ...ext, ...extra.filter((t) => t >= 0 && t <= end)].sort((a, b) => a - b);
  return all.filter((t, i) => i === 0 || t > (all[i - 1] ?? 0));
}
