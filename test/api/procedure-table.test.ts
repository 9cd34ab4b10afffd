import { describe, expect, it } from "vitest";
import type { Context, ProcedureObservation } from "../../api/context.js";
import { errorBodyOf } from "../../api/error-body.js";
import { httpStatusOf, procedureEntries, procedureInvoker } from "../../api/procedure-registry.js";
import { PROCEDURE_TABLE } from "../../api/procedure-table.js";
import { appRouter } from "../../api/router.js";
import { outcomeLabel } from "../../adapters/compute/call.js";
import { sharedCases } from "../helpers/cases.js";
import { demoContext } from "../helpers/app.js";

// The procedure table is the one definition of every procedure; the tRPC router and the in-process
// call (/v1, bulk, batch and the compute threads) are both built from it. Oracle: tRPC's own caller
// of the router (its input middleware, error wrapping and error codes) must answer every case as the
// in-process call does: the same result JSON, the same thrown error (class, tRPC code, body, HTTP
// status) and the same observations.
const base = sharedCases();
const op = base.find((c) => c.id === "op-resistive")?.input as Record<string, unknown>;
const cases = [
  ...base,
  { id: "op-not-an-object", procedure: "operatingPoint", input: 42 },
  { id: "op-undefined", procedure: "operatingPoint", input: undefined },
  { id: "op-ruleset-unknown", procedure: "operatingPoint", input: { ...op, ruleSet: "no-such-set" } },
  {
    id: "op-computed-metric",
    procedure: "operatingPoint",
    input: { ...op, ruleSet: "consumer", ruleMetrics: { tjC: 1 } },
  },
  { id: "rules-show-unknown", procedure: "rules.show", input: { id: "nope" } },
  { id: "rules-list", procedure: "rules.list", input: undefined },
  { id: "op-with-rules", procedure: "operatingPoint", input: { ...op, ruleSet: "consumer" } },
];

type Seen = { result: string } | { name: string; code: unknown; status: number; body: unknown; causeName: unknown };
async function answer(call: () => unknown): Promise<Seen> {
  try {
    return { result: JSON.stringify(await call()) };
  } catch (e) {
    const cause = (e as { cause?: unknown }).cause;
    return {
      name: (e as Error).name,
      code: (e as { code?: unknown }).code,
      status: httpStatusOf(e),
      body: errorBodyOf(e),
      causeName: (cause as Error | undefined)?.name,
    };
  }
}
/** The tRPC caller's procedure at a dotted router path. */
function callerProcedure(ctx: Context, path: string): (input: unknown) => Promise<unknown> {
  let node: unknown = appRouter.createCaller(ctx);
  for (const part of path.split(".")) node = (node as Record<string, unknown>)[part];
  return node as (input: unknown) => Promise<unknown>;
}
const label = (o: ProcedureObservation) => ({
  path: o.path,
  ok: o.ok,
  outcome: o.ok ? outcomeLabel(o.data) : errorBodyOf(o.error).code,
  finite: Number.isFinite(o.seconds) && o.seconds >= 0,
});

describe("the procedure table", () => {
  it("declares each procedure once, with its input and output contract, and the router and the listing hold exactly those", () => {
    const names = PROCEDURE_TABLE.map((d) => d.name);
    expect(new Set(names).size).toBe(names.length);
    expect(procedureEntries().map((e) => e.path)).toEqual([...names].sort());
    const ctx = demoContext();
    for (const e of procedureEntries()) {
      expect(typeof callerProcedure(ctx, e.path), e.path).toBe("function");
      expect(e.input.safeParse, e.path).toBeTypeOf("function");
      expect(e.output.safeParse, e.path).toBeTypeOf("function");
    }
  });

  it("every example's answer has the shape of its procedure's output contract", async () => {
    const invoker = procedureInvoker(demoContext());
    const examples = base.filter((c) => !c.id.startsWith("op-"));
    expect(new Set(examples.map((c) => c.procedure)).size).toBe(PROCEDURE_TABLE.length);
    for (const c of examples) {
      const result = await invoker(c.procedure)?.(c.input);
      const parsed = procedureEntries()
        .find((e) => e.path === c.procedure)
        ?.output.safeParse(result);
      expect(parsed?.success ? "ok" : JSON.stringify(parsed?.error.issues.slice(0, 3)), c.id).toBe("ok");
    }
  });

  it("tRPC's caller and the in-process call answer every case alike, errors and observations included", async () => {
    const seenCaller: ProcedureObservation[] = [];
    const seenDirect: ProcedureObservation[] = [];
    const plain = demoContext();
    const callerCtx: Context = { ...plain, observe: (o) => seenCaller.push(o) };
    const invoker = procedureInvoker({ ...plain, observe: (o) => seenDirect.push(o) });
    let errors = 0;
    for (const c of cases) {
      const viaCaller = await answer(() => callerProcedure(callerCtx, c.procedure)(c.input));
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

  it("a bad input is BAD_REQUEST (400) with the zod error as its cause; a handler's own throw is INTERNAL_SERVER_ERROR (500) with no message of its own", async () => {
    const invoke = procedureInvoker(demoContext())("operatingPoint");
    const bad = await answer(() => invoke?.(42));
    expect(bad).toMatchObject({
      name: "TRPCError",
      code: "BAD_REQUEST",
      status: 400,
      causeName: "ZodError",
      body: { code: "invalid-input" },
    });
    const broken = procedureInvoker({
      ...demoContext(),
      catalog: {
        find: () => {
          throw new Error("disk on fire");
        },
        list: () => [],
        stamp: { id: "broken", hash: "sha256:0", partCount: 0 },
      },
    })("operatingPoint");
    const seen = await answer(() => broken?.(base.find((c) => c.procedure === "operatingPoint")?.input));
    expect(seen).toMatchObject({
      name: "TRPCError",
      code: "INTERNAL_SERVER_ERROR",
      status: 500,
      causeName: "Error",
      body: { code: "internal", issues: [] },
    });
    expect(JSON.stringify(seen)).not.toContain("disk on fire");
  });
});
