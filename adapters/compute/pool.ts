import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { createRequire } from "node:module";
import type { ChunkAnswer, ChunkTask } from "../batch/answer.js";
import type { ItemJson, ItemResult } from "./call.js";
import type { ReportAnswer, ReportTask } from "./report-call.js";

/** The compiled worker (dist/adapters/compute/worker.js); absent when running from TypeScript sources. */
export function workerFile(): string | undefined {
  const url = new URL("./worker.js", import.meta.url);
  const file = fileURLToPath(url);
  return file.endsWith(".js") && existsSync(file) && import.meta.url.endsWith(".js") ? file : undefined;
}

export interface ComputePool {
  readonly threads: number;
  /** the items as objects; `bounded`: a result past the answer limit is refused in its place */
  call(path: string, inputs: unknown[], signal?: AbortSignal, bounded?: boolean): Promise<ItemResult[]>;
  /** as `call`, each result written out as JSON in the thread */
  callJson(path: string, inputs: unknown[], signal?: AbortSignal): Promise<ItemJson[]>;
  /** a procedure's call and its report drawn, in a thread */
  report(task: ReportTask, signal?: AbortSignal): Promise<ReportAnswer>;
  /** batch: a chunk of whole input records as bytes → its output records as bytes (parsed, answered, written out and encoded in the thread); the bytes' buffer is transferred (it must be the chunk's alone: not a view into a larger or pooled buffer) */
  batchChunk(chunk: ChunkTask, signal?: AbortSignal): Promise<ChunkAnswer>;
  /** settles once a thread has loaded the router and answered (it fails if the thread cannot start) */
  ready(): Promise<void>;
  close(): Promise<void>;
}

/** Young-generation size of a compute thread, MB (see createComputePool). */
export const COMPUTE_THREAD_YOUNG_GENERATION_MB = 32;

/** A pool of worker threads running the router; aborting a task terminates its thread (a hard stop). */
export function createComputePool(opts: {
  threads: number;
  catalogPath: string;
  rulesDir?: string | undefined;
  /** the verdict records' signing key (PEM), so a thread signs as the main thread does */
  recordKeyPem?: string | undefined;
  tasksPerThread?: number;
}): ComputePool | undefined {
  const filename = workerFile();
  if (filename === undefined || opts.threads < 1) return undefined;
  // piscina loaded with the first pool (the HTTP server starts its pool after it listens)
  const { Piscina } = createRequire(import.meta.url)("piscina") as typeof import("piscina");
  // A young generation of 32 MB a thread (V8's default here is 48). A batch of 1,000,000 lines with
  // one thread: 24 MB peaked at 243-251 MB but ran 5-8 % slower than 48 MB (270-283 MB, near the
  // 300 MB budget); 32 MB ran as fast as 48 within the noise at 270-272 MB.
  const pool = new Piscina({
    filename,
    minThreads: opts.threads,
    maxThreads: opts.threads,
    idleTimeout: 60_000,
    // tasks posted to a thread at once: a batch gives each thread its next chunk while it answers
    // one (the next is then waiting in the thread, not in this thread's queue until it turns)
    concurrentTasksPerWorker: opts.tasksPerThread ?? 1,
    resourceLimits: { maxYoungGenerationSizeMb: COMPUTE_THREAD_YOUNG_GENERATION_MB },
    workerData: { catalogPath: opts.catalogPath, rulesDir: opts.rulesDir, recordKeyPem: opts.recordKeyPem },
  });
  let up: Promise<void> | undefined;
  const options = (name: string, signal?: AbortSignal) => (signal === undefined ? { name } : { name, signal });
  return {
    threads: opts.threads,
    call: (path, inputs, signal, bounded) =>
      pool.run({ path, inputs, bounded }, options("call", signal)) as Promise<ItemResult[]>,
    callJson: (path, inputs, signal) => pool.run({ path, inputs }, options("callJson", signal)) as Promise<ItemJson[]>,
    report: (task, signal) => pool.run(task, options("report", signal)) as Promise<ReportAnswer>,
    // the chunk's bytes are transferred, not copied: the caller hands over a buffer of its own
    batchChunk: (chunk, signal) =>
      pool.run(chunk, {
        ...options("batchChunk", signal),
        transferList: [chunk.bytes.buffer as ArrayBuffer],
      }) as Promise<ChunkAnswer>,
    ready: () => {
      up ??= pool.run(null, options("ping")).then(() => undefined);
      return up;
    },
    close: () => pool.destroy(),
  };
}

/**
 * A compute pool whose threads start on the first call or on `start()`, whichever comes first. The
 * HTTP server starts it just after it listens: each thread loads the whole router (as long as the
 * main thread takes to start), and on a small machine threads starting alongside the main thread
 * would double its start-up. A call that arrives before the threads are up waits in the pool's
 * queue, within its compute budget, like any call while the threads are busy.
 */
export function deferredComputePool(
  opts: Parameters<typeof createComputePool>[0],
): (ComputePool & { start(): void }) | undefined {
  if (workerFile() === undefined || opts.threads < 1) return undefined;
  let inner: ComputePool | undefined;
  let closed = false;
  const get = (): ComputePool => {
    inner ??= createComputePool(opts);
    if (inner === undefined) throw new Error("compute pool: the worker file is missing");
    return inner;
  };
  return {
    threads: opts.threads,
    start: () => {
      if (!closed) get();
    },
    call: (path, inputs, signal, bounded) => get().call(path, inputs, signal, bounded),
    callJson: (path, inputs, signal) => get().callJson(path, inputs, signal),
    report: (task, signal) => get().report(task, signal),
    batchChunk: (chunk, signal) => get().batchChunk(chunk, signal),
    ready: () => get().ready(),
    close: async () => {
      closed = true;
      await inner?.close();
    },
  };
}
