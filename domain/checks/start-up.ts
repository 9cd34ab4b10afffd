import { cToK, kToC } from "../physics/constants.js";
import { type FosterTerm, stepFoster } from "../physics/foster.js";
import { interpolate } from "../physics/mosfet-channel.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { solveElectrical } from "../solve/electrical-point.js";
import { solveOperatingPoint, dieLossW } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import type { ConductionMode } from "../stages/conduction.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";

/** How the stage gets its drive at a given input voltage: the start and gate-drive margins. */
export interface DriveAtInput {
  readonly inputV: number;
  /** Input minus the controller's (or switch's) start voltage, V; absent where nothing must start. */
  readonly startMarginV?: number;
  /** Gate drive available, V, and its margin over the lowest characterised Rds(on) drive. */
  readonly gateSourceV?: number;
  readonly gateDriveMarginV?: number;
}

export function driveAtInput(stage: StageModel, inputV: number, dropV = 0): DriveAtInput {
  return behaviourOf(stage).driveAtInput(stage, inputV, dropV);
}

export type TransientThermal =
  | { readonly kind: "foster"; readonly terms: readonly FosterTerm[] }
  | { readonly kind: "quasi-static" };

export interface ProfileSample {
  readonly timeS: number;
  readonly supplyV: number;
  readonly mode: ConductionMode | "load-dropout" | "stage-off" | "thermal-shutdown";
  readonly loadV: number;
  readonly lossW: number;
  readonly tjC: number;
}

export interface ProfileResult {
  readonly samples: readonly ProfileSample[];
  readonly minLoadV: number;
  readonly maxTjC: number;
  /** Total time the stage conducted on its body diode (controller not running), s. */
  readonly bodyDiodeTimeS: number;
  /** Total time the load had no operating point (collapse, undervoltage, stage off, a switch held open), s. */
  readonly dropoutTimeS: number;
  /** An integrated switch: when its junction first reached its thermal shutdown along the profile, s; absent: never. */
  readonly thermalShutdownAtS?: number;
  readonly thermalModel: TransientThermal["kind"];
}

/**
 * The stage along a supply profile (voltage against time, piecewise linear): at each instant the
 * circuit is solved at the present junction temperature (electrically quasi-static), and the
 * junction follows the loss through a Foster network stepped exactly for the power held over each
 * step; without a transient model, the junction is the steady state of each instant's loss
 * (an upper bound for a dip shorter than the thermal time constants). Starts in thermal
 * equilibrium at the profile's first voltage. An integrated switch's protections with memory
 * act along it (switchGuard): its thermal shutdown (latched, or auto-retry below shutdown −
 * hysteresis) and its cut-off's hysteresis hold it open, the load unpowered (dropout).
 */
export function alongProfile(
  stage: StageModel,
  profile: readonly { readonly timeS: number; readonly voltageV: number }[],
  load: LoadModel,
  sourceResistanceOhm: number,
  ambientC: number,
  thermal: TransientThermal,
  stepsPerSegment = 40,
): ProfileResult {
  const rth = totalRthKPerW(stage.thermal);
  const first = profile[0];
  if (first === undefined) throw new Error("alongProfile: empty profile");
  const start = solveOperatingPoint({
    stage,
    supplyV: first.voltageV,
    sourceResistanceOhm,
    load,
    ambientC,
    rthKPerW: rth,
  });
  const p0 = "point" in start ? start.point.dieLossW : 0;
  let rises = thermal.kind === "foster" ? thermal.terms.map((t) => t.rKPerW * p0) : [];
  let tjK = cToK(ambientC) + (thermal.kind === "foster" ? rises.reduce((a, b) => a + b, 0) : rth * p0);
  const samples: ProfileSample[] = [];
  let bodyDiodeTimeS = 0;
  let dropoutTimeS = 0;
  const times: number[] = [];
  for (let i = 1; i < profile.length; i += 1) {
    const a = profile[i - 1];
    const b = profile[i];
    if (a === undefined || b === undefined) continue;
    for (let k = 0; k < stepsPerSegment; k += 1) times.push(a.timeS + ((b.timeS - a.timeS) * k) / stepsPerSegment);
  }
  times.push(profile[profile.length - 1]?.timeS ?? first.timeS);
  const pts = profile.map((p) => [p.timeS, p.voltageV] as const);
  const guard = switchGuard(stage);
  let held: "cut-off" | "thermal-shutdown" | undefined;
  let thermalShutdownAtS: number | undefined;
  // whether the channel conducted the instant before (a body diode below start is not shut down)
  let channelOn = true;
  for (let i = 0; i < times.length; i += 1) {
    const t = times[i] ?? 0;
    const supplyV = interpolate(pts, t);
    held = guard === undefined ? undefined : nextHeld(guard, held, supplyV, kToC(tjK), channelOn);
    if (held === "thermal-shutdown" && thermalShutdownAtS === undefined) thermalShutdownAtS = t;
    if (thermal.kind === "quasi-static" && held === undefined) {
      const q = solveOperatingPoint({ stage, supplyV, sourceResistanceOhm, load, ambientC, rthKPerW: rth });
      if ("point" in q) tjK = cToK(q.point.tjC);
      // the steady Tj of this instant's loss reaching the shutdown: the switch turns off now
      const on = "point" in q && q.point.forward.mode !== "body-diode" && q.point.forward.mode !== "junction";
      if (guard !== undefined && nextHeld(guard, held, supplyV, kToC(tjK), on) === "thermal-shutdown") {
        held = "thermal-shutdown";
        thermalShutdownAtS ??= t;
      }
    }
    // quasi-static: an open switch has no loss, its steady junction is the ambient (an auto-retrying
    // part then turns on again at the next instant, and off again if that instant's steady Tj trips it)
    if (thermal.kind === "quasi-static" && held !== undefined) tjK = cToK(ambientC);
    const e = held === undefined ? solveElectrical({ stage, supplyV, sourceResistanceOhm, load }, tjK) : undefined;
    let sample: ProfileSample;
    let lossW = 0;
    if (e === undefined) {
      // the switch held open (cut-off hysteresis, thermal shutdown): no current, the load unpowered
      sample = { timeS: t, supplyV, mode: held ?? "cut-off", loadV: 0, lossW: 0, tjC: kToC(tjK) };
    } else if (e.ok && !(load.kind === "constant-power" && e.point.loadV < load.minVoltageV)) {
      lossW = dieLossW(stage, e.point);
      sample = { timeS: t, supplyV, mode: e.point.forward.mode, loadV: e.point.loadV, lossW, tjC: kToC(tjK) };
    } else {
      sample = {
        timeS: t,
        supplyV,
        mode: e.ok || e.code === "load-collapse" ? "load-dropout" : "stage-off",
        loadV: e.ok ? e.point.loadV : 0,
        lossW: 0,
        tjC: kToC(tjK),
      };
    }
    samples.push(sample);
    channelOn = sample.mode !== "body-diode" && sample.mode !== "junction";
    const next = times[i + 1];
    if (next === undefined) break;
    const dt = next - t;
    if (sample.mode === "body-diode") bodyDiodeTimeS += dt;
    if (e === undefined || sample.mode === "load-dropout" || sample.mode === "stage-off") dropoutTimeS += dt;
    if (thermal.kind === "foster") {
      rises = stepFoster(thermal.terms, rises, lossW, dt);
      tjK = cToK(ambientC) + rises.reduce((x, y) => x + y, 0);
    }
  }
  return {
    samples,
    minLoadV: Math.min(...samples.map((s) => s.loadV)),
    maxTjC: Math.max(...samples.map((s) => s.tjC)),
    bodyDiodeTimeS,
    dropoutTimeS,
    ...(thermalShutdownAtS === undefined ? {} : { thermalShutdownAtS }),
    thermalModel: thermal.kind,
  };
}

/** An integrated switch's protections that hold it open with memory: the cut-off's hysteresis, the thermal shutdown. */
interface SwitchGuard {
  readonly cutoff: { readonly thresholdV: number; readonly reclosesBelowV: number } | undefined;
  readonly shutdown: { readonly atC: number; readonly retryBelowC?: number } | undefined;
}

function switchGuard(stage: StageModel): SwitchGuard | undefined {
  if (stage.kind !== "integrated-switch") return undefined;
  const h = stage.overvoltageHysteresisV ?? 0;
  const cutoff =
    stage.overvoltageCutoffV !== undefined && h > 0
      ? { thresholdV: stage.overvoltageCutoffV, reclosesBelowV: stage.overvoltageCutoffV - h }
      : undefined;
  const after = stage.afterThermalShutdown;
  const shutdown =
    stage.thermalShutdownC === undefined
      ? undefined
      : after?.mode === "auto-retry"
        ? { atC: stage.thermalShutdownC, retryBelowC: stage.thermalShutdownC - after.hysteresisK }
        : { atC: stage.thermalShutdownC };
  return cutoff === undefined && shutdown === undefined ? undefined : { cutoff, shutdown };
}

/**
 * Whether the switch is held open at this instant, from its state the instant before: the thermal
 * shutdown trips at its temperature (with its channel conducting) and holds (latched) or releases below shutdown − hysteresis
 * (auto-retry); the cut-off, once its input went above the threshold, holds until the input falls
 * below threshold − hysteresis (judged with the path open: the input is the supply). Above the
 * threshold itself the forward law opens the switch (integrated-switch.ts), so only the band is held here.
 */
function nextHeld(
  g: SwitchGuard,
  held: "cut-off" | "thermal-shutdown" | undefined,
  supplyV: number,
  tjC: number,
  channelOn: boolean,
): "cut-off" | "thermal-shutdown" | undefined {
  const sd = g.shutdown;
  if (sd !== undefined) {
    if (held !== "thermal-shutdown" && channelOn && tjC >= sd.atC) return "thermal-shutdown";
    if (held === "thermal-shutdown" && (sd.retryBelowC === undefined || tjC >= sd.retryBelowC)) return held;
  }
  const c = g.cutoff;
  if (c === undefined) return undefined;
  if (supplyV > c.thresholdV) return "cut-off";
  if (held === "cut-off" && supplyV >= c.reclosesBelowV) return "cut-off";
  return undefined;
}
