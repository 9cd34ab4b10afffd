import type { InrushDrive, InrushLoad } from "../checks/inrush.js";
import { type InrushResult, type InrushThermal, inrushSoa } from "../checks/inrush-soa.js";
import { stageMosfet } from "../checks/breakdown-temperature.js";
import type { TransientThermal } from "../checks/start-up.js";
import { cToK } from "../physics/constants.js";
import { channelResistanceOhm, type ChannelParams } from "../physics/mosfet-channel.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import { type SoaCheck, soaCheck } from "../checks/soa-lines.js";

/** The start-up charge of the output capacitance each candidate is put through in the review. */
export interface ReviewInrush {
  readonly capacitanceF: number;
  /** The input the output charges to, V. */
  readonly inputV: number;
  /** Loop resistance outside the stage (source, wiring, capacitor ESR), ohm. */
  readonly loopResistanceOhm: number;
  /** The dV/dt a controller's soft start or a gate RC sets, V/s; absent: the channel turns fully on at once. */
  readonly slewVPerS?: number;
  /** The current a controller holds during the charge (a hot-swap controller's limit), A; absent: the stage's own. */
  readonly controllerLimitA?: number;
  /** The load during the charge. */
  readonly load: InrushLoad;
  /** The die starts at this ambient, °C. */
  readonly ambientC: number;
}

export type ReviewInrushResult =
  | {
      readonly assessed: true;
      readonly drive: InrushDrive["kind"];
      /** The input the output charges to, V: the requirement's, or an integrated switch's cut-off below it. */
      readonly inputV: number;
      readonly result: InrushResult;
      /** A back-to-back pair: which FET the charge's drop and loss are put on (pairDissipation). */
      readonly pairDissipation?: PairDissipation;
      /** The pulse against the MOSFET's datasheet SOA lines (absent: the MOSFET gives none). */
      readonly soa?: SoaCheck;
    }
  /** Not assessed: out of scope (a diode), or a gap (no on-resistance; a slew beside a converter starting at 0 V). */
  | { readonly assessed: false; readonly scope: "out" | "gap"; readonly reason: string };

/**
 * A candidate through the inrush (inrush-soa.ts). The drive follows the stage: an integrated
 * switch's current limit or a controller's (the lower) limits (unless a given slew keeps the
 * current below it); a given slew sets dV/dt; otherwise the channel turns fully on at once and
 * the loop's resistance limits the current (the channel at its best-characterised drive and the
 * ambient's Rds(on); a back-to-back pair has both channels in series). An integrated switch with
 * an overvoltage cut-off below the input is open there: it switches on, and charges, at most at
 * its cut-off (the highest threshold where the datasheet gives one: candidate-review.ts). A diode
 * stage carries the inrush on its junction: its surge rating is not modelled here (not assessed).
 */
export function reviewInrush(inrush: ReviewInrush, stage: StageModel, thermal: TransientThermal): ReviewInrushResult {
  const channel = stageChannel(stage);
  if (channel === undefined)
    return {
      assessed: false,
      scope: "out",
      reason: "a diode stage carries the inrush on its junction: its surge current rating is not modelled",
    };
  const load = inrush.load;
  const limits = [stage.kind === "integrated-switch" ? stage.currentLimitA : undefined, inrush.controllerLimitA].filter(
    (x): x is number => x !== undefined,
  );
  const limitA = limits.length === 0 ? undefined : Math.min(...limits);
  // An integrated switch is open above its overvoltage cut-off: it can switch on at most there.
  const cutoffV = stage.kind === "integrated-switch" ? stage.overvoltageCutoffV : undefined;
  const inputV = cutoffV !== undefined && cutoffV < inrush.inputV ? cutoffV : inrush.inputV;
  const loadPeakA = loadPeakCurrentA(load, inputV);
  const slew = inrush.slewVPerS;
  const slewFits =
    slew !== undefined &&
    (limitA === undefined || (loadPeakA !== undefined && inrush.capacitanceF * slew + loadPeakA <= limitA));
  let drive: InrushDrive;
  if (slewFits && slew !== undefined) {
    if (loadPeakA === undefined)
      return {
        assessed: false,
        scope: "gap",
        reason:
          "a constant-power load with no start voltage draws P/V without bound as the output leaves 0 V: a slew cannot be held; give requirement.inrush.load with the converter's startV",
      };
    drive = { kind: "slew", slewVPerS: slew };
  } else if (limitA !== undefined) drive = { kind: "current-limit", limitA };
  else {
    const rOhm = channelResistanceOhm(channel.params, channel.gateV, cToK(inrush.ambientC));
    if (rOhm === undefined)
      return { assessed: false, scope: "gap", reason: "the channel has no on-resistance at its drive" };
    drive = { kind: "uncontrolled", channelOhm: channel.count * rOhm, loopOhm: inrush.loopResistanceOhm };
  }
  const steady = totalRthKPerW(stage.thermal);
  const th: InrushThermal =
    thermal.kind === "foster"
      ? { kind: "foster", terms: thermal.terms, steadyRthKPerW: steady }
      : { kind: "none", steadyRthKPerW: steady };
  const shutdownC = stage.kind === "integrated-switch" ? stage.thermalShutdownC : undefined;
  const result = inrushSoa({
    inputV,
    capacitanceF: inrush.capacitanceF,
    load,
    drive,
    ambientC: inrush.ambientC,
    thermal: th,
    ...(shutdownC === undefined ? {} : { thermalShutdownC: shutdownC }),
  });
  const pair = stage.kind === "nfet-back-to-back" ? pairDissipation(drive) : undefined;
  const lines = stageMosfet(stage)?.soa;
  const soa =
    lines === undefined || result.outcome === "does-not-charge"
      ? undefined
      : soaCheck(
          lines,
          {
            energyJ: result.energyJ,
            peakPowerW: result.peakPowerW,
            vdsAtPeakV: pair === "both-channels" ? result.peakPowerVdsV / channel.count : result.peakPowerVdsV,
            currentAtPeakA: result.peakPowerVdsV > 0 ? result.peakPowerW / result.peakPowerVdsV : 0,
          },
          stageTjMaxC(stage),
          inrush.ambientC,
        );
  return {
    assessed: true,
    drive: drive.kind,
    inputV,
    result,
    ...(pair === undefined ? {} : { pairDissipation: pair }),
    ...(soa === undefined ? {} : { soa }),
  };
}

/**
 * Where a back-to-back pair's inrush loss falls. Fully on at once, both channels carry the loop's
 * current: each drops half (I·R each), so each FET's SOA is read at half the drop. In a slew or at
 * a current limit the shared gate is held low: the input-side FET (drain to source) is the one in
 * its linear region; the output-side FET conducts source to drain with its body diode across it,
 * its channel enhanced by more than Vgs (its gate is referred to the lower drain), so it drops at
 * most a diode's forward voltage. The whole drop and loss are put on the input-side FET
 * (conservative: the output-side FET's few hundred mV·I are counted there too), its SOA read at
 * the whole drop and its junction through the candidate's transient network (that FET's own).
 * Checked against ngspice on the pair at a current limit (test/domain/checks/inrush-pair-spice.test.ts).
 */
export type PairDissipation = "both-channels" | "input-side-fet";

function pairDissipation(drive: InrushDrive): PairDissipation {
  return drive.kind === "uncontrolled" ? "both-channels" : "input-side-fet";
}

/**
 * The load's highest current during the charge, A: a resistor's at the input, a constant-power
 * load's where it starts (P/Vs, its draw falls as the output rises); undefined where it has no
 * bound (a constant-power load starting at 0 V).
 */
function loadPeakCurrentA(load: InrushLoad, inputV: number): number | undefined {
  if (load.kind === "none") return 0;
  if (load.kind === "constant-current") return load.currentA;
  if (load.kind === "resistive") return inputV / load.resistanceOhm;
  if (load.startV >= inputV) return 0;
  return load.startV > 0 ? load.powerW / load.startV : undefined;
}

/** The stage's channel, its full drive and how many channels the current passes in series. */
function stageChannel(
  stage: StageModel,
): { readonly params: ChannelParams; readonly gateV: number; readonly count: number } | undefined {
  if (stage.kind === "integrated-switch") return { params: stage.channel, gateV: stage.internalGateV, count: 1 };
  const m = stageMosfet(stage);
  if (m === undefined) return undefined;
  const top = m.channel.rdsOnPoints.at(-1);
  if (top === undefined) return undefined;
  return { params: m.channel, gateV: top.gateSourceV, count: stage.kind === "nfet-back-to-back" ? 2 : 1 };
}
