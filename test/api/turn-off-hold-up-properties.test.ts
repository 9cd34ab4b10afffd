import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { procedureInvoker, processLine } from "../../adapters/batch/run-batch.js";
import { demoContext } from "../helpers/app.js";

// Property: over the demo catalog and sensible ranges of the loop, capacitor, load and input, no
// turnOff or holdUp answer carries a non-finite number or a null where a number belongs (NaN and
// Infinity serialise as null): every figure is a finite number or the outcome says why it is absent.
// The rule verdicts are left out: their comparison fields are null by contract where a rule does
// not apply or a value is missing.
const PARTS = [
  "demo-pn-rectifier-3a-100v",
  "demo-schottky-5a-45v",
  "demo-schottky-10a-60v",
  "demo-pfet-40v-12mohm",
  "demo-nfet-low-side-60v-4mohm",
  "demo-ideal-diode-60v-3mohm",
  "demo-integrated-ideal-diode-5a-36v",
];

/** Paths of every null, NaN or infinite number in a value (after a JSON round trip, as a caller sees it). */
function nonFinite(v: unknown, path = "$", out: string[] = []): string[] {
  if (v === null) out.push(path);
  else if (typeof v === "number" && !Number.isFinite(v)) out.push(path);
  else if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i += 1) nonFinite(v[i], `${path}[${i}]`, out);
  } else if (typeof v === "object" && v !== undefined)
    for (const [k, x] of Object.entries(v)) if (k !== "rules") nonFinite(x, `${path}.${k}`, out);
  return out;
}

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);
const loadArb = fc.oneof(
  fc.record({ kind: fc.constant("constant-current"), currentA: logUniform(1e-3, 50) }),
  fc.record({ kind: fc.constant("resistive"), resistanceOhm: logUniform(0.05, 1e4) }),
  fc.record({
    kind: fc.constant("constant-power"),
    powerW: logUniform(0.01, 2000),
    minVoltageV: fc.double({ min: 0, max: 20, noNaN: true }),
  }),
);
const event = fc.record({
  partId: fc.constantFrom(...PARTS),
  outputV: fc.double({ min: 1, max: 60, noNaN: true }),
  afterFraction: fc.constantFrom(0, 0, 0.2, 0.5, 0.9, 0.999),
  loop: fc.record({
    resistanceOhm: fc.oneof(fc.constant(0), logUniform(1e-4, 10)),
    inductanceH: logUniform(1e-9, 1e-3),
  }),
  capacitor: fc.record({ capacitanceF: logUniform(1e-7, 0.1), esrOhm: fc.oneof(fc.constant(0), logUniform(1e-4, 5)) }),
  load: loadArb,
  loadMinFraction: fc.constantFrom(0, 0.5, 0.75, 0.99),
  tjC: fc.double({ min: -40, max: 150, noNaN: true }),
  turnOff: fc.record({
    reverseThresholdV: logUniform(1e-3, 0.2),
    turnOffDelayS: fc.oneof(fc.constant(0), logUniform(1e-8, 1e-4)),
  }),
});

describe("every numeric field of the falling-input analyses is finite", () => {
  const invoker = procedureInvoker(demoContext());
  const run = async (procedure: string, input: unknown) => {
    const out = await processLine(JSON.stringify({ id: "p", procedure, input }), 1, invoker);
    return JSON.parse(JSON.stringify(out)) as { ok: boolean; result?: unknown; error?: unknown };
  };

  it("turnOff answers", async () => {
    await fc.assert(
      fc.asyncProperty(event, async (e) => {
        const input = {
          stage: { kind: "catalog-part", partId: e.partId },
          outputV: e.outputV,
          inputAfterV: e.outputV * e.afterFraction,
          loop: e.loop,
          capacitor: e.capacitor,
          load: e.load,
          loadMinV: e.outputV * e.loadMinFraction,
          tjC: e.tjC,
          turnOff: e.turnOff,
          waveform: true,
          ruleSet: "default",
        };
        const out = await run("turnOff", input);
        expect(out.ok ? [] : [JSON.stringify(out.error)]).toEqual([]);
        expect(nonFinite(out.result), JSON.stringify(input)).toEqual([]);
        // Self-checks where they mean something: the energy balance closes, the clamp absorbs.
        const r = out.result as {
          energies?: { balanceResidual?: number };
          clamp?: { absorbedJ: number; energies: { balanceResidual?: number } };
        };
        expect(Math.abs(r.energies?.balanceResidual ?? 0), JSON.stringify(input)).toBeLessThan(1e-3);
        expect(Math.abs(r.clamp?.energies.balanceResidual ?? 0), JSON.stringify(input)).toBeLessThan(1e-3);
        expect(r.clamp?.absorbedJ ?? 0, JSON.stringify(input)).toBeGreaterThanOrEqual(0);
      }),
      { numRuns: 150, seed: 20261203, endOnFailure: true },
    );
  }, 120_000);

  it("holdUp answers", async () => {
    await fc.assert(
      fc.asyncProperty(event, fc.boolean(), async (e, open) => {
        const input = {
          stages: PARTS.map((partId) => ({ kind: "catalog-part", partId })),
          outputV: e.outputV,
          capacitor: e.capacitor,
          load: e.load,
          loadMinV: e.outputV * e.loadMinFraction,
          tjC: e.tjC,
          requiredHoldUpS: 1e-3,
          input: open
            ? { kind: "open" }
            : { kind: "falls", inputAfterV: e.outputV * e.afterFraction, loop: e.loop, turnOff: e.turnOff },
          ruleSet: "default",
        };
        const out = await run("holdUp", input);
        expect(out.ok ? [] : [JSON.stringify(out.error)]).toEqual([]);
        expect(nonFinite(out.result), JSON.stringify(input)).toEqual([]);
      }),
      { numRuns: 50, seed: 20261203, endOnFailure: true },
    );
  }, 120_000);
});
