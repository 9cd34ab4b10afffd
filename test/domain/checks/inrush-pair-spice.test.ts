import { describe, expect, it } from "vitest";
import { inrushCharge } from "../../../domain/checks/inrush.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";

const hasSpice = toolAvailable("ngspice");

// ngspice as the oracle (docs/references.md "Inrush") on which FET of a common-source pair carries
// an inrush held at a current limit (domain/review/review-inrush.ts pairDissipation): two level-1
// N-MOSFETs (invented: Vto 2 V, Kp 20 A/V²), sources joined, one gate voltage referred to the
// joined sources, set so the input-side FET saturates at 5 A ((Kp/2)·Vov² = 5 A at Vov = 0.7071 V).
describe.skipIf(!hasSpice)("a back-to-back pair at a current limit against ngspice", () => {
  const [vin, cap, limitA] = [24, 1e-3, 5];
  const rows = hasSpice
    ? runNgspice(`* common-source pair charging 1 mF at a 5 A limit
.options reltol=1e-6 abstol=1e-9 vntol=1e-7
V1 in 0 DC ${vin}
M1 in g s s nch
M2 out g s s nch
D1 s in dbody
D2 s out dbody
Vgs g s DC 2.70710678
C1 out 0 ${cap} IC=0
.model nch nmos level=1 vto=2 kp=20 lambda=0
.model dbody d is=1e-12 n=1 rs=0.01
.control
tran 1u 8m 0 1u uic
wrdata out.txt v(s) v(out) i(V1)
quit
.endc
.end
`)
    : [];
  /** [t, v(s), v(out), current into the pair] (wrdata writes time beside each vector). */
  const wave = rows.map((r) => [r[0] ?? 0, r[1] ?? 0, r[3] ?? 0, -(r[5] ?? 0)] as const);
  const model = inrushCharge({
    inputV: vin,
    capacitanceF: cap,
    load: { kind: "none" },
    drive: { kind: "current-limit", limitA },
  });
  if (model.outcome !== "charges") throw new Error("expected a charge");

  it("the input-side FET takes the loss; the output-side FET, across its body diode, under 5 % of it", () => {
    let inputSideJ = 0;
    let outputSideJ = 0;
    for (let k = 1; k < wave.length; k += 1) {
      const a = wave[k - 1];
      const b = wave[k];
      if (a === undefined || b === undefined) continue;
      const dt = b[0] - a[0];
      inputSideJ += 0.5 * dt * ((vin - a[1]) * a[3] + (vin - b[1]) * b[3]);
      outputSideJ += 0.5 * dt * ((a[1] - a[2]) * a[3] + (b[1] - b[2]) * b[3]);
    }
    // Conservation: the two FETs together lose ½·C·V² (0.288 J), the model's figure for the stage.
    expect(relativeError(inputSideJ + outputSideJ, 0.5 * cap * vin ** 2)).toBeLessThan(0.01);
    expect(relativeError(model.energyJ, 0.5 * cap * vin ** 2)).toBeLessThan(1e-12);
    expect(outputSideJ / model.energyJ).toBeLessThan(0.05);
    // Putting the whole loss on the input-side FET overstates its share by that little, never understates it.
    expect(inputSideJ).toBeLessThanOrEqual(model.energyJ);
    expect(inputSideJ / model.energyJ).toBeGreaterThan(0.95);
  });

  it("mid-charge the output-side FET drops less than a diode, the input-side FET the rest; the current holds the limit", () => {
    const mid = wave.find((w) => w[0] >= model.chargeTimeS / 2);
    if (mid === undefined) throw new Error("no sample");
    expect(mid[1] - mid[2]).toBeGreaterThan(0);
    expect(mid[1] - mid[2]).toBeLessThan(0.7);
    expect(relativeError(mid[3], limitA)).toBeLessThan(0.01);
    // Its SOA point: at the start the input-side FET holds all but that drop of the 24 V, at the limit.
    const first = wave.find((w) => w[0] >= 10e-6);
    if (first === undefined) throw new Error("no sample");
    expect(vin - (first[1] ?? 0)).toBeGreaterThan(0.97 * model.peakPowerVdsV);
    // The charge time C·V/I (4.8 ms) as the output passes 23 V: 23/24 of it within 2 %.
    const at23 = wave.find((w) => w[2] >= 23);
    expect(relativeError(at23?.[0] ?? 0, (model.chargeTimeS * 23) / 24)).toBeLessThan(0.02);
  });
});
