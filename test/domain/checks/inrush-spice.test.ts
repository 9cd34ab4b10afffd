import { describe, expect, it } from "vitest";
import { inrushCharge } from "../../../domain/checks/inrush.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";

const hasSpice = toolAvailable("ngspice");

/** ngspice transient from a discharged output (uic), returning [t, v(out)] rows. */
function outputWave(elements: string, stepS: number, stopS: number): [number, number][] {
  const rows = runNgspice(`* inrush into the output capacitance
.options reltol=1e-6 abstol=1e-9 vntol=1e-7
${elements}
.control
tran ${stepS} ${stopS} 0 ${stepS} uic
wrdata out.txt v(out)
quit
.endc
.end
`);
  return rows.map((r) => [r[0] ?? 0, r[1] ?? 0]);
}

// ngspice as the oracle on the same circuits as domain/checks/inrush.ts (docs/references.md "Inrush").
describe.skipIf(!hasSpice)("inrush against ngspice", () => {
  it("uncontrolled: Vin through Rloop + Rch into C ∥ RL — the channel's energy above its steady loss and the peak current", () => {
    const [vin, rLoop, rCh, cap, rl] = [16, 0.03, 0.012, 470e-6, 8];
    const model = inrushCharge({
      inputV: vin,
      capacitanceF: cap,
      load: { kind: "resistive", resistanceOhm: rl },
      drive: { kind: "uncontrolled", channelOhm: rCh, loopOhm: rLoop },
    });
    if (model.outcome !== "charges") throw new Error("expected a charge");
    const rows = outputWave(
      `V1 in 0 DC ${vin}\nRloop in mid ${rLoop}\nRch mid out ${rCh}\nC1 out 0 ${cap} IC=0\nRL out 0 ${rl}`,
      model.spanS / 4000,
      model.spanS,
    );
    const iss = vin / (rLoop + rCh + rl);
    const current = (v: number) => (vin - v) / (rLoop + rCh);
    let energyJ = 0;
    let peakA = 0;
    for (let k = 1; k < rows.length; k += 1) {
      const [t0, v0] = rows[k - 1] ?? [0, 0];
      const [t1, v1] = rows[k] ?? [0, 0];
      energyJ += 0.5 * (t1 - t0) * rCh * (current(v0) ** 2 + current(v1) ** 2 - 2 * iss * iss);
      peakA = Math.max(peakA, current(v0));
    }
    expect(relativeError(model.energyJ, energyJ)).toBeLessThan(0.01);
    expect(relativeError(model.peakCurrentA, peakA)).toBeLessThan(0.01);
  });

  it("current limit: a source of min(Ilim, Vds/Rch) into C ∥ RL — the time to 90 % of Vin and the switch's energy", () => {
    const [vin, lim, rCh, cap, rl] = [12, 5, 0.01, 1e-3, 4];
    const model = inrushCharge({
      inputV: vin,
      capacitanceF: cap,
      load: { kind: "resistive", resistanceOhm: rl },
      drive: { kind: "current-limit", limitA: lim },
    });
    if (model.outcome !== "charges") throw new Error("expected a charge");
    const rows = outputWave(
      `V1 in 0 DC ${vin}\nB1 in out I = min(${lim}, max(v(in)-v(out), 0)/${rCh})\nC1 out 0 ${cap} IC=0\nRL out 0 ${rl}`,
      model.chargeTimeS / 4000,
      1.2 * model.chargeTimeS,
    );
    const i = (v: number) => Math.min(lim, Math.max(vin - v, 0) / rCh);
    let energyJ = 0;
    let t90: number | undefined;
    for (let k = 1; k < rows.length; k += 1) {
      const [t0, v0] = rows[k - 1] ?? [0, 0];
      const [t1, v1] = rows[k] ?? [0, 0];
      if (t1 <= model.chargeTimeS) energyJ += 0.5 * (t1 - t0) * ((vin - v0) * i(v0) + (vin - v1) * i(v1));
      if (t90 === undefined && v1 >= 0.9 * vin) t90 = t0 + ((t1 - t0) * (0.9 * vin - v0)) / (v1 - v0);
    }
    // Closed form: V = Ilim·RL·(1 − e^(−t/(RL·C))) reaches 0.9·Vin at −RL·C·ln(1 − 0.9·Vin/(Ilim·RL)).
    const t90Model = -rl * cap * Math.log(1 - (0.9 * vin) / (lim * rl));
    expect(t90).toBeDefined();
    expect(relativeError(t90Model, t90 ?? 0)).toBeLessThan(0.005);
    expect(relativeError(model.energyJ, energyJ)).toBeLessThan(0.02);
  });

  it("slew: a MOSFET source follower with its gate ramped at s into C ∥ RL — the FET's energy ½·C·V² + Vin³/(6·RL·s)", () => {
    const [vin, s, cap, rl] = [16, 1000, 470e-6, 8];
    const model = inrushCharge({
      inputV: vin,
      capacitanceF: cap,
      load: { kind: "resistive", resistanceOhm: rl },
      drive: { kind: "slew", slewVPerS: s },
    });
    if (model.outcome !== "charges") throw new Error("expected a charge");
    const gateTopV = vin + 10;
    const rows = outputWave(
      [
        `V1 in 0 DC ${vin}`,
        `Vg g 0 PWL(0 0 ${gateTopV / s} ${gateTopV})`,
        "M1 in g out out NM W=100u L=100u",
        ".model NM NMOS(LEVEL=1 VTO=2 KP=50)",
        `C1 out 0 ${cap} IC=0`,
        `RL out 0 ${rl}`,
      ].join("\n"),
      2e-6,
      (gateTopV + 4) / s,
    );
    // FET energy: ∫(Vin − v)·(C·dv/dt + v/RL) dt, midpoint over ngspice's points, until the output
    // is within 1 % of Vin (the steady load current after it heats the channel by mW only).
    let energyJ = 0;
    for (let k = 1; k < rows.length; k += 1) {
      const [t0, v0] = rows[k - 1] ?? [0, 0];
      const [t1, v1] = rows[k] ?? [0, 0];
      if (v0 >= 0.99 * vin) break;
      const vm = (v0 + v1) / 2;
      energyJ += (vin - vm) * (cap * (v1 - v0) + (vm / rl) * (t1 - t0));
    }
    expect(relativeError(model.energyJ, energyJ)).toBeLessThan(0.03);
  });
});
