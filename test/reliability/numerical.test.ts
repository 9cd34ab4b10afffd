import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { errorBodyOf } from "../../api/error-body.js";
import { procedureEntry, procedureInvoker } from "../../api/procedure-registry.js";
import { demoContext } from "../helpers/app.js";
import { exampleInputs } from "./request-fuzz.js";

/**
 * Numerical robustness: random valid inputs across the parameter ranges. Property: the result
 * matches the output contract, holds no NaN or ±Infinity anywhere, and a case with no operating
 * point says so with an explicit outcome; bad combinations are a named input error, never an
 * internal one. 100,000 operating points (~20 µs each in the domain) and a few hundred of each
 * other cheap analysis (its example with every number scaled at random).
 */
const invoker = procedureInvoker(demoContext());
const SEED = 4_242;

/** paths of every non-finite number in v */
function nonFinite(v: unknown, at = "", out: string[] = []): string[] {
  if (typeof v === "number") {
    if (!Number.isFinite(v)) out.push(`${at}=${v}`);
  } else if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i += 1) nonFinite(v[i], `${at}[${i}]`, out);
  } else if (typeof v === "object" && v !== null)
    for (const [k, x] of Object.entries(v)) nonFinite(x, `${at}.${k}`, out);
  return out;
}

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((x) => 10 ** x);
const PARTS = demoContext()
  .catalog.list()
  .map((p) => p.id);

const opInput = fc.record(
  {
    stage: fc.constantFrom(...PARTS).map((partId) => ({ kind: "catalog-part", partId })),
    supplyV: logUniform(0.05, 1000),
    sourceResistanceOhm: fc.oneof(fc.constant(0), logUniform(1e-4, 10)),
    load: fc.oneof(
      logUniform(1e-6, 200).map((currentA) => ({ kind: "constant-current", currentA })),
      logUniform(1e-2, 1e6).map((resistanceOhm) => ({ kind: "resistive", resistanceOhm })),
      fc
        .tuple(logUniform(1e-3, 5000), fc.double({ min: 0, max: 60, noNaN: true }))
        .map(([powerW, minVoltageV]) => ({ kind: "constant-power", powerW, minVoltageV })),
    ),
    ambientC: fc.double({ min: -60, max: 200, noNaN: true }),
    thermal: fc.oneof(
      logUniform(0.1, 2000).map((rthJaKPerW) => ({ kind: "junction-ambient", rthJaKPerW })),
      fc
        .tuple(logUniform(0.01, 50), logUniform(0.01, 10), logUniform(0.01, 500))
        .map(([a, b, c]) => ({ kind: "junction-case-sink", rthJcKPerW: a, rthCsKPerW: b, rthSaKPerW: c })),
    ),
  },
  { requiredKeys: ["stage", "supplyV", "load", "ambientC"] },
);

/** the example with every positive number scaled by its own random factor in [0.2, 5] (log-uniform) */
function scaled(input: unknown, factors: readonly number[]): unknown {
  let k = 0;
  const walk = (v: unknown): unknown => {
    if (typeof v === "number" && v > 0) return v * (factors[k++ % factors.length] as number);
    if (Array.isArray(v)) return v.map(walk);
    if (typeof v === "object" && v !== null)
      return Object.fromEntries(Object.entries(v).map(([key, x]) => [key, walk(x)]));
    return v;
  };
  return walk(input);
}

async function check(procedure: string, input: unknown, outcomes: Map<string, number>): Promise<void> {
  const invoke = invoker(procedure);
  const output = procedureEntry(procedure)?.output;
  if (invoke === undefined || output === undefined) throw new Error(`no procedure or output contract for ${procedure}`);
  let result: unknown;
  try {
    result = await invoke(input);
  } catch (e) {
    const body = errorBodyOf(e);
    if (body.code === "internal")
      throw new Error(`internal error for ${JSON.stringify(input)}: ${String((e as { cause?: unknown }).cause ?? e)}`);
    outcomes.set(`error:${body.code}`, (outcomes.get(`error:${body.code}`) ?? 0) + 1);
    return;
  }
  const bad = nonFinite(result);
  if (bad.length > 0) throw new Error(`non-finite ${bad.slice(0, 5).join(", ")} for ${JSON.stringify(input)}`);
  const parsed = output.safeParse(result);
  if (!parsed.success)
    throw new Error(
      `result does not match the output contract (${parsed.error.issues[0]?.path.join(".")}: ${parsed.error.issues[0]?.message}) for ${JSON.stringify(input)}`,
    );
  const outcome = (result as { outcome?: unknown }).outcome;
  const label = typeof outcome === "string" ? outcome : "ok";
  outcomes.set(label, (outcomes.get(label) ?? 0) + 1);
}

describe("numerical robustness: random valid inputs", () => {
  it("100,000 operating points: contract-shaped, finite, every non-converged case an explicit outcome", async () => {
    const outcomes = new Map<string, number>();
    await fc.assert(
      fc.asyncProperty(opInput, async (input) => check("operatingPoint", input, outcomes)),
      { numRuns: 100_000, seed: SEED },
    );
    const total = [...outcomes.values()].reduce((a, b) => a + b, 0);
    expect(total).toBe(100_000);
    // the ranges reach past the physics: solved points and the non-converged outcomes both occur
    expect(outcomes.get("solved") ?? 0).toBeGreaterThan(10_000);
    expect([...outcomes.keys()].filter((k) => k !== "solved" && !k.startsWith("error:")).length).toBeGreaterThanOrEqual(
      3,
    );
    if (process.env.BACKSTOP_REPORT) console.log(Object.fromEntries([...outcomes].sort()));
  }, 300_000);

  const others: [string, number][] = [
    ["turnOff", 400],
    ["holdUp", 200],
    ["oring", 150],
    ["bridgeDc", 100],
    ["rules.evaluate", 400],
  ];
  it.each(others)(
    "%s: %i scaled examples, contract-shaped and finite",
    async (procedure, runs) => {
      const example = exampleInputs().get(procedure);
      const outcomes = new Map<string, number>();
      await fc.assert(
        fc.asyncProperty(fc.array(logUniform(0.2, 5), { minLength: 8, maxLength: 8 }), async (factors) =>
          check(procedure, scaled(example, factors), outcomes),
        ),
        { numRuns: runs, seed: SEED },
      );
      expect([...outcomes.values()].reduce((a, b) => a + b, 0)).toBe(runs);
    },
    120_000,
  );
});
