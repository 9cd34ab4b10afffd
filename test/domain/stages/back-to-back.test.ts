import { describe, expect, it } from "vitest";
import { reverseSteady } from "../../../domain/checks/reverse-steady.js";
import { reversePath } from "../../../domain/checks/reverse-path.js";
import { forwardLimits } from "../../../domain/checks/stage-ratings.js";
import { cToK } from "../../../domain/physics/constants.js";
import { branchCurrent } from "../../../domain/solve/series-branch.js";
import { stageForward } from "../../../domain/stages/forward.js";
import { offStateBlocking } from "../../../domain/stages/nfet-back-to-back.js";
import type { BackToBackStage } from "../../../domain/stages/stage-model.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { mosfet, siBodyDiode } from "../../helpers/stages.js";

const hasSpice = toolAvailable("ngspice");

/** A pair of 40 V FETs (test parameters, not a real part), one Rds(on) point at 10 V, gates at 10 V from 3.5 V up. */
function pair(
  rdsOnOhm: number,
  opts: { blocks?: boolean; regulatedDropV?: number; exponent?: number } = {},
): BackToBackStage {
  const m = mosfet(rdsOnOhm, { law: "power", exponent: opts.exponent ?? 2.3 }, { vdsMaxV: 40 });
  return {
    kind: "nfet-back-to-back",
    mosfet: { ...m, channel: { ...m.channel, rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm }] } },
    controller: {
      startV: 3.5,
      gateDrive: [{ inputV: 3.5, gateSourceV: 10 }],
      regulatedDropV: opts.regulatedDropV ?? 0,
      quiescentA: 0,
      gateReleaseFraction: 0,
    },
    blocksReverseCurrent: opts.blocks ?? true,
    thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
  };
}

describe("back-to-back N-FET pair: forward", () => {
  // Closed form: two channels in series, R(Tj) = R25·(Tj/298.15 K)^2.3 each (the model's own
  // temperature law, docs/references.md): drop = 2·I·R(Tj), loss = 2·I²·R(Tj), while the
  // output-side FET's body diode carries next to nothing: at 10 A and 120 °C (72 mV across it)
  // its share is below 1e-5 of the current, which the bound allows (ngspice checks it exactly below).
  it("drops 2·I·Rds(on)(Tj) and dissipates 2·I²·Rds(on)(Tj)", () => {
    const s = pair(0.005);
    for (const [i, tjC] of [
      [1, 25],
      [5, 100],
      [10, 120],
    ] as const) {
      const r = 0.005 * (cToK(tjC) / 298.15) ** 2.3;
      const f = stageForward(s, i, cToK(tjC), 12);
      expect(f.mode).toBe("fully-enhanced");
      expect(Math.abs(f.dropV - 2 * i * r) / (2 * i * r)).toBeLessThan(1e-5);
      expect(Math.abs(f.lossW - 2 * i * i * r) / (2 * i * i * r)).toBeLessThan(1e-5);
      expect(f.channelResistanceOhm).toBeCloseTo(2 * r, 12);
    }
  });

  it("holds a regulated drop at light load and is off below the controller's start (no body-diode path)", () => {
    const s = pair(0.005, { regulatedDropV: 0.02 });
    const light = stageForward(s, 0.5, cToK(25), 12);
    expect(light.mode).toBe("regulated-drop");
    expect(light.dropV).toBe(0.02);
    expect(light.lossW).toBeCloseTo(0.01, 15);
    expect(stageForward(s, 5, cToK(25), 12).mode).toBe("fully-enhanced");
    expect(stageForward(s, 1, cToK(25), 3).mode).toBe("off");
    expect(stageForward(s, 1, cToK(25), 16, false).mode).toBe("off");
  });

  // Source: ngspice .op on the same network: the input-side channel R alone (its body diode D1
  // reversed, anode at the joined sources), the output-side channel R in parallel with its body
  // diode D2 (anode at the joined sources, cathode at the output, here ground), the load current
  // driven in at the input; tight tolerances (ngspice's default reltol 1e-3 is too loose here).
  // R is large in the second case so D2 carries a real share of the current.
  it("matches ngspice on the pair's network, with and without body-diode conduction", () => {
    expect(hasSpice, "ngspice is needed for this check (apt-get install ngspice)").toBe(true);
    const d = siBodyDiode;
    for (const [rdsOnOhm, currentA, tjC] of [
      [0.005, 8, 100],
      [0.005, 10, 150],
      [0.4, 3, 25],
      [0.4, 3, 60],
    ] as const) {
      const s = pair(rdsOnOhm);
      const r = rdsOnOhm * (cToK(tjC) / 298.15) ** 2.3;
      const rows = runNgspice(`* back-to-back pair
.options temp=${tjC} tnom=25 reltol=1e-9 vntol=1e-12 abstol=1e-15
iload 0 in ${currentA}
r1 in mid ${r}
d1 mid in dmod
r2 mid 0 ${r}
d2 mid 0 dmod
.model dmod D(IS=${d.saturationCurrentA} N=${d.ideality} RS=${d.seriesResistanceOhm} EG=${d.energyGapEv} XTI=${d.saturationTempExponent})
.control
op
wrdata out.txt v(in)
quit
.endc
.end
`);
      const spiceDropV = rows[0]?.[1] as number;
      const f = stageForward(s, currentA, cToK(tjC), 12);
      expect(Math.abs(f.dropV - spiceDropV), `R ${rdsOnOhm} Ω, ${currentA} A`).toBeLessThan(1e-6 + 1e-5 * spiceDropV);
      if (rdsOnOhm > 0.1) expect(f.bodyDiodeCurrentA).toBeGreaterThan(0.1);
    }
  });
});

describe("back-to-back N-FET pair: blocking both ways", () => {
  const s = pair(0.005);
  const tK = cToK(25);

  it("blocks −14 V at its input with the output at 0 V: the output-side FET, within its 40 V rating", () => {
    const b = offStateBlocking(s, -14, 0);
    expect(b.blockingFet).toBe("output-side");
    expect(b.blockedV).toBe(14);
    expect(b.withinRating).toBe(true);
    const r = reverseSteady(s, 14, 25);
    expect(r.outcome).toBe("blocks");
    expect(r.stress.ratingV).toBe(40);
    expect(r.stress.partVoltageV).toBe(14);
    if (r.outcome === "blocks") expect(r.leakageA).toBeLessThan(1e-6);
    // the circuit: 14 V reversed across the stage behind 0.1 Ω each side carries only leakage
    const br = branchCurrent(s, -14, 0.1, 0, 0.1, tK);
    expect(br.blocks).toBe(true);
    expect(Math.abs(br.currentA)).toBeLessThan(1e-6);
  });

  it("blocks +16 V at its input with the output at 0 V when off: the input-side FET, within its 40 V rating", () => {
    const b = offStateBlocking(s, 16, 0);
    expect(b.blockingFet).toBe("input-side");
    expect(b.blockedV).toBe(16);
    expect(b.withinRating).toBe(true);
    expect(stageForward(s, 0, tK, 16, false).mode).toBe("off");
    // below the controller's start the forward branch carries nothing either
    const br = branchCurrent(s, 3, 0.1, 0, 0.1, tK);
    expect(br.currentA).toBe(0);
    expect(br.blocks).toBe(true);
    // the review holds every positive peak against the input-side FET's VDS
    expect(forwardLimits(s).find((l) => l.element === "forward-blocking-fet")?.ratingV).toBe(40);
    expect(offStateBlocking(s, 45, 0).withinRating).toBe(false);
  });

  // Closed form of the controller's trip: the reverse drop across both channels, i·2R, reaches the
  // threshold at i = Vth/(2R); the delay is the controller's plus Qg/Isink.
  it("turns off on reverse current across both channels (ideal-diode controller), conducts back with a plain driver", () => {
    const timing = { reverseThresholdV: 0.03, turnOffDelayS: 1e-6, gateChargeC: 20e-9, gateSinkCurrentA: 0.02 };
    const p = reversePath(s, tK, 12, 0, 12, timing);
    expect(p.kind).toBe("controller");
    if (p.kind === "controller") {
      expect(p.channelOhm).toBeCloseTo(0.01, 15);
      expect(p.tripCurrentA).toBeCloseTo(3, 12);
      expect(p.offDelayS).toBeCloseTo(2e-6, 15);
    }
    expect(reversePath(pair(0.005, { blocks: false }), tK, 12, 0, 12, undefined).kind).toBe("channel-stays-on");
    expect(reversePath(s, tK, 2, 0, 12, timing)).toEqual({ kind: "diode", seriesOhm: 0 });
  });
});
