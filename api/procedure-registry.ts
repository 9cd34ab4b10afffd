import { TRPCError } from "@trpc/server";
import { getHTTPStatusCodeFromError } from "@trpc/server/http";
import { getParseFn, getTRPCErrorFromUnknown } from "@trpc/server/unstable-core-do-not-import";
import type { z } from "zod";
import * as contracts from "../contracts/index.js";
import type { Context } from "./context.js";
import { errorBodyOf, UNPROCESSABLE_CODES } from "./error-body.js";
import { appRouter } from "./router.js";
import { createCallerFactory, observeCall, publicProcedure } from "./trpc.js";

/**
 * Every procedure of the router with its input and output contracts, derived from the router itself
 * so a procedure added to `api/router.ts` appears in /v1, OpenAPI, metrics and batch with no edit here.
 *
 * - input: the zod schema given to `.input(...)` (tRPC keeps it in `_def.inputs`);
 * - output: `.output(...)` if the procedure declares one, else `meta({ output })`, else the contract
 *   named by convention `<procedure path in camelCase>Output` exported from `contracts/index.ts`
 *   (`operatingPointOutput`, `rulesEvaluateOutput` for `rules.evaluate`).
 */
export interface ProcedureEntry {
  readonly path: string;
  readonly type: "query" | "mutation" | "subscription";
  readonly input: z.ZodType | undefined;
  readonly output: z.ZodType | undefined;
  readonly description: string | undefined;
}

interface ProcedureDef {
  readonly type: "query" | "mutation" | "subscription";
  readonly inputs: readonly unknown[];
  readonly output?: unknown;
  readonly meta?: { readonly output?: unknown; readonly description?: string };
}

function isZod(x: unknown): x is z.ZodType {
  return typeof x === "object" && x !== null && "_zod" in x;
}

function describe(schema: z.ZodType | undefined): string | undefined {
  const d = schema?.meta()?.description;
  return typeof d === "string" ? d : undefined;
}

let cache: readonly ProcedureEntry[] | undefined;

/** Every procedure, sorted by path (stable order for OpenAPI and listings). */
export function procedureEntries(): readonly ProcedureEntry[] {
  if (cache) return cache;
  const named = contracts as unknown as Record<string, unknown>;
  const procs = appRouter._def.procedures as unknown as Record<string, { _def: ProcedureDef }>;
  cache = Object.keys(procs)
    .sort()
    .map((path) => {
      const def = (procs[path] as { _def: ProcedureDef })._def;
      const input = def.inputs.find(isZod);
      const leaf = path.split(".").at(-1) ?? path;
      const camel = path.split(".").map((p, i) => (i === 0 ? p : p.charAt(0).toUpperCase() + p.slice(1))).join("");
      const output = [def.output, def.meta?.output, named[`${camel}Output`], named[`${leaf}Output`]].find(isZod);
      return { path, type: def.type, input, output, description: def.meta?.description ?? describe(input) };
    });
  return cache;
}

export function procedureEntry(path: string): ProcedureEntry | undefined {
  return procedureEntries().find((e) => e.path === path);
}

/**
 * A procedure called in process. `now` is the same call answered in this turn of the event loop
 * where the procedure's input parser and resolver are synchronous (every procedure's today), or a
 * promise where either is not; it throws where the call would reject. A batch answers a record
 * with `now` and skips the two promises and microtask turns a call costs (about 1.3 us of 8 for
 * an operating point).
 */
export interface Invoke {
  (input: unknown): Promise<unknown>;
  readonly now: (input: unknown) => unknown;
}

/** A promise (or any thenable): what `Invoke.now` returns where a procedure is asynchronous. */
export const isThenable = (v: unknown): v is PromiseLike<unknown> => typeof v === "object" && v !== null && typeof (v as { then?: unknown }).then === "function";

/** Resolve a router path to a callable procedure of an in-process caller (the same router as /trpc). */
export function procedureInvoker(ctx: Context): (path: string) => Invoke | undefined {
  const caller = createCallerFactory(appRouter)(ctx) as unknown as Record<string, unknown>;
  const known = new Set(Object.keys(appRouter._def.procedures));
  const direct = new Map<string, Invoke>();
  return (path) => {
    if (!known.has(path)) return undefined;
    let invoke = direct.get(path);
    if (invoke === undefined) {
      invoke = directInvoke(path, ctx);
      if (invoke === undefined) {
        let node: unknown = caller;
        for (const part of path.split(".")) node = (node as Record<string, unknown>)[part];
        const call = node as (input: unknown) => Promise<unknown>;
        invoke = Object.assign((input: unknown) => call(input), { now: call });
      }
      direct.set(path, invoke);
    }
    return invoke;
  };
}

interface ResolverDef {
  readonly type: "query" | "mutation" | "subscription";
  readonly inputs: readonly unknown[];
  readonly middlewares: readonly ((...a: never[]) => unknown)[];
  readonly resolver?: (opts: { ctx: Context; input: unknown; path: string; type: string; meta: unknown; batchIndex: number; getRawInput: () => Promise<unknown>; signal: undefined }) => unknown;
  readonly meta?: unknown;
}

/**
 * The same call as the tRPC caller without its middleware chain (which copies the call options at
 * every step): the procedure's own input parser (tRPC's `getParseFn` of its `.input(...)`), its
 * resolver with the same context, errors mapped as tRPC maps them (a parse failure is BAD_REQUEST
 * with the zod error as cause, anything else `getTRPCErrorFromUnknown`), and the observer told as
 * the `observed` middleware tells it. Only for a procedure whose chain is exactly publicProcedure's
 * middlewares, one input parser and the resolver; any other shape (a procedure with its own
 * middleware, an output parser) goes through the caller. test/api/direct-invoker.test.ts checks
 * results and error bodies against the caller.
 */
export function directInvoke(path: string, ctx: Context): Invoke | undefined {
  const procs = appRouter._def.procedures as unknown as Record<string, { _def: ResolverDef }>;
  const def = procs[path]?._def;
  const base = (publicProcedure as unknown as { _def: { middlewares: readonly unknown[] } })._def.middlewares;
  if (def === undefined || def.resolver === undefined || def.type !== "query") return undefined;
  if (def.inputs.length !== 1 || def.middlewares.length !== base.length + 2) return undefined;
  if (!base.every((m, i) => def.middlewares[i] === m)) return undefined;
  if ((def.middlewares[base.length] as { _type?: string })._type !== "input") return undefined;
  const parse = getParseFn(def.inputs[0] as Parameters<typeof getParseFn>[0]);
  const resolver = def.resolver;
  const { type, meta } = def;
  // errors mapped as tRPC maps them: a parse failure is BAD_REQUEST with the parser's error as
  // cause, a resolver's failure getTRPCErrorFromUnknown
  const badInput = (cause: unknown) => new TRPCError({ code: "BAD_REQUEST", cause });
  const resolve = (input: unknown, raw: unknown): unknown => {
    let out: unknown;
    try {
      out = resolver({ ctx, input, path, type, meta, batchIndex: 0, getRawInput: async () => raw, signal: undefined });
    } catch (cause) {
      throw getTRPCErrorFromUnknown(cause);
    }
    return isThenable(out)
      ? Promise.resolve(out).catch((cause: unknown) => {
          throw getTRPCErrorFromUnknown(cause);
        })
      : out;
  };
  const now = (raw: unknown): unknown => {
    let input: unknown;
    try {
      input = parse(raw);
    } catch (cause) {
      throw badInput(cause);
    }
    if (!isThenable(input)) return resolve(input, raw);
    return Promise.resolve(input).then((parsed) => resolve(parsed, raw), (cause: unknown) => {
      throw badInput(cause);
    });
  };
  const run = async (raw: unknown): Promise<unknown> => now(raw);
  if (ctx.observe === undefined) return Object.assign(run, { now });
  const observedRun = async (raw: unknown): Promise<unknown> => {
    const started = performance.now();
    try {
      const data = await run(raw);
      observeCall(ctx, path, started, { ok: true, data });
      return data;
    } catch (e) {
      observeCall(ctx, path, started, { ok: false, error: e });
      throw e;
    }
  };
  return Object.assign(observedRun, { now: observedRun });
}

/** The HTTP status a thrown procedure error maps to (the same mapping /trpc uses): tRPC's, and 422 for UNPROCESSABLE_CODES (an input past a limit). */
export function httpStatusOf(err: unknown): number {
  if (!(err instanceof TRPCError)) return 500;
  return err.code === "BAD_REQUEST" && UNPROCESSABLE_CODES.has(errorBodyOf(err).code) ? 422 : getHTTPStatusCodeFromError(err);
}
