import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { procedureEntries, procedureEntry } from "../../api/procedure-registry.js";
import { testApp } from "../helpers/app.js";
import { exampleInputs, hasUnknownKey, mutatedBody, mutationArb, schemaKeys } from "./request-fuzz.js";

/**
 * Fuzzing every procedure over /v1 and /trpc in process (app.request): random JSON and random
 * text, and the procedure's example request with one node mutated (type, sign, magnitude, a unit of
 * the wrong dimension, missing, extra, a huge string, deep nesting). Property: never a 5xx, never a
 * crash; every rejection is a 4xx whose problem names the path(s) at fault. Seeded, so a failure
 * replays. Valid mutations run the whole analysis, so the heavy procedures get few of them.
 */
const { app, logs } = testApp();
const SEED = 20_251_201;

/** valid-mutation cases per surface: ~1 s of computation per procedure at most */
const MUTATION_RUNS: Record<string, number> = {
  operatingPoint: 1500,
  "rules.evaluate": 500,
  "rules.list": 500,
  "rules.show": 500,
  turnOff: 400,
  holdUp: 150,
  oring: 100,
  bridgeDc: 60,
  bridgeAc: 25,
  review: 12,
  batteryCharge: 5,
  "sizing.spec": 5,
  "sizing.catalog": 5,
  fit: 60,
  "catalog.list": 500,
  "catalog.show": 500,
  verify: 300,
};
const RANDOM_RUNS = 200;
let cases = 0;
let unknownKeyCases = 0;

/** The property names of each procedure's input contract: a key outside them is unknown. */
const knownKeys = new Map<string, Set<string>>();
function keysOf(procedure: string): Set<string> {
  let k = knownKeys.get(procedure);
  if (k === undefined) {
    const input = procedureEntry(procedure)?.input;
    k = input ? schemaKeys(z.toJSONSchema(input, { io: "input", unrepresentable: "any" })) : new Set();
    knownKeys.set(procedure, k);
  }
  return k;
}

/**
 * A verify body without its filed inputs and results: verify takes them as data, whatever keys they
 * hold (a changed one is answered "tampered", not refused), so only the keys around them are checked.
 */
function withoutFiledData(body: string): string {
  try {
    const v = JSON.parse(body) as { records?: unknown };
    if (Array.isArray(v?.records))
      v.records = v.records.map((r: unknown) => {
        if (typeof r !== "object" || r === null || Array.isArray(r)) return r;
        const { input: _i, result: _r, ...rest } = r as Record<string, unknown>;
        return rest;
      });
    return JSON.stringify(v);
  } catch {
    return body;
  }
}

interface Problem {
  readonly code?: unknown;
  readonly issues?: readonly { readonly path?: unknown; readonly message?: unknown }[];
}

async function send(surface: "v1" | "trpc", procedure: string, body: string): Promise<void> {
  cases += 1;
  const res = await app.request(`/${surface}/${procedure}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body,
  });
  const text = await res.text();
  const where = `${surface}/${procedure} ${res.status}: ${text.slice(0, 300)} ← ${body.slice(0, 200)}`;
  if (res.status >= 500) throw new Error(`5xx: ${where}`);
  const unknownKey = hasUnknownKey(procedure === "verify" ? withoutFiledData(body) : body, keysOf(procedure));
  if (unknownKey) unknownKeyCases += 1;
  if (res.status < 400 && unknownKey) throw new Error(`a ${res.status} for an input with an unknown key: ${where}`);
  if (res.status < 400) return;
  if (res.status >= 500 || res.status < 400) throw new Error(`unexpected status: ${where}`);
  const json = JSON.parse(text) as Problem & { error?: { data?: { backstop?: Problem } } };
  const problem = surface === "v1" ? json : json.error?.data?.backstop;
  if (problem === undefined || typeof problem.code !== "string")
    throw new Error(`a rejection without a problem code: ${where}`);
  const issues = problem.issues ?? [];
  if (issues.length === 0) throw new Error(`a rejection that names no path: ${where}`);
  for (const i of issues)
    if (!Array.isArray(i.path) || typeof i.message !== "string") throw new Error(`an issue without a path: ${where}`);
}

describe("fuzzing /v1 and /trpc: zero 5xx, every rejection a 4xx naming a path", () => {
  const examples = exampleInputs();
  const procedures = procedureEntries().map((e) => e.path);

  it("every procedure has an example to mutate and a run count", () => {
    expect(procedures.filter((p) => !examples.has(p))).toEqual([]);
    expect(procedures.filter((p) => MUTATION_RUNS[p] === undefined)).toEqual([]);
  });

  it.each(procedures)("%s: random JSON and random text", async (procedure) => {
    for (const surface of ["v1", "trpc"] as const) {
      await fc.assert(
        fc.asyncProperty(
          fc.oneof(
            fc.jsonValue().map((v) => JSON.stringify(v)),
            fc.string({ maxLength: 200 }),
            fc.json({ depthSize: "large" }),
          ),
          async (body) => {
            await send(surface, procedure, body);
          },
        ),
        { numRuns: RANDOM_RUNS, seed: SEED },
      );
    }
  });

  it.each(procedures)(
    "%s: the example with one field mutated",
    async (procedure) => {
      const input = examples.get(procedure);
      for (const surface of ["v1", "trpc"] as const) {
        await fc.assert(
          fc.asyncProperty(mutationArb, async (m) => {
            await send(surface, procedure, mutatedBody(input, m));
          }),
          { numRuns: MUTATION_RUNS[procedure] ?? 5, seed: SEED },
        );
      }
    },
    120_000,
  );

  it("ran at least 10,000 cases and logged no internal error", () => {
    expect(cases).toBeGreaterThanOrEqual(10_000);
    expect(unknownKeyCases).toBeGreaterThanOrEqual(1_000); // inputs with an unknown key were sent, and none was answered 200
    expect(logs.filter((l) => /"level":50/.test(l))).toEqual([]);
  });
});
