import { type ReverseSteadyResult, reverseSteady } from "../checks/reverse-steady.js";
import { type CornerResult, type CornerSpace, solveCorners, type WorstCase, worstCase } from "../checks/corners.js";
import {
  type MissionEnergy,
  type MissionRow,
  missionEnergy,
  type StandbyDrain,
  standbyDrain,
} from "../checks/energy.js";
import { type DriveAtInput, driveAtInput, type ProfileResult, type TransientThermal } from "../checks/start-up.js";
import type { ControllerTurnOff } from "../checks/reverse-path.js";
import { blocksReverseCurrent } from "../checks/stage-ratings.js";
import type { ThermalSizing } from "../checks/thermal-sizing.js";
import { clampLawOf } from "../checks/transient-clamp.js";
import type { TransientAllowance, TransientContext } from "../checks/transient-stress.js";
import { type SweptTransientResult, sweptTransientStress } from "../checks/transient-sweep.js";
import { gateThresholdColdV as coldThresholdV, withThresholdShift } from "../checks/gate-threshold.js";
import type { StartChatter } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { type StageScale, scaleStage, UNSCALED } from "../stages/scale-stage.js";
import { type StageModel, stageStartV } from "../stages/stage-model.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { TransientPulse } from "./transient-library.js";
import { type LoadOvervoltage, loadOvervoltage } from "../checks/load-overvoltage.js";
import { type ReviewInrush, type ReviewInrushResult, reviewInrush } from "./review-inrush.js";
import { reviewCutoffHold } from "./review-cutoff-hold.js";
import { profileAtWorstLimit } from "./review-start-profile.js";
import { type ReviewShutdownCycle, reviewShutdownCycle } from "./review-shutdown-cycle.js";
import { reviewThermalSizing } from "./review-thermal-sizing.js";
import { atHighestCutoff, atLowestCurrentLimit, type SwitchTolerance, switchRuleLimits } from "./switch-tolerance.js";
import { stressAfterLetGo } from "./pulse-stress.js";
import { type PulseBackConduction, pulseBackConduction } from "./review-pulse-back-conduction.js";
import { type ReviewTurnOff, type ReviewTurnOffResult, reviewTurnOff } from "./review-turn-off.js";

export interface ReviewRequirement {
  readonly supplyMinV: number;
  readonly supplyNominalV: number;
  readonly supplyMaxV: number;
  /** Jump-start overvoltage, V; absent where the supply has none. */
  readonly jumpStartV?: number;
  /** Long-term overvoltage (a failed regulator, about an hour), V; absent where the supply has none. */
  readonly longTermOvervoltageV?: number;
  /** Top of the abnormal service range, V; absent where the supply has none. */
  readonly abnormalMaxV?: number;
  readonly ambientMinC: number;
  readonly ambientMaxC: number;
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
  readonly loadScales: readonly number[];
  readonly loadStandbyA: number;
  /** Lowest voltage at which the load works, V (a constant-power load's own minimum otherwise). */
  readonly loadMinV?: number;
  readonly reverseV: number;
  readonly reverseDurationS: number;
  readonly transients: readonly TransientPulse[];
  readonly transientContext: Omit<TransientContext, "supplyNominalV" | "supplyMaxV" | "reverseV" | "overvoltageV">;
  readonly startProfile?: readonly { readonly timeS: number; readonly voltageV: number }[];
  readonly mission?: readonly MissionRow[];
  readonly pricePerKWh?: number;
  readonly battery?: { readonly capacityAh: number; readonly usableFraction: number };
  /** Margin below the junction limit that thermal sizing holds, K. */
  readonly tjMarginK: number;
  /** The reverse-current event every candidate is put through (absent: not reviewed). */
  readonly turnOff?: ReviewTurnOff;
  /** The start-up charge of the output capacitance every candidate is put through (absent: not reviewed). */
  readonly inrush?: ReviewInrush;
  /** Highest voltage the load withstands, V; absent: what reaches the load is reported, not checked. */
  readonly loadMaxV?: number;
}

export interface ReviewCandidate {
  readonly stage: StageModel;
  /** Transient allowances read from the rule set (absent: rating × the requirement's derating). */
  readonly transientAllowanceV?: TransientAllowance;
  readonly datasheetMax?: StageScale;
  readonly transientThermal: TransientThermal;
  /** The controller's reverse turn-off timing, for stages that turn off on reverse current. */
  readonly turnOffController?: ControllerTurnOff;
  /** The gate threshold's shift for the turn-off event (datasheet minimum − typical, V, ≤ 0); absent: typical. */
  readonly turnOffThresholdShiftV?: number;
  /** Also sample the turn-off event (turn-off-waveform.ts), for charts. */
  readonly turnOffWaveform?: boolean;
  /** An integrated switch's current limit and cut-off at their datasheet extremes (absent: typical). */
  readonly switchTolerance?: SwitchTolerance;
}

export interface CandidateReview {
  readonly corners: readonly CornerResult[];
  readonly worst: WorstCase;
  readonly startUp: {
    readonly atMinSupply: DriveAtInput;
    readonly atProfileMin?: DriveAtInput;
    readonly profiles: readonly { readonly ambientC: number; readonly result: ProfileResult }[];
    /** A corner's supply lies in the chatter band at the start threshold (electrothermal-point.ts: StartChatter). */
    readonly inChatterBand: boolean;
    /** The first such corner, by index, with its two inputs. */
    readonly chatter?: StartChatter & { readonly corner: number };
  };
  /** The start voltage the start checks used (the datasheet maximum where given), V; undefined for a stage without one. */
  readonly startVoltageV?: number;
  /**
   * The MOSFET's gate threshold at the coldest ambient (the datasheet maximum where given, moved
   * by its temperature coefficient; the die at ambient, as at a cold start), V; undefined without a MOSFET.
   */
  readonly gateThresholdColdV?: number;
  readonly reverse: ReverseSteadyResult;
  readonly transients: readonly SweptTransientResult[];
  readonly thermalSizing: ThermalSizing;
  readonly energy?: MissionEnergy;
  readonly standby: StandbyDrain;
  readonly blocksReverseCurrent: boolean;
  readonly turnOff?: ReviewTurnOffResult;
  /**
   * With the requirement's turn-off event, a P-FET or low-side N-FET candidate: each negative pulse
   * through the same event model (review-pulse-back-conduction.ts), its reverse current, charge lost
   * and output minimum.
   */
  readonly pulseBackConduction?: readonly PulseBackConduction[];
  /** The start-up charge of the output capacitance (with the requirement's inrush). */
  readonly inrush?: ReviewInrushResult;
  /** What reaches the load from the positive surges and steady overvoltages (an overvoltage cut-off opens above its threshold). */
  readonly loadOvervoltage: LoadOvervoltage;
  /** An auto-retrying integrated switch whose steady corner reaches its thermal shutdown: the on/off cycle it runs. */
  readonly thermalShutdownCycle?: ReviewShutdownCycle;
  /** The lowest current limit and cut-off threshold of an integrated switch, for its rules (switch-tolerance.ts). */
  readonly switchLimits: { readonly currentLimitA?: number; readonly overvoltageCutoffV?: number };
}

/** Every check of one candidate against the requirement. Pure; deterministic. */
export function reviewCandidate(req: ReviewRequirement, cand: ReviewCandidate): CandidateReview {
  const space: CornerSpace = {
    supplyMinV: req.supplyMinV,
    supplyNominalV: req.supplyNominalV,
    supplyMaxV: req.supplyMaxV,
    ambientMinC: req.ambientMinC,
    ambientMaxC: req.ambientMaxC,
    loadScales: req.loadScales,
    sourceResistanceOhm: req.sourceResistanceOhm,
    load: req.load,
    ...(cand.datasheetMax ? { datasheetMax: cand.datasheetMax } : {}),
    ...(cand.switchTolerance?.currentLimitMinA === undefined
      ? {}
      : { currentLimitMinA: cand.switchTolerance.currentLimitMinA }),
  };
  const corners = solveCorners(cand.stage, space);
  const worst = worstCase(corners);
  const fullScale = Math.max(...req.loadScales);

  // Start-up at the lowest supply, full load: the stage input after the source drop.
  const minCorner = corners.find(
    (c) => c.conditions.supply === "min" && c.conditions.loadScale === fullScale && "point" in c.result,
  );
  const minPoint = minCorner && "point" in minCorner.result ? minCorner.result.point : undefined;
  // The start checks take the datasheet-maximum start voltage and gate threshold where given (the
  // factors stay typical here, as the start checks had them before).
  const dm = cand.datasheetMax;
  const startStage = dm
    ? scaleStage(cand.stage, {
        ...UNSCALED,
        ...(dm.startShiftV === undefined ? {} : { startShiftV: dm.startShiftV }),
        ...(dm.thresholdShiftV === undefined ? {} : { thresholdShiftV: dm.thresholdShiftV }),
      })
    : cand.stage;
  const startVoltageV = stageStartV(startStage);
  const gateThresholdColdV = coldThresholdV(startStage, req.ambientMinC);
  const atMinSupply = driveAtInput(startStage, minPoint?.stageInputV ?? req.supplyMinV, minPoint?.forward.dropV ?? 0);
  const profiles = req.startProfile
    ? [req.ambientMinC, req.ambientMaxC].map((ambientC) => ({
        ambientC,
        result: profileAtWorstLimit(startStage, req, req.startProfile ?? [], ambientC, cand),
      }))
    : [];

  const reverse = reverseSteady(
    cand.stage,
    req.reverseV,
    req.ambientMaxC,
    behaviourOf(cand.stage).reverseLeakage(cand.stage),
  );
  // Object.assign: a literal that opens with a spread and then gets fields is V8's slow path.
  const tctx: TransientContext = Object.assign(
    {},
    req.transientContext,
    { supplyNominalV: req.supplyNominalV, supplyMaxV: req.supplyMaxV, reverseV: req.reverseV },
    steadyOvervoltageV(req) === undefined ? {} : { overvoltageV: steadyOvervoltageV(req) },
    cand.transientAllowanceV ? { allowanceV: cand.transientAllowanceV } : {},
  );
  const transients = req.transients.flatMap((p) => sweptTransientStress(cand.stage, p, tctx));
  // What reaches the load: through the cut-off at its highest threshold.
  const overAtLoad = loadOvervoltage(
    atHighestCutoff(cand.stage, cand.switchTolerance),
    req.transients,
    transients,
    tctx,
  );
  const hold = reviewCutoffHold(req, cand.stage, switchRuleLimits(cand.stage, cand.switchTolerance), overAtLoad);
  const atLoad = hold === undefined ? overAtLoad : { ...overAtLoad, hold };

  // Thermal sizing at the hot, full-load corner with the datasheet-maximum part, at the supply
  // whose corner ran hottest (every supply when none of those corners has a point).
  const sizingStage = cand.datasheetMax ? scaleStage(cand.stage, cand.datasheetMax) : cand.stage;
  // The inrush with the same datasheet-maximum part: a higher Rds(on) takes more of an uncontrolled charge's loss.
  // An integrated switch charges at its lowest current limit: the longest charge (C·V/(I_lim − I_load)),
  // from at most its highest cut-off threshold (it is open above it).
  const inrush = req.inrush
    ? reviewInrush(
        req.inrush,
        atHighestCutoff(atLowestCurrentLimit(sizingStage, cand.switchTolerance), cand.switchTolerance),
        cand.transientThermal,
      )
    : undefined;
  const shutdownCycle = reviewShutdownCycle(cand.stage, corners, cand.transientThermal);
  const sizing = reviewThermalSizing(req, cand, corners, sizingStage, fullScale);

  const eventReq = {
    load: req.load,
    ambientMaxC: req.ambientMaxC,
    ...(req.loadMinV === undefined ? {} : { loadMinV: req.loadMinV }),
  };
  const eventCand =
    cand.turnOffThresholdShiftV === undefined || cand.turnOffThresholdShiftV === 0
      ? cand
      : { ...cand, stage: withThresholdShift(cand.stage, cand.turnOffThresholdShiftV) };
  const turnOff = req.turnOff ? reviewTurnOff(req.turnOff, eventReq, eventCand, worst.tjC?.value) : undefined;
  const inputClamp = req.transientContext.inputClamp;
  const pulses = pulseBackConduction(
    req.turnOff,
    eventReq,
    eventCand.stage,
    turnOff?.tjC ?? req.ambientMaxC,
    { nominalV: req.supplyNominalV, resistanceOhm: req.sourceResistanceOhm },
    req.transients,
    transients,
    inputClamp === undefined ? undefined : clampLawOf(inputClamp),
  );
  const stressed = stressAfterLetGo(cand.stage, req.transients, transients, pulses, tctx);
  const energy = req.mission
    ? missionEnergy(cand.stage, req.mission, req.supplyNominalV, req.sourceResistanceOhm, req.load, req.pricePerKWh)
    : undefined;
  // The first corner whose supply lies in the chatter band at the start threshold: the control
  // toggles between running and below start there (the point below start is the one solved).
  const chatterCorner = corners.findIndex((c) => "point" in c.result && c.result.point.startChatter !== undefined);
  const chatterAt = corners[chatterCorner]?.result;
  const chatter =
    chatterAt && "point" in chatterAt && chatterAt.point.startChatter
      ? { inChatterBand: true, chatter: { corner: chatterCorner, ...chatterAt.point.startChatter } }
      : { inChatterBand: false };
  return {
    corners,
    worst,
    // The start check at the profile's lowest point (the crank's dip), where the start margin is least.
    startUp:
      req.startProfile && req.startProfile.length > 0
        ? {
            atMinSupply,
            atProfileMin: driveAtInput(startStage, Math.min(...req.startProfile.map((p) => p.voltageV))),
            profiles,
            ...chatter,
          }
        : { atMinSupply, profiles, ...chatter },
    ...(startVoltageV === undefined ? {} : { startVoltageV }),
    ...(gateThresholdColdV === undefined ? {} : { gateThresholdColdV }),
    reverse,
    transients: stressed,
    thermalSizing: sizing,
    ...(energy ? { energy } : {}),
    standby: standbyDrain(cand.stage, req.loadStandbyA, req.battery),
    blocksReverseCurrent: blocksReverseCurrent(cand.stage),
    ...(turnOff ? { turnOff } : {}),
    ...(pulses.length > 0 ? { pulseBackConduction: pulses } : {}),
    ...(inrush ? { inrush } : {}),
    loadOvervoltage: atLoad,
    ...(shutdownCycle ? { thermalShutdownCycle: shutdownCycle } : {}),
    switchLimits: switchRuleLimits(cand.stage, cand.switchTolerance),
  };
}

/** The supply's highest steady overvoltage (jump start, long-term overvoltage, abnormal limit), V; undefined where it has none. */
export function steadyOvervoltageV(
  req: { readonly [K in "jumpStartV" | "longTermOvervoltageV" | "abnormalMaxV"]?: number | undefined },
): number | undefined {
  const levels = [req.jumpStartV, req.longTermOvervoltageV, req.abnormalMaxV].filter(
    (v): v is number => v !== undefined,
  );
  return levels.length === 0 ? undefined : Math.max(...levels);
}
