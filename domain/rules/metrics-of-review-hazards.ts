import { behaviourOf } from "../stages/stage-behaviours.js";
import { type CandidateReview, type ReviewRequirement, steadyOvervoltageV } from "../review/candidate-review.js";
import type { StageModel } from "../stages/stage-model.js";
import { NO_CLAMP_THERMAL_REASON } from "../checks/clamp-train.js";
import type { InputClamp } from "../checks/transient-clamp.js";
import type { SoaCheck } from "../checks/soa-lines.js";
import { switchProtectionMetrics } from "./metrics-of-switch-protections.js";

export interface Scope {
  readonly metrics: Record<string, number | boolean>;
  readonly unavailable: Record<string, string>;
  readonly notRequired: Record<string, string>;
}

/**
 * The review's steady-reverse, clamp and start-profile figures → the rule vocabulary:
 * reverseLeakageRunaway and reverseTjC (reverse-steady.ts), controllerReverseVMaxV (the steady
 * reversed supply and every negative pulse on the controller's pin), the design clamp's worst
 * energy and peak current over the pulses with its ratings and stand-off (transient-stress.ts),
 * the jump-start voltage and the supply's highest steady overvoltage, and the start profile's lowest supply and dropout time (start-up.ts).
 * What the requirement does not ask (no clamp, no profile, no jump start) is out of scope with
 * why; a figure the model could not give is unavailable, so its rule cannot pass.
 */
export function reviewHazardMetrics(stage: StageModel, req: ReviewRequirement, r: CandidateReview, s: Scope): void {
  const { metrics, unavailable, notRequired } = s;
  const rev = r.reverse;
  metrics["reverseLeakageRunaway"] = rev.outcome === "leakage-runaway";
  if (rev.outcome === "blocks") metrics["reverseTjC"] = rev.tjC;
  else
    unavailable["reverseTjC"] =
      `steady reverse polarity has no stable junction temperature (${rev.outcome}: ${rev.reason})`;

  if (behaviourOf(stage).controllerReversePin) {
    const pin = r.transients.flatMap((t) =>
      t.polarity === "negative" ? t.stresses.filter((x) => x.element === "controller-input").map((x) => x.seenV) : [],
    );
    metrics["controllerReverseVMaxV"] = Math.max(rev.stress.controllerReverseV ?? req.reverseV, ...pin);
  }

  if (req.jumpStartV !== undefined) metrics["jumpStartV"] = req.jumpStartV;
  else notRequired["jumpStartV"] = "the supply has no jump start";
  const overvoltageV = steadyOvervoltageV(req);
  if (overvoltageV !== undefined) metrics["supplyOvervoltageV"] = overvoltageV;
  else notRequired["supplyOvervoltageV"] = "the supply has no jump start, long-term overvoltage or abnormal range";

  const clamp = req.transientContext.inputClamp;
  if (clamp === undefined) {
    for (const n of [
      "clampStandoffV",
      "clampEnergyJ",
      "clampPeakCurrentA",
      "clampEnergyRatingJ",
      "clampPeakCurrentRatingA",
      "clampPeakPowerW",
      "clampPeakPowerAllowedW",
      "clampTrainTjC",
      "clampTjMaxC",
    ])
      notRequired[n] = "the requirement has no input clamp";
  } else {
    metrics["clampStandoffV"] = clamp.standoffV;
    let energyJ = 0;
    let peakA = 0;
    let always: string | undefined;
    for (const t of r.transients) {
      const d = t.designClamp?.duty;
      if (d === undefined || d.conducts === false) continue;
      if (d.conducts === "always") always ??= `pulse ${t.pulseId}: ${d.reason}`;
      else {
        energyJ = Math.max(energyJ, d.energyJ);
        peakA = Math.max(peakA, d.peakCurrentA);
      }
    }
    if (always === undefined) {
      metrics["clampEnergyJ"] = energyJ;
      metrics["clampPeakCurrentA"] = peakA;
    } else {
      unavailable["clampEnergyJ"] = always;
      unavailable["clampPeakCurrentA"] = always;
    }
    clampPowerMetrics(r, clamp.power === undefined, always, s);
    clampTrainMetrics(r, clamp, req.transientContext.clampTjC, always, s);
    if (clamp.energyJ !== undefined) metrics["clampEnergyRatingJ"] = clamp.energyJ;
    else unavailable["clampEnergyRatingJ"] = "the input clamp states no energy rating (inputClamp.energyJ)";
    if (clamp.peakCurrentA !== undefined) metrics["clampPeakCurrentRatingA"] = clamp.peakCurrentA;
    else
      unavailable["clampPeakCurrentRatingA"] =
        "the input clamp states no peak current rating (inputClamp.peakCurrentA)";
  }

  const profile = req.startProfile;
  if (profile === undefined || profile.length === 0) {
    notRequired["startProfileMinV"] = "the requirement gives no start-up profile";
    notRequired["startProfileDropoutS"] = "the requirement gives no start-up profile";
  } else {
    metrics["startProfileMinV"] = Math.min(...profile.map((p) => p.voltageV));
    metrics["startProfileDropoutS"] = Math.max(0, ...r.startUp.profiles.map((p) => p.result.dropoutTimeS));
  }
  inrushMetrics(r, s);
  metrics["loadTransientVMaxV"] = r.loadOvervoltage.loadVMaxV;
  switchProtectionMetrics(stage, r, s);
  if (req.loadMaxV !== undefined) metrics["loadMaxV"] = req.loadMaxV;
  else notRequired["loadMaxV"] = "the requirement states no highest load voltage (loadMaxV)";
}

/**
 * The start-up charge of the output capacitance (review-inrush.ts) → inrushTjC and
 * inrushCharges: charged (Tj peak, true), thermal shutdown (its temperature, false), a stall
 * (the steady junction, false). A diode stage is out of scope; a load the charge cannot model is
 * a gap, as is the pulse's Tj without a transient thermal network (and then whether a switch's
 * thermal shutdown comes first).
 */
function inrushMetrics(r: CandidateReview, s: Scope): void {
  const names = ["inrushTjC", "inrushCharges"];
  const i = r.inrush;
  if (i === undefined) {
    for (const n of [...names, ...SOA_NAMES]) s.notRequired[n] = "the requirement gives no inrush (requirement.inrush)";
    return;
  }
  if (!i.assessed) {
    for (const n of [...names, ...SOA_NAMES]) (i.scope === "out" ? s.notRequired : s.unavailable)[n] = i.reason;
    return;
  }
  const res = i.result;
  if (res.tjPeakC !== undefined) s.metrics["inrushTjC"] = res.tjPeakC;
  else
    s.unavailable["inrushTjC"] =
      "no transient thermal network for the candidate (transientThermal): the junction during the charge's pulse is not assessed";
  if (res.outcome === "charged" && res.shutdownUnassessedC !== undefined)
    s.unavailable["inrushCharges"] =
      `the switch shuts down at ${res.shutdownUnassessedC} °C and no transient thermal network says whether the charge reaches it (transientThermal)`;
  else s.metrics["inrushCharges"] = res.outcome === "charged";
  inrushSoaMetrics(i.soa, res.outcome === "does-not-charge", s);
}

const SOA_NAMES = ["inrushSoaCurrentA", "inrushSoaAllowedA"];

/** The inrush pulse against the MOSFET's SOA lines (soa-lines.ts): its current at the peak power and the lines' allowance. */
function inrushSoaMetrics(soa: SoaCheck | undefined, stalls: boolean, s: Scope): void {
  const names = SOA_NAMES;
  if (soa === undefined) {
    const why = stalls
      ? "the output stalls: the charge fails on inrush-completes"
      : "the stage gives no SOA lines (mosfet.soa): its pulse is checked through its junction temperature (inrush-tj) alone";
    for (const n of names) s.notRequired[n] = why;
    return;
  }
  if (!soa.assessed) {
    for (const n of names) s.unavailable[n] = soa.reason;
    return;
  }
  s.metrics["inrushSoaCurrentA"] = soa.currentA;
  s.metrics["inrushSoaAllowedA"] = soa.allowedA;
}

/**
 * The clamp's peak power against its rating read at each pulse's width and the clamp's starting
 * Tj (clamp-rating.ts), at the pulse that uses the largest share of it. A clamp without a power
 * rating has its energy and peak current checked instead (clamp-energy, clamp-peak-current).
 */
function clampPowerMetrics(r: CandidateReview, unrated: boolean, always: string | undefined, s: Scope): void {
  const names = ["clampPeakPowerW", "clampPeakPowerAllowedW"];
  if (unrated) {
    for (const n of names)
      s.notRequired[n] =
        "the input clamp states no peak pulse power (inputClamp.peakPulsePowerW): its energy and peak current ratings are checked instead";
    return;
  }
  if (always !== undefined) {
    for (const n of names) s.unavailable[n] = always;
    return;
  }
  let worst: { p: number; allowed: number } | undefined;
  for (const t of r.transients) {
    const dc = t.designClamp;
    if (dc?.duty.conducts !== true || dc.allowedPeakPowerW === undefined) continue;
    const share = dc.allowedPeakPowerW > 0 ? dc.duty.peakPowerW / dc.allowedPeakPowerW : Number.POSITIVE_INFINITY;
    const wShare = worst === undefined ? -1 : worst.allowed > 0 ? worst.p / worst.allowed : Number.POSITIVE_INFINITY;
    if (worst === undefined || share > wShare) worst = { p: dc.duty.peakPowerW, allowed: dc.allowedPeakPowerW };
  }
  s.metrics["clampPeakPowerW"] = worst?.p ?? 0;
  if (worst !== undefined) s.metrics["clampPeakPowerAllowedW"] = worst.allowed;
  else s.notRequired["clampPeakPowerAllowedW"] = "the input clamp conducts in none of the requirement's pulses";
}

/**
 * The clamp's junction at the end of each test's pulse train (clamp-train.ts), the hottest over
 * the requirement's pulses, with its Tj(max). Without the clamp's thermal network it is not
 * assessed (out of scope, with why); a pulse whose train cannot be formed (overlapping pulses)
 * or a clamp that conducts the supply leaves it unavailable, so its rule cannot pass. No pulse
 * that the clamp conducts: the junction stays at its start, the highest ambient.
 */
function clampTrainMetrics(
  r: CandidateReview,
  clamp: InputClamp,
  startTjC: number | undefined,
  always: string | undefined,
  s: Scope,
): void {
  if (clamp.thermal === undefined) {
    // A train the clamp conducts in is a gap (unavailable: its rule cannot pass); none: out of scope.
    const gap = r.transients.find((t) => t.designClamp?.train?.outcome === "not-assessed");
    for (const n of ["clampTrainTjC", "clampTjMaxC"]) {
      if (gap !== undefined) s.unavailable[n] = `pulse ${gap.pulseId}: ${NO_CLAMP_THERMAL_REASON}`;
      else
        s.notRequired[n] =
          "the input clamp gives no thermal network (inputClamp.thermal) and conducts in no pulse train: its junction over the trains is not assessed";
    }
    return;
  }
  s.metrics["clampTjMaxC"] = clamp.tjMaxC ?? 150;
  if (always !== undefined) {
    s.unavailable["clampTrainTjC"] = always;
    return;
  }
  let tj = startTjC ?? 25;
  for (const t of r.transients) {
    const train = t.designClamp?.train;
    if (train === undefined) continue;
    if (train.outcome !== "computed") {
      s.unavailable["clampTrainTjC"] = `pulse ${t.pulseId}: ${train.reason}`;
      return;
    }
    tj = Math.max(tj, train.trainTjC);
  }
  s.metrics["clampTrainTjC"] = tj;
}
