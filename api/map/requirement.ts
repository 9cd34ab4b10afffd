import type { Requirement } from "../../contracts/requirement.js";
import type { ReviewRequirement } from "../../domain/review/candidate-review.js";
import type { ReviewTurnOff } from "../../domain/review/review-turn-off.js";
import type { ParallelLoad } from "../../domain/checks/clamp-energy.js";
import type { ClampPowerRating } from "../../domain/checks/clamp-rating.js";
import type { InputClamp } from "../../domain/checks/transient-stress.js";
import {
  builtInProfile,
  type ProfilePoint,
  repeatedProfile,
  START_PROFILES,
} from "../../domain/checks/start-profiles.js";
import { findSupplyClass, SUPPLY_CLASSES, type SupplyClass } from "../../domain/review/supply-classes.js";
import { findTransient, TRANSIENT_LIBRARY, type TransientPulse } from "../../domain/review/transient-library.js";
import { unknownIdMessage } from "../../contracts/zod-messages.js";
import { inputProblem } from "../input-problem.js";
import { missingQrrSentence, ONE_OFF_EVENT } from "./reverse-inputs.js";
import { reviewInrushOf } from "./inrush-requirement.js";

/** Defaults of the design review [common practice], each recorded in `assumptions` when used. */
export const REVIEW_DEFAULTS = {
  loadLevels: [1, 0.1],
  deratingFactor: 0.8,
  clampToStandoffRatio: 1.3,
  tjMarginK: 25,
} as const;

export interface MappedRequirement {
  readonly model: ReviewRequirement;
  readonly supplyClass: string;
  readonly sources: string[];
}

/** Contract requirement → domain requirement: resolves the supply class and transients. */
export function toReviewRequirement(r: Requirement, assumptions: string[]): MappedRequirement {
  let cls: SupplyClass | undefined;
  if (r.supply.class !== "custom") {
    cls = findSupplyClass(r.supply.class);
    if (cls === undefined)
      throw inputProblem(
        "invalid-input",
        ["requirement", "supply", "class"],
        unknownIdMessage("supply class", r.supply.class, [...SUPPLY_CLASSES.map((c) => c.id), "custom"]),
      );
  }
  const minV = r.supply.minV ?? cls?.minV ?? 0;
  const nominalV = r.supply.nominalV ?? cls?.nominalV ?? 0;
  const maxV = r.supply.maxV ?? cls?.maxV ?? 0;
  if (!(minV <= nominalV && nominalV <= maxV)) {
    throw inputProblem(
      "invalid-input",
      ["requirement", "supply"],
      `supply must satisfy min ≤ nominal ≤ max (got ${minV}, ${nominalV}, ${maxV})`,
    );
  }
  // The class's jump start only where it lies above the (possibly overridden) highest supply.
  const jumpStartV =
    r.supply.jumpStartV ?? (cls?.jumpStartV !== undefined && cls.jumpStartV >= maxV ? cls.jumpStartV : undefined);
  if (jumpStartV !== undefined && !(jumpStartV >= maxV))
    throw inputProblem(
      "invalid-input",
      ["requirement", "supply", "jumpStartV"],
      `the jump-start voltage must be at least the highest steady supply (${maxV} V); got ${jumpStartV} V`,
    );
  const longTermOvervoltageV = overvoltageOf(
    r.supply.longTermOvervoltageV,
    cls?.longTermOvervoltageV,
    maxV,
    "longTermOvervoltageV",
    "long-term overvoltage",
  );
  const abnormalMaxV = overvoltageOf(
    r.supply.abnormalMaxV,
    cls?.abnormalMaxV,
    maxV,
    "abnormalMaxV",
    "abnormal service limit",
  );
  const sources: string[] = [];
  if (cls) sources.push(`${cls.id}: ${cls.source}`);
  const reverseV = r.reverse?.voltageV ?? cls?.reverseV ?? maxV;
  const reverseDurationS = r.reverse?.durationS ?? cls?.reverseDurationS ?? 60;
  if (r.reverse === undefined)
    assumptions.push(
      cls
        ? `reverse polarity ${reverseV} V for ${reverseDurationS} s from the supply class`
        : `reverse polarity: the custom maximum ${maxV} V reversed (common practice)`,
    );

  const pulses: TransientPulse[] = [];
  const wanted = r.transients ?? cls?.transients ?? [];
  if (r.transients === undefined)
    assumptions.push(
      `requirement.transients: ${cls ? `the supply class's set (${wanted.join(", ") || "none"})` : "none (a custom supply has no default set)"} (default)`,
    );
  if (r.sourceResistanceOhm === undefined)
    assumptions.push("requirement.sourceResistanceOhm: 0 ohm (default: no source or wiring resistance)");
  if (r.loadStandbyA === undefined) assumptions.push("requirement.loadStandbyA: 0 A (default)");
  if (r.outputHeldV === undefined)
    assumptions.push(`requirement.outputHeldV: the nominal supply ${nominalV} V (default)`);
  wanted.forEach((t, i) => {
    if (typeof t === "string" || "builtIn" in t) {
      const id = typeof t === "string" ? t : t.builtIn;
      const p = findTransient(id);
      if (p === undefined)
        throw inputProblem(
          "invalid-input",
          typeof t === "string" ? ["requirement", "transients", i] : ["requirement", "transients", i, "builtIn"],
          unknownIdMessage(
            "built-in transient",
            id,
            TRANSIENT_LIBRARY.map((x) => x.id),
          ),
        );
      const repetition =
        typeof t === "string" ? p.repetition : { ...t.repetition, source: "the test's own, given by the caller" };
      pulses.push(repetition === undefined ? p : { ...p, repetition });
      sources.push(`${p.id}: ${p.source}`);
      if (repetition !== undefined) sources.push(`${p.id} repetition: ${repetition.source}`);
    } else {
      pulses.push({
        id: t.id,
        title: t.title ?? t.id,
        baseV: t.baseV,
        amplitudeV: t.amplitudeV,
        sourceResistanceOhm: t.sourceResistanceOhm,
        riseS: t.riseS ?? 0,
        decayS: t.decayS,
        decayConvention: t.decayConvention ?? "to-10-percent",
        ...(t.clampedAtV === undefined ? {} : { clampedAtV: t.clampedAtV }),
        ...(t.repetition === undefined ? {} : { repetition: { ...t.repetition, source: "given by the caller" } }),
        source: "given by the caller",
      });
    }
  });
  const loadLevels = r.loadLevels ?? [...REVIEW_DEFAULTS.loadLevels];
  if (r.loadLevels === undefined) assumptions.push("load levels 100 % and 10 % of full load (default)");
  const deratingFactor = r.deratingFactor ?? REVIEW_DEFAULTS.deratingFactor;
  if (r.deratingFactor === undefined) {
    assumptions.push(
      "clamp window: each part's transient allowance from the rule set's transient rules; 80 % of the rating where no rule bounds it (common practice)",
    );
  }
  const tjMarginK = r.tjMarginK ?? REVIEW_DEFAULTS.tjMarginK;
  if (r.tjMarginK === undefined) assumptions.push("thermal sizing holds Tj(max) − 25 K (common practice)");
  const loadMinV = r.loadMinV ?? (r.load.kind === "constant-power" ? r.load.minVoltageV : undefined);
  if (r.loadMinV === undefined) {
    assumptions.push(
      loadMinV === undefined
        ? "requirement.loadMinV: not given and the load has no minimum of its own: no rule reads the load's minimum voltage"
        : `requirement.loadMinV: the constant-power load's minVoltageV ${loadMinV} V (default)`,
    );
  }

  return {
    supplyClass: cls?.id ?? "custom",
    sources,
    model: {
      supplyMinV: minV,
      supplyNominalV: nominalV,
      supplyMaxV: maxV,
      ...(jumpStartV === undefined ? {} : { jumpStartV }),
      ...(longTermOvervoltageV === undefined ? {} : { longTermOvervoltageV }),
      ...(abnormalMaxV === undefined ? {} : { abnormalMaxV }),
      ambientMinC: r.ambient.minC,
      ambientMaxC: r.ambient.maxC,
      sourceResistanceOhm: r.sourceResistanceOhm ?? 0,
      load: r.load,
      loadScales: loadLevels,
      loadStandbyA: r.loadStandbyA ?? 0,
      ...(loadMinV === undefined ? {} : { loadMinV }),
      reverseV,
      reverseDurationS,
      transients: pulses,
      transientContext: {
        outputHeldV: r.outputHeldV ?? nominalV,
        deratingFactor,
        clampToStandoffRatio: REVIEW_DEFAULTS.clampToStandoffRatio,
        ...(r.inputClamp ? { inputClamp: inputClampOf(r.inputClamp, assumptions), clampTjC: r.ambient.maxC } : {}),
        ...(r.inputClamp ? { parallelLoad: parallelLoadOf(r.load, r.inputClamp.clampV) } : {}),
      },
      ...(r.startProfile ? { startProfile: startProfileOf(r.startProfile, sources, assumptions) } : {}),
      ...(r.mission
        ? {
            mission: r.mission.map((m) => ({
              hoursPerYear: m.hoursPerYear,
              loadScale: m.loadLevel,
              ambientC: m.ambientC,
            })),
          }
        : {}),
      ...(r.energyPricePerKWh === undefined ? {} : { pricePerKWh: r.energyPricePerKWh }),
      ...(r.battery ? { battery: r.battery } : {}),
      tjMarginK,
      ...(r.turnOff ? { turnOff: reviewTurnOffOf(r.turnOff, nominalV, assumptions) } : {}),
      ...(r.inrush ? { inrush: reviewInrushOf(r, r.inrush, maxV, assumptions) } : {}),
      ...(r.loadMaxV === undefined ? {} : { loadMaxV: r.loadMaxV }),
    },
  };
}

/** The start-up profile as points: given, or a built-in one, repeated for several cranks (start-profiles.ts). */
function startProfileOf(
  sp: NonNullable<Requirement["startProfile"]>,
  sources: string[],
  assumptions: string[],
): ProfilePoint[] {
  if (Array.isArray(sp)) return sp;
  const cranks = sp.cranks ?? 1;
  const restS = sp.restS ?? 0;
  let points: readonly ProfilePoint[] = sp.points ?? [];
  if (sp.builtIn !== undefined) {
    const b = builtInProfile(sp.builtIn);
    if (b === undefined)
      throw inputProblem(
        "invalid-input",
        ["requirement", "startProfile", "builtIn"],
        unknownIdMessage(
          "built-in start profile",
          sp.builtIn,
          START_PROFILES.map((p) => p.id),
        ),
      );
    points = b.points;
    sources.push(`${b.def.id}: ${b.def.source}`);
  }
  if (sp.cranks === undefined) assumptions.push("requirement.startProfile.cranks: 1 (default)");
  else if (sp.restS === undefined && cranks > 1)
    assumptions.push("requirement.startProfile.restS: 0 s between cranks (default: the next crank starts at once)");
  return repeatedProfile(points, cranks, restS);
}

/** The input clamp: its law and power rating, defaults recorded (clamp-rating.ts). */
function inputClampOf(c: NonNullable<Requirement["inputClamp"]>, assumptions: string[]): InputClamp {
  if (c.breakdownV === undefined)
    assumptions.push("inputClamp: no breakdownV, so a constant clamping voltage clampV (no dynamic resistance)");
  else if (c.peakCurrentA === undefined)
    assumptions.push(
      "inputClamp: breakdownV without peakCurrentA gives no dynamic resistance: a constant clampV is used",
    );
  let power: ClampPowerRating | undefined;
  if (c.peakPulsePowerW !== undefined) {
    if (c.referencePulseS === undefined)
      assumptions.push("inputClamp.referencePulseS: 1 ms (default: a 10/1000 us rating pulse, 1000 us to half value)");
    if (c.tjMaxC === undefined) assumptions.push("inputClamp.tjMaxC: 150 degC (default, common practice)");
    power = { peakPulsePowerW: c.peakPulsePowerW, referencePulseS: c.referencePulseS ?? 1e-3, tjMaxC: c.tjMaxC ?? 150 };
    assumptions.push(
      "inputClamp power: Ppp scaled by sqrt(reference width / the pulse's current half-width) (Wunsch-Bell) and derated linearly to 0 at tjMaxC from the highest ambient (common practice)",
    );
  }
  if (c.thermal === undefined)
    assumptions.push(
      "inputClamp.thermal: not given, so the clamp's junction over each test's pulse train is not assessed (give its Foster network)",
    );
  else {
    if (c.tjMaxC === undefined && power === undefined)
      assumptions.push("inputClamp.tjMaxC: 150 degC (default, common practice)");
    assumptions.push(
      "inputClamp.thermal: each pulse as a rectangle at its peak power carrying its energy (an upper bound of its junction rise), repeated at the test's interval and count from the highest ambient (clamp-train.ts)",
    );
  }
  return {
    standoffV: c.standoffV,
    clampV: c.clampV,
    breakdownV: c.breakdownV,
    peakCurrentA: c.peakCurrentA,
    energyJ: c.energyJ,
    tjMaxC: c.tjMaxC ?? 150,
    ...(power ? { power } : {}),
    ...(c.thermal === undefined ? {} : { thermal: c.thermal }),
  };
}

/** The module's load in parallel with the clamp: a constant-power load as the least current it draws, at the clamping voltage (the clamp's share the larger). */
function parallelLoadOf(load: Requirement["load"], clampV: number): ParallelLoad {
  switch (load.kind) {
    case "resistive":
      return { kind: "resistive", resistanceOhm: load.resistanceOhm };
    case "constant-current":
      return { kind: "constant-current", currentA: load.currentA };
    case "constant-power":
      return { kind: "constant-current", currentA: load.powerW / clampV };
  }
}

/** A steady overvoltage level: the caller's, else the class's where it lies above the (possibly overridden) highest supply. */
function overvoltageOf(
  given: number | undefined,
  ofClass: number | undefined,
  maxV: number,
  field: string,
  what: string,
): number | undefined {
  if (given !== undefined && !(given >= maxV))
    throw inputProblem(
      "invalid-input",
      ["requirement", "supply", field],
      `the ${what} must be at least the highest steady supply (${maxV} V); got ${given} V`,
    );
  return given ?? (ofClass !== undefined && ofClass >= maxV ? ofClass : undefined);
}

/** The review's turn-off event: defaults recorded (a short from the nominal supply; Tj per candidate). */
function reviewTurnOffOf(
  t: NonNullable<Requirement["turnOff"]>,
  nominalV: number,
  assumptions: string[],
): ReviewTurnOff {
  if (t.inputAfterV === undefined) assumptions.push("turnOff.inputAfterV: 0 V (the input shorted)");
  if (t.outputV === undefined) assumptions.push(`turnOff.outputV: the nominal supply ${nominalV} V before the event`);
  if (t.tjC === undefined)
    assumptions.push(
      "turnOff.tjC: each candidate's worst-case junction temperature over the corners (the highest ambient where no corner solved)",
    );
  if (t.reverseRecoveryChargeC === undefined)
    assumptions.push(missingQrrSentence("turnOff.reverseRecoveryChargeC", "diode"));
  if (t.clampV === undefined)
    assumptions.push(
      "turnOff.clampV: the blocking element's rated voltage (a lower bound of its breakdown: the energy estimate is conservative)",
    );
  if (t.repetitive === undefined) assumptions.push(ONE_OFF_EVENT("turnOff.repetitive"));
  if (t.gateLag === undefined)
    assumptions.push(
      "turnOff.gateLag: not given, so a P-FET candidate's gate follows the output at once (no gate resistor lag): the least reverse voltage at the load, in the turn-off event and in each negative pulse",
    );
  assumptions.push(
    "negative pulses at a P-FET candidate: each is the turn-off event's input, decaying with the pulse's time constant from its start (limited by the clamp) to a constant; applied with the supply disconnected (ISO 7637-2 pulse 1) the generator alone, the loop's resistance the generator's Ri (the wiring not added: the larger reverse current); riding on the supply (ISO 7637-2 pulse 3a, a negative surge) the generator and the battery at the nominal supply behind requirement.sourceResistanceOhm as one Thevenin source, Vth = Vb + A·Rb/(Ri + Rb)·e^(−t/τ) behind Ri‖Rb (Rb = 0 holds the input at the supply); the output, capacitance, ESR, inductance and gate lag the turnOff event's",
  );
  const outputV = t.outputV ?? nominalV;
  const inputAfterV = t.inputAfterV ?? 0;
  if (!(inputAfterV < outputV))
    throw inputProblem(
      "invalid-input",
      ["requirement", "turnOff", "inputAfterV"],
      `must be below the output voltage before the event (${outputV} V)`,
    );
  const decay = t.inputDecay;
  if (decay !== undefined && !(decay.startV < outputV))
    throw inputProblem(
      "invalid-input",
      ["requirement", "turnOff", "inputDecay", "startV"],
      `must be below the output voltage before the event (${outputV} V): the input falls at t = 0`,
    );
  return {
    inputAfterV,
    ...(decay === undefined ? {} : { inputDecay: { startV: decay.startV, tauS: decay.timeConstantS } }),
    outputV,
    loopResistanceOhm: t.loop.resistanceOhm,
    loopInductanceH: t.loop.inductanceH,
    capacitanceF: t.capacitor.capacitanceF,
    esrOhm: t.capacitor.esrOhm,
    ...(t.tjC === undefined ? {} : { tjC: t.tjC }),
    ...(t.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: t.reverseRecoveryChargeC }),
    ...(t.clampV === undefined ? {} : { clampV: t.clampV }),
    repetitive: t.repetitive ?? false,
    ...(t.gateLag === undefined
      ? {}
      : { gateLagS: (t.gateLag.resistanceOhm * t.gateLag.gateChargeC) / t.gateLag.atGateSourceV }),
    ...(t.loadReverseLimitV === undefined ? {} : { loadReverseLimitV: t.loadReverseLimitV }),
    ...(t.repetition === undefined ? {} : { repetition: t.repetition }),
  };
}
