import { createRequire } from "node:module";
import { workerData } from "node:worker_threads";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { type Format, outputFormatter } from "../batch/formats.js";
import { answerChunk, type ChunkAnswer, type ChunkTask } from "../batch/answer.js";
import { catalogOf } from "../catalog/file-catalog.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import type { CatalogData } from "./pool.js";
import { recordSignerOf } from "../record/signing-key.js";
import { type ReportAnswer, type ReportTask, reportAnswer } from "./report-call.js";
import { LIMITS } from "../../contracts/limits.js";
import { answerTooLarge, boundedJsonAnswers, type ItemJson, type ItemResult, callOne, callOneJson } from "./call.js";

/**
 * A worker thread of the compute pool (piscina): the same router, in this thread, with the catalog
 * the main thread handed over (pool.ts, CatalogData). A task that runs past its deadline is
 * stopped by terminating the thread.
 */
const { catalog, rulesDir, recordKeyPem } = workerData as {
  catalog: CatalogData;
  rulesDir?: string | undefined;
  recordKeyPem?: string | undefined;
};
const invoker = procedureInvoker({
  catalog: catalogOf(catalog.id, catalog.parts),
  ruleSets: loadRuleSetStore(rulesDir),
  recordSigner: recordKeyPem === undefined ? undefined : recordSignerOf(recordKeyPem),
});

/** Answers once this thread has loaded the router (the pool's `ready`). */
export function ping(): boolean {
  return true;
}

/**
 * HTTP /trpc and reports: the items of one request, in order, as objects; with `bounded`, a result
 * whose JSON passes the answer limit is refused in its place (measured here, off the request thread).
 */
export async function call({
  path,
  inputs,
  bounded,
}: {
  path: string;
  inputs: unknown[];
  bounded?: boolean;
}): Promise<ItemResult[]> {
  const invoke = invoker(path);
  if (invoke === undefined) throw new Error(`no procedure ${path}`);
  const out: ItemResult[] = [];
  for (const input of inputs) {
    const it = await callOne(invoke, input);
    const chars = bounded === true && it.ok ? (JSON.stringify(it.result)?.length ?? 0) : 0;
    out.push(chars > LIMITS.maxAnswerBytes ? answerTooLarge(chars) : it);
  }
  return out;
}

/** HTTP reports: the call and its report drawn here (see reportAnswer). */
export async function report(task: ReportTask): Promise<ReportAnswer> {
  const invoke = invoker(task.procedure);
  if (invoke === undefined) throw new Error(`no procedure ${task.procedure}`);
  return reportAnswer(invoke, task);
}

/**
 * HTTP /v1: as {@link call}, each result written out as JSON here (a string crosses to the main
 * thread cheaper than a cloned object, and the main thread need not serialise it), up to the
 * answer limit (boundedJsonAnswers). Row `ab-node22-calljson` (Node 22, one compute thread, 5
 * alternating runs): with objects and the main thread serialising, /v1/review at 0.76 (0.57-1.66)
 * and /v1/holdUp at 0.94 (0.54-1.11) of this rate, 4 rounds of 5 lower in each.
 */
export async function callJson({ path, inputs }: { path: string; inputs: unknown[] }): Promise<ItemJson[]> {
  const invoke = invoker(path);
  if (invoke === undefined) throw new Error(`no procedure ${path}`);
  return boundedJsonAnswers(inputs, (input) => callOneJson(invoke, input));
}

/**
 * Test hook for the fault suite (test/reliability): with BACKSTOP_TEST_WORKER_FAULT set to "throw"
 * or "crash", a record whose text holds FAULT_MARKER makes this thread throw from the task, or die
 * (an uncaught error outside it). Unset in production; the marker is not a field of any contract.
 * With it set, the batch command answers no chunk in its main thread (`poolOnly`), so the marked
 * records meet a thread.
 */
const FAULT = process.env.BACKSTOP_TEST_WORKER_FAULT;
const FAULT_MARKER = "__backstop_test_worker_fault__";

const formatters = new Map<string, ReturnType<typeof outputFormatter>>();
const formatterOf = (outFormat: Format, columnsOf: readonly string[] | undefined) => {
  const key = `${outFormat}:${columnsOf === undefined ? "*" : JSON.stringify(columnsOf)}`;
  let fmt = formatters.get(key);
  if (fmt === undefined) {
    fmt = outputFormatter(outFormat, columnsOf);
    formatters.set(key, fmt);
  }
  return fmt;
};

async function testFault(hit: boolean): Promise<void> {
  if (!hit) return;
  if (FAULT === "crash") {
    setImmediate(() => {
      throw new Error("test fault: the worker thread dies");
    });
    await new Promise(() => undefined); // never answers; the thread's death rejects the task
  }
  throw new Error("test fault: the worker thread throws");
}

/**
 * Batch: a chunk of whole input records as bytes (its first line's number given) → its output
 * records, written out and encoded here, as bytes (answerChunk, as the main thread answers its
 * own). Bytes cross between threads as one copy. Row `batch-node22-paths` (Node 22): with the
 * records crossing as strings each way (the main thread decoding the chunk into lines, and
 * encoding the answered texts) the rate was the same (0.95, 0.85-1.57) and the peak RSS 59 MB
 * higher (333 against 274 MB, medians), over the batch's 300 MB target in every round.
 */
export async function batchChunk(task: ChunkTask): Promise<ChunkAnswer> {
  if (FAULT !== undefined)
    await testFault(
      Buffer.from(task.bytes.buffer, task.bytes.byteOffset, task.bytes.byteLength).includes(FAULT_MARKER),
    ); // no scan of every chunk in production
  const answer = await answerChunk(task, formatterOf(task.outFormat, task.columnsOf).line, invoker);
  return moved(answer, answer.bytes.buffer as ArrayBuffer);
}

let piscina: typeof import("piscina") | undefined;
/**
 * `value` sent back with `buffer` transferred, not copied (piscina's documented transferable
 * protocol, `Piscina.move`): the buffer then belongs to the main thread, and this thread must not touch it again.
 */
function moved<T extends object>(value: T, buffer: ArrayBuffer): T {
  piscina ??= createRequire(import.meta.url)("piscina") as typeof import("piscina");
  const { Piscina } = piscina;
  return Piscina.move({ [Piscina.transferableSymbol]: buffer, [Piscina.valueSymbol]: value } as never) as T;
}
