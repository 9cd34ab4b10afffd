import { describe, expect, it } from "vitest";
import { analyseBridgeDc } from "../../../domain/checks/bridge-dc.js";
import type { BridgeDcModel, DcPolarityOutcome } from "../../../domain/checks/bridge-dc-types.js";
import type { BridgeElements } from "../../../domain/checks/bridge-element.js";
import { cToK } from "../../../domain/physics/constants.js";
import { diodeVoltageV } from "../../../domain/physics/diode.js";
import { activeElement, demoPn, diodeElement, uniform } from "../../helpers/bridge-parts.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";

const hasSpice = toolAvailable("ngspice");

/** Demo: a PoE-powered camera input, 48 V either polarity (invented). */
function model(elements: BridgeElements, o: Partial<BridgeDcModel> = {}): BridgeDcModel {
  return {
    elements,
    supplyV: 48,
    sourceResistanceOhm: 0.2,
    load: { kind: "constant-current", currentA: 0.5 },
    ambientC: 40,
    ...o,
  };
}

function solved(o: DcPolarityOutcome) {
  if (o.outcome !== "solved") throw new Error(`expected solved, got ${o.outcome}: ${"reason" in o ? o.reason : ""}`);
  return o;
}

describe("DC bridge, either polarity", () => {
  it("puts the right pair in the path for each polarity and the rest in reverse", () => {
    const r = analyseBridgeDc(model(uniform(diodeElement())));
    const pos = solved(r.positive);
    const neg = solved(r.negative);
    expect(pos.conducting).toEqual(["line1High", "line2Low"]);
    expect(neg.conducting).toEqual(["line2High", "line1Low"]);
    // Source: Kirchhoff's voltage law around the loop and across each blocking element.
    for (const p of [pos, neg]) {
      expect(p.bridgeInputV).toBeCloseTo(48 - 0.5 * 0.2, 12);
      expect(p.loadV + p.totalDropV).toBeCloseTo(p.bridgeInputV, 12);
      for (const e of p.elements.filter((x) => x.role === "blocking")) {
        expect(e.reverseV).toBeGreaterThan(p.loadV);
        expect(e.reverseV).toBeLessThan(p.bridgeInputV);
      }
      const blockSum = p.elements.filter((x) => x.role === "blocking").reduce((s, e) => s + e.reverseV, 0);
      // line1Low sees loadV + drop(line1High); line2High sees loadV + drop(line2Low): sum = 2·loadV + drops.
      expect(blockSum).toBeCloseTo(2 * p.loadV + p.totalDropV, 10);
    }
  });

  // Source: conservation at the fixed point: Tj = Ta + RthJA·Vf(I, Tj)·I with Vf from the Shockley
  // law at that Tj (substitution into the model's own equations, solved independently here).
  it("solves each diode's junction temperature self-consistently on its own thermal path", () => {
    const hot = diodeElement(demoPn, 60);
    const cool = diodeElement(demoPn, 20);
    const r = analyseBridgeDc(
      model(
        { line1High: hot, line2Low: cool, line2High: cool, line1Low: hot },
        { load: { kind: "constant-current", currentA: 1 } },
      ),
    );
    const pos = solved(r.positive);
    for (const e of pos.elements.filter((x) => x.role === "conducting")) {
      const rth = e.position === "line1High" ? 60 : 20;
      const vf = diodeVoltageV(demoPn, 1, cToK(e.tjC));
      expect(e.dropV).toBeCloseTo(vf, 9);
      expect(e.tjC).toBeCloseTo(40 + rth * vf * 1, 6);
    }
    const [a, b] = pos.elements.filter((x) => x.role === "conducting");
    expect(a?.tjC).not.toBeCloseTo(b?.tjC ?? 0, 1);
  });

  // Source: closed form for a channel with a power-law Rds(on) (docs/references.md MOSFET): Tj solves
  // Tj = Ta + I²·R25·(Tj/298.15)^α·Rth; checked by substitution.
  it("active bridge: I²·Rds(on)(Tj) per element, far below the diode bridge", () => {
    const i = 2;
    const act = solved(
      analyseBridgeDc(
        model(uniform(activeElement({ rdsOnOhm: 0.03 })), { load: { kind: "constant-current", currentA: i } }),
      ).positive,
    );
    for (const e of act.elements.filter((x) => x.role === "conducting")) {
      expect(e.mode).toBe("fully-enhanced");
      const r = 0.03 * (cToK(e.tjC) / 298.15) ** 2.3;
      expect(relativeError(e.lossW, i * i * r)).toBeLessThan(1e-3); // body diode takes < 0.1 %
      expect(e.tjC).toBeCloseTo(40 + 40 * e.lossW, 6);
    }
    const dio = solved(
      analyseBridgeDc(model(uniform(diodeElement()), { load: { kind: "constant-current", currentA: i } })).positive,
    );
    expect(act.totalLossW).toBeLessThan(0.1 * dio.totalLossW);
  });

  it("mixed bridge: one diode and one MOSFET in the path for either polarity", () => {
    const d = diodeElement();
    const f = activeElement();
    const r = analyseBridgeDc(model({ line1High: d, line2High: d, line1Low: f, line2Low: f }));
    for (const p of [solved(r.positive), solved(r.negative)]) {
      const modes = p.elements.filter((x) => x.role === "conducting").map((x) => x.mode);
      expect(modes.sort()).toEqual(["fully-enhanced", "junction"]);
    }
    expect(solved(r.positive).totalLossW).toBeCloseTo(solved(r.negative).totalLossW, 9);
  });

  it("uses the body diode below the controller's start voltage", () => {
    const r = analyseBridgeDc(model(uniform(activeElement({ startV: 60 }))));
    const p = solved(r.positive);
    expect(p.elements.filter((x) => x.role === "conducting").every((x) => x.mode === "body-diode")).toBe(true);
  });

  // Source: ngspice 39 .op on the same bridge (level-1 diodes at 40 °C, resistive load); RthJA = 0
  // so both hold the junctions at ambient.
  it.skipIf(!hasSpice)("diode bridge with a resistive load matches ngspice .op for both polarities", () => {
    const e = diodeElement(demoPn, 0);
    const r = analyseBridgeDc(model(uniform(e), { load: { kind: "resistive", resistanceOhm: 24 } }));
    for (const [sign, p] of [
      [1, solved(r.positive)],
      [-1, solved(r.negative)],
    ] as const) {
      const rows = runNgspice(`* bridge dc
.options temp=40 tnom=25
V1 a l2 DC ${sign * 48}
Rs a l1 0.2
Rg l2 0 1e9
D1 l1 out dmod
D2 l2 out dmod
D3 0 l1 dmod
D4 0 l2 dmod
RL out 0 24
.model dmod D(IS=${demoPn.saturationCurrentA} N=${demoPn.ideality} RS=${demoPn.seriesResistanceOhm} EG=${demoPn.energyGapEv} XTI=${demoPn.saturationTempExponent})
.control
op
wrdata out.txt v(out) v(l1) v(l2)
quit
.endc
.end
`);
      const [, vout = 0, , vl1 = 0, , vl2 = 0] = rows[0] ?? [];
      expect(relativeError(p.loadV, vout)).toBeLessThan(1e-4);
      expect(relativeError(p.bridgeInputV, Math.abs(vl1 - vl2))).toBeLessThan(1e-4);
    }
  });

  it("reports thermal runaway and load collapse as outcomes, never NaN", () => {
    const runaway = analyseBridgeDc(
      model(uniform(activeElement({ rdsOnOhm: 0.5, rthJaKPerW: 200 })), {
        load: { kind: "constant-current", currentA: 3 },
      }),
    );
    expect(runaway.positive.outcome).toBe("thermal-runaway");
    const collapse = analyseBridgeDc(
      model(uniform(diodeElement()), { load: { kind: "constant-power", powerW: 5000, minVoltageV: 36 } }),
    );
    expect(collapse.positive.outcome).toBe("load-collapse");
    if (collapse.positive.outcome === "load-collapse") {
      // Source: maximum power transfer through 0.2 ohm from 48 V is 48²/(4·0.2) = 2880 W; the
      // bridge drops make the deliverable power lower still.
      expect(collapse.positive.maxDeliverablePowerW).toBeLessThan(2880);
    }
    expect(JSON.stringify([runaway, collapse])).not.toMatch(/NaN|Infinity|null/);
    const heavy = analyseBridgeDc(
      model(uniform(diodeElement()), { load: { kind: "constant-current", currentA: 500 } }),
    );
    expect(heavy.positive.outcome).toBe("load-collapse");
  });

  it("constant-power load: the stable high-voltage branch", () => {
    const r = solved(
      analyseBridgeDc(model(uniform(diodeElement()), { load: { kind: "constant-power", powerW: 25, minVoltageV: 36 } }))
        .positive,
    );
    expect(r.loadV * r.loadCurrentA).toBeCloseTo(25, 6);
    expect(r.loadV).toBeGreaterThan(40);
  });
});
