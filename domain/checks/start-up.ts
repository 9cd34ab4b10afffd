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
  readonly mode: ConductionMode | "load-dropout" | "stage-off";
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
  /** Total time the load had no operating point (collapse, undervoltage, stage off), s. */
  readonly dropoutTimeS: number;
  readonly thermalModel: TransientThermal["kind"];
}

/**
 * The stage along a supply profile (voltage against time, piecewise linear): at each instant the
 * circuit is solved at the present junction temperature (electrically quasi-static), and the
 * junction follows the loss through a Foster network stepped exactly for the power held over each
 * step; without a transient model, the junction is the steady state of each instant's loss
 * (an upper bound for a dip shorter than the thermal time constants). Starts in thermal
 * equilibrium at the profile's first voltage.
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
  for (let i = 0; i < times.length; i += 1) {
    const t = times[i] ?? 0;
    const supplyV = interpolate(pts, t);
    if (thermal.kind === "quasi-static") {
      const q = solveOperatingPoint({ stage, supplyV, sourceResistanceOhm, load, ambientC, rthKPerW: rth });
      if ("point" in q) tjK = cToK(q.point.tjC);
    }
    const e = solveElectrical({ stage, supplyV, sourceResistanceOhm, load }, tjK);
    let sample: ProfileSample;
    let lossW = 0;
    if (e.ok && !(load.kind === "constant-power" && e.point.loadV < load.minVoltageV)) {
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
    const next = times[i + 1];
    if (next === undefined) break;
    const dt = next - t;
    if (sample.mode === "body-diode") bodyDiodeTimeS += dt;
    if (sample.mode === "load-dropout" || sample.mode === "stage-off") dropoutTimeS += dt;
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
    thermalModel: thermal.kind,
  };
}
