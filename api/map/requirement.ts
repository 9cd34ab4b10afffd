import type { Requirement } from "../../contracts/requirement.js";
import type { ReviewRequirement } from "../../domain/review/candidate-review.js";
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
import { reviewInrushOf } from "./inrush-requirement.js";
import { inputClampOf, parallelLoadOf } from "./input-clamp-requirement.js";
import { reviewTurnOffOf } from "./turn-off-requirement.js";

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
      // A level not confirmed for the edition in force may be milder than the test: the caller must see it.
      if (p.unconfirmed !== undefined) assumptions.push(`level unconfirmed, ${p.unconfirmed}`);
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
      ...(r.inrush
        ? {
            inrush: reviewInrushOf(
              r,
              r.inrush,
              { supplyMaxV: maxV, jumpStartV, longTermOvervoltageV, abnormalMaxV },
              assumptions,
            ),
          }
        : {}),
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
