import { describe, expect, it } from "vitest";
import type { Context, ProcedureObservation } from "../../api/context.js";
import { errorBodyOf } from "../../api/error-body.js";
import { directInvoke, httpStatusOf, procedureEntries, procedureInvoker } from "../../api/procedure-registry.js";
import { appRouter } from "../../api/router.js";
import { createCallerFactory } from "../../api/trpc.js";
import { outcomeLabel } from "../../adapters/compute/call.js";
import { sharedCases } from "../helpers/cases.js";
import { demoContext } from "../helpers/app.js";

// The direct invoker (procedure-registry.ts) skips tRPC's middleware chain; it must answer exactly
// as tRPC's own caller does: the same result JSON, the same thrown error (class, tRPC code, body,
// HTTP status), and the same observations. Oracle: the tRPC caller of the same router.
const base = sharedCases();
const op = base.find((c) => c.id === "op-resistive")?.input as Record<string, unknown>;
const cases = [
  ...base,
  { id: "op-not-an-object", procedure: "operatingPoint", input: 42 },
  { id: "op-undefined", procedure: "operatingPoint", input: undefined },
  { id: "op-ruleset-unknown", procedure: "operatingPoint", input: { ...op, ruleSet: "no-such-set" } },
  { id: "op-computed-metric", procedure: "operatingPoint", input: { ...op, ruleSet: "consumer", ruleMetrics: { tjC: 1 } } },
  { id: "rules-show-unknown", procedure: "rules.show", input: { id: "nope" } },
  { id: "rules-list", procedure: "rules.list", input: undefined },
  { id: "op-with-rules", procedure: "operatingPoint", input: { ...op, ruleSet: "consumer" } },
];

type Seen = { result: string } | { name: string; code: unknown; status: number; body: unknown; causeName: unknown };
async function answer(call: () => Promise<unknown>): Promise<Seen> {
  try {
    return { result: JSON.stringify(await call()) };
  } catch (e) {
    const cause = (e as { cause?: unknown }).cause;
    return { name: (e as Error).name, code: (e as { code?: unknown }).code, status: httpStatusOf(e), body: errorBodyOf(e), causeName: (cause as Error | undefined)?.name };
  }
}
/** The tRPC caller's procedure at a dotted router path. */
function callerProcedure(caller: Record<string, unknown>, path: string): (input: unknown) => Promise<unknown> {
  let node: unknown = caller;
  for (const part of path.split(".")) node = (node as Record<string, unknown>)[part];
  return node as (input: unknown) => Promise<unknown>;
}
const label = (o: ProcedureObservation) => ({ path: o.path, ok: o.ok, outcome: o.ok ? outcomeLabel(o.data) : errorBodyOf(o.error).code, finite: Number.isFinite(o.seconds) && o.seconds >= 0 });

describe("direct invoker", () => {
  it("serves every procedure of the router without the middleware chain", () => {
    const ctx = demoContext();
    for (const e of procedureEntries()) expect(directInvoke(e.path, ctx), e.path).toBeDefined();
  });

  it("answers every case byte for byte as tRPC's caller does, errors and observations included", async () => {
    const seenCaller: ProcedureObservation[] = [];
    const seenDirect: ProcedureObservation[] = [];
    const plain = demoContext();
    const callerCtx: Context = { ...plain, observe: (o) => seenCaller.push(o) };
    const directCtx: Context = { ...plain, observe: (o) => seenDirect.push(o) };
    const caller = createCallerFactory(appRouter)(callerCtx) as unknown as Record<string, unknown>;
    const invoker = procedureInvoker(directCtx);
    let errors = 0;
    for (const c of cases) {
      const viaCaller = await answer(() => callerProcedure(caller, c.procedure)(c.input));
      const invoke = invoker(c.procedure);
      if (invoke === undefined) throw new Error(`no ${c.procedure}`);
      const viaDirect = await answer(() => invoke(c.input));
      expect(viaDirect, c.id).toEqual(viaCaller);
      if (!("result" in viaCaller)) errors += 1;
    }
    expect(errors).toBeGreaterThanOrEqual(6);
    expect(seenDirect.map(label)).toEqual(seenCaller.map(label));
    expect(seenDirect.length).toBe(cases.length);
  });

  it("now: answers in the same turn (no promise) for every procedure of the router, with the same results and errors as the caller", async () => {
    const ctx = demoContext(); // no observer: the batch's context
    const caller = createCallerFactory(appRouter)(ctx) as unknown as Record<string, unknown>;
    const invoker = procedureInvoker(ctx);
    let sync = 0;
    for (const c of cases) {
      const viaCaller = await answer(() => callerProcedure(caller, c.procedure)(c.input));
      const invoke = invoker(c.procedure);
      if (invoke === undefined) throw new Error(`no ${c.procedure}`);
      let thenable = false;
      const viaNow = await answer(async () => {
        const r = invoke.now(c.input); // throws here, not later, for a bad input
        thenable = typeof (r as { then?: unknown } | null)?.then === "function";
        return r;
      });
      expect(viaNow, c.id).toEqual(viaCaller);
      expect(thenable, c.id).toBe(false); // every procedure's parser and resolver are synchronous today
      sync += 1;
    }
    expect(sync).toBe(cases.length);
  });
});
