import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { soaCheck } from "../../domain/checks/soa-lines.js";
import { demoContext } from "../helpers/app.js";
import { KNOWN_BAD } from "../known-bad/designs.js";

// A back-to-back pair through the review's inrush (domain/review/review-inrush.ts pairDissipation):
// in a slew or at a controller's current limit the input-side FET carries the whole drop, its SOA
// read at it; fully on at once each channel drops half. Checked against the closed forms of
// docs/references.md "Inrush": ½·C·V² at a constant charging current, and a one-term Foster
// network's response to the limit's falling ramp P(t) = P0·(1 − t/T), whose peak is at
// t* = τ·ln(1 + T/τ). The FET and its SOA lines are invented.

type Cand = {
  metrics: Record<string, number | boolean>;
  inrush?: {
    assessed: boolean;
    drive?: string;
    pairDissipation?: string;
    result?: Record<string, number | string>;
    soa?: { vdsV: number; currentA: number; equivalentWidthS: number };
  };
};
type Out = { candidates: Cand[]; assumptions: string[] };

const review = procedureInvoker(demoContext())("review");
const call = async (input: unknown) => {
  if (review === undefined) throw new Error("review missing");
  return (await review(input)) as Out;
};

const mosfet = {
  rdsOn: [
    { gateSourceV: 4.5, rdsOnOhm: "4.5 mOhm" },
    { gateSourceV: 10, rdsOnOhm: "3 mOhm" },
  ],
  thresholdV: 2,
  vgsMaxV: 20,
  vdsMaxV: 60,
  tjMaxC: 175,
  bodyDiode: { model: "shockley", saturationCurrentA: "8 nA", ideality: 1.4, seriesResistanceOhm: "10 mOhm" },
  soa: [
    {
      pulseWidthS: 1e-3,
      points: [
        { vdsV: 1, idA: 200 },
        { vdsV: 60, idA: 2 },
      ],
    },
    {
      pulseWidthS: 10e-3,
      points: [
        { vdsV: 1, idA: 100 },
        { vdsV: 60, idA: 0.6 },
      ],
    },
    {
      pulseWidthS: 0.1,
      points: [
        { vdsV: 1, idA: 60 },
        { vdsV: 60, idA: 0.2 },
      ],
    },
  ],
};
const controller = {
  startV: 3.2,
  gateDrive: [
    { inputV: 3.2, gateSourceV: 6 },
    { inputV: 12, gateSourceV: 11 },
  ],
  regulatedDropV: "20 mV",
  quiescentA: "80 uA",
  maxInputV: 65,
  reverseThresholdV: "30 mV",
  turnOffDelayS: "2 us",
  reverseRatingV: 65,
};
const pair = {
  kind: "nfet-back-to-back",
  name: "test pair",
  mosfet,
  controller,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};
const single = { ...pair, kind: "nfet-ideal-diode", name: "test ideal diode" };
const [R, TAU] = [40, 10e-3];
const zth = { kind: "foster", terms: [{ rKPerW: R, tauS: TAU }] };
const requirement = (inrush: Record<string, unknown>) => ({
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
  inrush: { load: { kind: "none" }, ...inrush },
});
const run = async (inrush: Record<string, unknown>, stage = pair) =>
  await call({ requirement: requirement(inrush), candidates: [{ stage, transientThermal: zth }] });

describe("review: a back-to-back pair's inrush", () => {
  it("at a controller's 1 A limit: the input-side FET holds 24 V at 1 A, its Tj the Foster closed form of the falling ramp", async () => {
    const out = await run({ outputCapacitanceF: "1 mF", currentLimitA: 1 });
    const i = out.candidates[0]?.inrush;
    expect(i).toMatchObject({ assessed: true, drive: "current-limit", pairDissipation: "input-side-fet" });
    // T = C·V/I = 24 ms, P0 = 24 W; ΔT(t) = R·P0·[(1 − e^(−t/τ)) − (t − τ·(1 − e^(−t/τ)))/T], peak at τ·ln(1 + T/τ).
    const [T, P0] = [(1e-3 * 24) / 1, 24];
    const tStar = TAU * Math.log(1 + T / TAU);
    const g = 1 - Math.exp(-tStar / TAU);
    const tjC = 85 + R * P0 * (g - (tStar - TAU * g) / T);
    expect(i?.result?.["chargeTimeS"]).toBeCloseTo(T, 12);
    expect(i?.result?.["energyJ"]).toBeCloseTo(0.5 * 1e-3 * 24 ** 2, 12);
    expect(Math.abs(Number(i?.result?.["tjPeakC"]) - tjC)).toBeLessThan(0.05);
    expect(i?.soa).toMatchObject({ vdsV: 24, currentA: 1 });
    expect(out.candidates[0]?.metrics["inrushSoaCurrentA"]).toBe(1);
    expect(out.assumptions.some((a) => a.includes("the input-side FET carries the whole drop"))).toBe(true);
  });

  it("in a slew, the same Tj and SOA point as one FET of the same part carrying the charge alone", async () => {
    const inrush = { outputCapacitanceF: "2200 uF", slewVPerS: "250 V/s" };
    const p = (await run(inrush)).candidates[0]?.inrush;
    const s = (await run(inrush, single)).candidates[0]?.inrush;
    expect(p?.pairDissipation).toBe("input-side-fet");
    expect(p?.result).toEqual(s?.result);
    expect(p?.soa).toEqual(s?.soa);
    // I = C·s = 0.55 A at the whole 24 V.
    expect(p?.soa).toMatchObject({ vdsV: 24 });
    expect(p?.soa?.currentA).toBeCloseTo(0.55, 12);
  });

  it("fully on at once, both channels share the drop: each FET's SOA read at half of it", async () => {
    const p = (await run({ outputCapacitanceF: "100 uF" })).candidates[0]?.inrush;
    expect(p).toMatchObject({ drive: "uncontrolled", pairDissipation: "both-channels" });
    const vds = Number(p?.result?.["peakPowerVdsV"]);
    expect(p?.soa?.vdsV).toBeCloseTo(vds / 2, 12);
  });

  it("the known-bad pair at a 2 A limit: outside its SOA at the whole 24 V, inside it at half the drop", async () => {
    const d = KNOWN_BAD.find((x) => x.id === "inrush-pair-limit-outside-soa");
    if (d === undefined) throw new Error("design missing");
    const c = (await call(d.bad)).candidates[0];
    // T = 1 mF·24 V/2 A = 12 ms, E = ½·C·V² = 0.288 J at 48 W peak: a 6 ms rectangle at 24 V, 2 A.
    expect(c?.inrush?.soa).toMatchObject({ vdsV: 24, currentA: 2 });
    expect(c?.inrush?.soa?.equivalentWidthS).toBeCloseTo(6e-3, 12);
    const allowedAt24 = c?.metrics["inrushSoaAllowedA"] as number;
    expect(allowedAt24).toBeCloseTo(1.44, 2);
    const lines = mosfet.soa;
    const halved = soaCheck(lines, { energyJ: 0.288, peakPowerW: 48, vdsAtPeakV: 12, currentAtPeakA: 2 }, 175, 85);
    expect(halved.assessed && halved.allowedA).toBeCloseTo(3.36, 2);
  });
});

describe("sizing: a back-to-back family through the inrush", () => {
  it("states which FET carries the drop, as the review does", async () => {
    const sizing = procedureInvoker(demoContext())("sizing.spec");
    if (sizing === undefined) throw new Error("sizing.spec missing");
    const out = (await sizing({
      requirement: requirement({ outputCapacitanceF: "470 uF", slewVPerS: "1000 V/s" }),
      templates: [
        { label: "back-to-back family", stage: { kind: "catalog-part", partId: "demo-back-to-back-40v-2x5mohm" } },
      ],
    })) as { assumptions: string[] };
    expect(out.assumptions.some((a) => a.includes("the input-side FET carries the whole drop"))).toBe(true);
  });
});
