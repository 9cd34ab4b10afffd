import { TRPCError } from "@trpc/server";
import { getHTTPStatusCodeFromError } from "@trpc/server/http";
import type { z } from "zod";
import * as contracts from "../contracts/index.js";
import type { Context } from "./context.js";
import { appRouter } from "./router.js";
import { createCallerFactory } from "./trpc.js";

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
  return (path) => {
    if (!known.has(path)) return undefined;
    let node: unknown = caller;
    for (const part of path.split(".")) node = (node as Record<string, unknown>)[part];
    return node as Invoke;
  };
}

/** The HTTP status a thrown procedure error maps to (the same mapping /trpc uses). */
export function httpStatusOf(err: unknown): number {
  return err instanceof TRPCError ? getHTTPStatusCodeFromError(err) : 500;
}
