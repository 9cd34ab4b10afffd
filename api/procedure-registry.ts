import { getTRPCErrorFromUnknown, TRPCError } from "@trpc/server";
import { getHTTPStatusCodeFromError } from "@trpc/server/http";
import type { z } from "zod";
import type { Context } from "./context.js";
import type { ProcedureDefinition } from "./define-procedure.js";
import { errorBodyOf, UNPROCESSABLE_CODES } from "./error-body.js";
import { PROCEDURE_TABLE } from "./procedure-table.js";
import { collectingFits, type FitNote } from "./record/fit-notes.js";
import { recordCall } from "./record/verdict-record.js";

/**
 * A procedure of the table as the adapters list it: /v1's listing, OpenAPI, the batch's CSV
 * columns, the metrics and the tests read these.
 */
export interface ProcedureEntry {
  readonly path: string;
  readonly type: "query";
  readonly input: z.ZodType;
  readonly output: z.ZodType;
  readonly description: string | undefined;
}

let table: ReadonlyMap<string, ProcedureDefinition> | undefined;
/** The table by name, built on first use (the verify procedure calls back into this module). */
function definitions(): ReadonlyMap<string, ProcedureDefinition> {
  table ??= new Map(PROCEDURE_TABLE.map((d): [string, ProcedureDefinition] => [d.name, d]));
  return table;
}

function describe(schema: z.ZodType): string | undefined {
  const d = schema.meta()?.description;
  return typeof d === "string" ? d : undefined;
}

let cache: readonly ProcedureEntry[] | undefined;

/** Every procedure of the table, sorted by path (a stable order for OpenAPI and listings). */
export function procedureEntries(): readonly ProcedureEntry[] {
  cache ??= [...definitions().values()]
    .map((d) => ({
      path: d.name,
      type: "query" as const,
      input: d.input,
      output: d.output,
      description: d.description ?? describe(d.input),
    }))
    .sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  return cache;
}

export function procedureEntry(path: string): ProcedureEntry | undefined {
  return procedureEntries().find((e) => e.path === path);
}

/** A procedure called in process: a promise of its result, rejected where the call fails. */
export type Invoke = (input: unknown) => Promise<unknown>;

/** A promise (or any thenable): what a call returns where its handler is asynchronous. */
export const isThenable = (v: unknown): v is PromiseLike<unknown> =>
  typeof v === "object" && v !== null && typeof (v as { then?: unknown }).then === "function";

/**
 * The one definition of a call: the input parsed by the entry's contract (a failure is
 * BAD_REQUEST with the zod error as its cause), the handler run with the context, and anything
 * the handler throws mapped by tRPC's `getTRPCErrorFromUnknown` (a TRPCError as it is, anything
 * else INTERNAL_SERVER_ERROR with it as the cause), and the verdict record added to an analysis's
 * result (api/record/verdict-record.ts: digests of the input as sent and as understood, the rule
 * sets and catalog parts it used, the curve fits it made, the versions, the result's digest, signed where a key is set).
 * /trpc, /v1, bulk, batch and the compute threads all call procedures through it.
 */
function callNow(d: ProcedureDefinition, ctx: Context, raw: unknown): unknown {
  let input: unknown;
  try {
    input = d.input.parse(raw);
  } catch (cause) {
    throw new TRPCError({ code: "BAD_REQUEST", cause });
  }
  const recording = recordCall(ctx);
  let out: unknown;
  let fits: readonly FitNote[];
  try {
    // the fits a handler makes are noted while it runs (synchronously, as every handler today)
    ({ value: out, fits } = collectingFits(() => d.handler({ input, ctx: recording.ctx })));
  } catch (cause) {
    throw getTRPCErrorFromUnknown(cause);
  }
  return isThenable(out)
    ? Promise.resolve(out).then(
        (result) => recording.seal(d.name, raw, input, result, fits),
        (cause: unknown) => {
          throw getTRPCErrorFromUnknown(cause);
        },
      )
    : recording.seal(d.name, raw, input, out, fits);
}

/**
 * A procedure called by name through the one call definition, unobserved (the verify procedure's
 * recomputation): its result, a promise of it, or a throw as {@link callNow}'s; an unknown name is NOT_FOUND.
 */
export function callProcedure(path: string, ctx: Context, raw: unknown): unknown {
  const d = definitions().get(path);
  if (d === undefined) throw new TRPCError({ code: "NOT_FOUND", message: `no procedure "${path}"` });
  return callNow(d, ctx, raw);
}

/** Tell the context's observer of one call that began at `started` (performance.now()). */
function observeCall(
  ctx: Context,
  path: string,
  started: number,
  r: { ok: true; data: unknown } | { ok: false; error: unknown },
): void {
  if (ctx.observe === undefined) return;
  const seconds = (performance.now() - started) / 1000;
  ctx.observe(r.ok ? { path, ok: true, data: r.data, seconds } : { path, ok: false, error: r.error, seconds });
}

/** `answer()` (a value, or a promise of one), its outcome told to the context's observer, if any; input parsing included in the time. */
function observed(ctx: Context, path: string, answer: () => unknown): unknown {
  if (ctx.observe === undefined) return answer();
  const started = performance.now();
  let out: unknown;
  try {
    out = answer();
  } catch (error) {
    observeCall(ctx, path, started, { ok: false, error });
    throw error;
  }
  if (!isThenable(out)) {
    observeCall(ctx, path, started, { ok: true, data: out });
    return out;
  }
  return Promise.resolve(out).then(
    (data) => {
      observeCall(ctx, path, started, { ok: true, data });
      return data;
    },
    (error: unknown) => {
      observeCall(ctx, path, started, { ok: false, error });
      throw error;
    },
  );
}

/** Resolve a procedure's name to its in-process call with this context (observed where the context has an observer). */
export function procedureInvoker(ctx: Context): (path: string) => Invoke | undefined {
  const invokers = new Map<string, Invoke>();
  return (path) => {
    let invoke = invokers.get(path);
    if (invoke === undefined) {
      const d = definitions().get(path);
      if (d === undefined) return undefined;
      invoke =
        ctx.observe === undefined
          ? async (raw: unknown) => callNow(d, ctx, raw)
          : async (raw: unknown) => observed(ctx, path, () => callNow(d, ctx, raw));
      invokers.set(path, invoke);
    }
    return invoke;
  };
}

/**
 * A /trpc call (the tRPC router's resolver): where the context offloads it (the HTTP server: its
 * compute threads, under the compute budget), the answer comes from there; else it is called here.
 */
export function runProcedure(path: string, raw: unknown, ctx: Context): unknown {
  const away = ctx.offload?.(path, raw);
  if (away !== undefined) return observed(ctx, path, () => away);
  const d = definitions().get(path);
  if (d === undefined) throw new TRPCError({ code: "NOT_FOUND", message: `no procedure "${path}"` });
  return observed(ctx, path, () => callNow(d, ctx, raw));
}

/** The HTTP status a thrown procedure error maps to (the same mapping /trpc uses): tRPC's, and 422 for UNPROCESSABLE_CODES (an input past a limit). */
export function httpStatusOf(err: unknown): number {
  if (!(err instanceof TRPCError)) return 500;
  return err.code === "BAD_REQUEST" && UNPROCESSABLE_CODES.has(errorBodyOf(err).code)
    ? 422
    : getHTTPStatusCodeFromError(err);
}
