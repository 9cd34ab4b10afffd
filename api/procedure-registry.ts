import { TRPCError } from "@trpc/server";
import { getHTTPStatusCodeFromError } from "@trpc/server/http";
import { getParseFn, getTRPCErrorFromUnknown } from "@trpc/server/unstable-core-do-not-import";
import type { z } from "zod";
import * as contracts from "../contracts/index.js";
import type { Context } from "./context.js";
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

export type Invoke = (input: unknown) => Promise<unknown>;

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
        invoke = node as Invoke;
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
  const run = async (raw: unknown): Promise<unknown> => {
    let input: unknown;
    try {
      input = await parse(raw);
    } catch (cause) {
      throw new TRPCError({ code: "BAD_REQUEST", cause });
    }
    try {
      return await resolver({ ctx, input, path, type, meta, batchIndex: 0, getRawInput: async () => raw, signal: undefined });
    } catch (cause) {
      throw getTRPCErrorFromUnknown(cause);
    }
  };
  if (ctx.observe === undefined) return run;
  return async (raw) => {
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
}

/** The HTTP status a thrown procedure error maps to (the same mapping /trpc uses). */
export function httpStatusOf(err: unknown): number {
  return err instanceof TRPCError ? getHTTPStatusCodeFromError(err) : 500;
}
