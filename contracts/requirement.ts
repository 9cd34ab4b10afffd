import { z } from "zod";
import { profilePointCount, START_PROFILE_IDS, START_PROFILE_POINTS } from "../domain/checks/start-profiles.js";
import { reviewInrush } from "./inrush.js";
import { load } from "./load.js";
import { quantity, ratio, temperatureC, volts } from "./quantity.js";
import {
  holdUpCapacitor,
  inductiveClampField,
  inputAfterField,
  inputDecayField,
  loadReverseLimitField,
  pfetGateLag,
  refineInputFalls,
  repetitiveEvent,
  reverseLoop,
  reverseRecoveryChargeField,
  turnOffTiming,
} from "./turn-off.js";
import { customPulse, pulseRepetition, repeatedBuiltInPulse } from "./pulse-spec.js";

export { customPulse, pulseRepetition, repeatedBuiltInPulse };

export const supplySpec = z
  .strictObject({
    class: z
      .string()
      .min(1)
      .max(64)
      .meta({ description: "a built-in supply class id (see GET of review.supplyClasses), or 'custom'" }),
    minV: volts("lowest supply (overrides the class)").optional(),
    nominalV: volts("nominal supply (overrides the class)").optional(),
    maxV: volts("highest steady supply (overrides the class)").optional(),
    jumpStartV: volts(
      "jump-start overvoltage, lasting about a minute (overrides the class's; a custom supply has none unless given)",
    ).optional(),
    longTermOvervoltageV: volts(
      "long-term overvoltage, a failed generator regulator for about an hour (overrides the class's; a custom supply has none unless given)",
    ).optional(),
    abnormalMaxV: volts(
      "top of the abnormal service range the equipment must survive (overrides the class's; a custom supply has none unless given)",
    ).optional(),
  })
  .meta({ description: "the supply: a built-in class, with any value overridden, or 'custom' with all three given" });

/** The reverse-current event each candidate is put through in the review (the turnOff analysis's loop and capacitor). */
export const reviewTurnOff = z
  .strictObject({
    loop: reverseLoop,
    capacitor: holdUpCapacitor,
    inputAfterV: inputAfterField.optional(),
    inputDecay: inputDecayField.optional(),
    gateLag: pfetGateLag.optional(),
    loadReverseLimitV: loadReverseLimitField,
    outputV: quantity("V", "output voltage before the event (default: the nominal supply)", {
      gt: 0,
      le: 10_000,
    }).optional(),
    tjC: temperatureC(
      "junction temperature at the event (default: the candidate's worst-case Tj over the corners, else the highest ambient)",
    ).optional(),
    timing: turnOffTiming.optional(),
    reverseRecoveryChargeC: reverseRecoveryChargeField,
    clampV: inductiveClampField,
    repetitive: repetitiveEvent,
    repetition: pulseRepetition.optional().meta({
      description:
        "how often the event repeats in service or test (interval and count): with the candidate's transientThermal network, the blocking element's junction at the end of the train (rule turn-off-train-tj)",
    }),
  })
  .meta({
    description:
      "the input shorted or stepping lower: each candidate's reverse-current peak, turn-off and absorbed energy (the turnOff analysis), for the avalanche and reverse-current rules",
  });

const profilePoints = z
  .array(
    z.strictObject({
      timeS: quantity("s", "time", { ge: 0, le: 1e5 }),
      voltageV: quantity("V", "supply", { ge: 0, le: 10_000 }),
    }),
  )
  .min(2)
  .max(1000);

/** Points of the requirement's start-up profile after repetition (for the work bound). */
export function startProfilePointCount(sp: Requirement["startProfile"]): number {
  if (sp === undefined) return 0;
  if (Array.isArray(sp)) return sp.length;
  const perCrank = sp.points?.length ?? (sp.builtIn === undefined ? 0 : START_PROFILE_POINTS);
  return profilePointCount(perCrank, sp.cranks ?? 1, sp.restS ?? 0);
}

export const requirement = z
  .strictObject({
    supply: supplySpec,
    sourceResistanceOhm: quantity("ohm", "source and wiring resistance (default 0)", { ge: 0, le: 1e6 }).optional(),
    load,
    loadLevels: z
      .array(z.number().gt(0).lte(10))
      .min(1)
      .max(8)
      .optional()
      .meta({ description: "load levels as shares of the full load for the corners (default [1, 0.1])" }),
    loadStandbyA: quantity("A", "the load's standby current (default 0)", { ge: 0, le: 100 }).optional(),
    loadMinV: quantity("V", "lowest voltage at which the load works (default: a constant-power load's own minimum)", {
      ge: 0,
      le: 10_000,
    }).optional(),
    ambient: z.strictObject({ minC: temperatureC("lowest ambient"), maxC: temperatureC("highest ambient") }),
    reverse: z
      .strictObject({
        voltageV: quantity("V", "steady reverse polarity to withstand (magnitude)", { ge: 0, le: 10_000 }),
        durationS: quantity("s", "how long", { gt: 0, le: 1e7 }),
      })
      .optional()
      .meta({ description: "steady reverse polarity (default: the supply class's)" }),
    transients: z
      .array(z.union([z.string().min(1).max(64), customPulse, repeatedBuiltInPulse]))
      .max(32)
      .optional()
      .meta({
        description:
          "pulses to check: built-in ids, built-in ids with the test's own repetition ({ builtIn, repetition }), or custom pulses (default: the supply class's set)",
      }),
    inputClamp: z
      .strictObject({
        standoffV: volts("clamp working (standoff) voltage"),
        clampV: volts("clamping voltage at its peak current"),
        breakdownV: volts(
          "breakdown voltage VBR (with peakCurrentA: the dynamic resistance (clampV - VBR)/Ipp; absent: a constant clampV)",
        ).optional(),
        peakCurrentA: quantity("A", "rated peak pulse current", { gt: 0, le: 1e5 }).optional(),
        energyJ: quantity("J", "rated pulse energy", { gt: 0, le: 1e6 }).optional(),
        peakPulsePowerW: quantity("W", "rated peak pulse power at the reference pulse", { gt: 0, le: 1e8 }).optional(),
        referencePulseS: quantity(
          "s",
          "width (to half value) of the pulse the power is rated at (default 1 ms: a 10/1000 us pulse)",
          { gt: 0, le: 10 },
        ).optional(),
        tjMaxC: temperatureC(
          "the clamp's maximum junction temperature, where its power derates to zero (default 150 degC)",
        ).optional(),
        thermal: z
          .array(
            z.strictObject({
              rKPerW: quantity("K/W", "thermal resistance of the term", { gt: 0, le: 10_000 }),
              tauS: quantity("s", "time constant τ = R·C", { gt: 0, le: 1e6 }),
            }),
          )
          .min(1)
          .max(12)
          .optional()
          .meta({
            description:
              "the clamp's junction-to-ambient Foster network (its datasheet's Zth): its junction over each test's pulse train, read against tjMaxC (absent: not assessed)",
          }),
      })
      .optional()
      .meta({ description: "a clamp (TVS) at the input, if the design has one" }),
    outputHeldV: quantity(
      "V",
      "voltage the hold-up capacitor keeps at the output during a negative pulse (default: nominal supply)",
      { ge: 0, le: 10_000 },
    ).optional(),
    deratingFactor: ratio("share of a voltage rating the clamp sizing may use (default 0.8, common practice)", {
      gt: 0,
      le: 1,
    }).optional(),
    startProfile: z
      .union([
        profilePoints,
        z
          .strictObject({
            builtIn: z.enum(START_PROFILE_IDS).optional().meta({
              description:
                "a built-in ISO 16750-2 clause 4.6.3 starting profile (values memory unless docs/references.md says otherwise)",
            }),
            points: profilePoints.optional(),
            cranks: z
              .number()
              .int()
              .min(1)
              .max(10)
              .optional()
              .meta({ description: "how many cranks in a row (default 1)" }),
            restS: quantity("s", "time at the battery voltage between two cranks (default 0: at once)", {
              ge: 0,
              le: 600,
            }).optional(),
          })
          .meta({ description: "a built-in starting profile or points of one crank, repeated" }),
      ])
      .optional()
      .meta({
        description:
          "a start-up (cold-crank) profile: supply against time, time increasing; or a built-in profile or points, repeated for several cranks",
      }),
    mission: z
      .array(
        z.strictObject({
          hoursPerYear: quantity("h", "hours a year in this state", { ge: 0, le: 8784 }),
          loadLevel: z.number().gt(0).lte(10).meta({ description: "share of the full load" }),
          ambientC: temperatureC("ambient in this state"),
        }),
      )
      .max(64)
      .optional(),
    energyPricePerKWh: z
      .number()
      .gte(0)
      .lte(1e4)
      .optional()
      .meta({ description: "price of a kWh in the caller's currency" }),
    battery: z
      .strictObject({
        capacityAh: quantity("A*h", "battery capacity", { gt: 0, le: 1e6 }),
        usableFraction: ratio("usable share of the capacity", { gt: 0, le: 1 }),
      })
      .optional(),
    standbyBudgetA: quantity("A", "standby current budget for the input stage", { ge: 0, le: 100 }).optional(),
    lossBudgetW: quantity("W", "largest loss the input stage may dissipate at the worst corner", {
      gt: 0,
      le: 1e5,
    }).optional(),
    parallelSources: z
      .boolean()
      .optional()
      .meta({ description: "the input is paralleled with another source (default false)" }),
    holdUpRequired: z
      .boolean()
      .optional()
      .meta({ description: "the load must ride through an input dropout (default false)" }),
    tjMarginK: quantity("K", "margin below Tj(max) that thermal sizing holds (default 25 K, common practice)", {
      ge: 0,
      le: 200,
    }).optional(),
    turnOff: reviewTurnOff.optional(),
    inrush: reviewInrush.optional(),
    loadMaxV: volts(
      "highest voltage the load withstands (absent: what reaches the load in surges is reported, not checked)",
    ).optional(),
  })
  .superRefine((r, ctx) => {
    if (r.ambient.minC > r.ambient.maxC)
      ctx.addIssue({ code: "custom", path: ["ambient", "minC"], message: "must not be above ambient.maxC" });
    const s = r.supply;
    if (s.minV !== undefined && s.maxV !== undefined && s.minV > s.maxV)
      ctx.addIssue({ code: "custom", path: ["supply", "minV"], message: "must not be above supply.maxV" });
    if (s.class === "custom" && (s.minV === undefined || s.nominalV === undefined || s.maxV === undefined)) {
      ctx.addIssue({ code: "custom", path: ["supply"], message: "a custom supply needs minV, nominalV and maxV" });
    }
    const sp = r.startProfile;
    const points = Array.isArray(sp) ? sp : sp?.points;
    const at = Array.isArray(sp) ? ["startProfile"] : ["startProfile", "points"];
    points?.forEach((p, i) => {
      const prev = points[i - 1];
      if (prev && !(p.timeS > prev.timeS))
        ctx.addIssue({ code: "custom", path: [...at, i, "timeS"], message: "times must increase" });
    });
    if (sp !== undefined && !Array.isArray(sp) && (sp.builtIn === undefined) === (sp.points === undefined)) {
      ctx.addIssue({
        code: "custom",
        path: ["startProfile"],
        message: "give either builtIn (a built-in profile id) or points, not both",
      });
    }
    const t = r.turnOff;
    if (t?.outputV !== undefined)
      refineInputFalls(
        { ...t, outputV: t.outputV, inputAfterV: t.inputAfterV ?? 0 },
        ctx,
        ["turnOff"],
        "turnOff.outputV",
      );
    const c = r.inputClamp;
    if (c && c.clampV <= c.standoffV)
      ctx.addIssue({ code: "custom", path: ["inputClamp", "clampV"], message: "must be above standoffV" });
    if (c?.breakdownV !== undefined && !(c.breakdownV >= c.standoffV && c.breakdownV < c.clampV))
      ctx.addIssue({
        code: "custom",
        path: ["inputClamp", "breakdownV"],
        message: "must lie between standoffV and clampV",
      });
    if (c?.tjMaxC !== undefined && !(c.tjMaxC > 25))
      ctx.addIssue({
        code: "custom",
        path: ["inputClamp", "tjMaxC"],
        message: "must be above 25 degC (the power rating's reference)",
      });
  });
export type RequirementInput = z.input<typeof requirement>;
export type Requirement = z.output<typeof requirement>;
