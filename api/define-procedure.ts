import type { z } from "zod";
import type { Context } from "./context.js";

/** What a handler is given: the input as its contract parsed it, and the call's context. */
export interface ProcedureCall<I> {
  readonly input: I;
  readonly ctx: Context;
}

/**
 * One procedure of backstop, declared once (an entry of `api/procedure-table.ts`): its dotted
 * name (`rules.evaluate`: the tRPC path and `/v1/rules.evaluate`), the zod contracts of its input
 * and of its answer, and the handler that maps the input to the domain, calls it and maps the result
 * back. The input is parsed before the handler runs; the answer is not parsed per call (the output
 * contract documents it: OpenAPI, the batch's CSV columns, and test/reliability/numerical.test.ts
 * checks results against it). `description` is the OpenAPI summary (default: the input contract's
 * description).
 */
export interface ProcedureDefinition<
  N extends string = string,
  In extends z.ZodType = z.ZodType,
  Out extends z.ZodType = z.ZodType,
  R = unknown,
> {
  readonly name: N;
  readonly input: In;
  readonly output: Out;
  readonly description?: string;
  handler(call: ProcedureCall<z.output<In>>): R;
}

/** A value of `T` that may be read only (what a handler may answer where the contract says `T`). */
type ReadOnly<T> = T extends readonly (infer E)[]
  ? readonly ReadOnly<E>[]
  : T extends object
    ? { readonly [K in keyof T]: ReadOnly<T[K]> }
    : T;

/** A handler's answer: `T` without its verdict record (added to the answer by the call definition, api/record/), union by union member. */
export type Answer<T> = T extends unknown ? (T extends { record: unknown } ? Omit<T, "record"> : T) : never;

/**
 * A procedure of the table (the compiler checks that the handler's answer has the output contract's
 * type, less the verdict `record` that the call definition adds).
 */
export function defineProcedure<
  const N extends string,
  In extends z.ZodType,
  Out extends z.ZodType,
  R extends ReadOnly<Answer<z.output<Out>>> | Promise<ReadOnly<Answer<z.output<Out>>>>,
>(definition: ProcedureDefinition<N, In, Out, R>): ProcedureDefinition<N, In, Out, R> {
  return definition;
}
