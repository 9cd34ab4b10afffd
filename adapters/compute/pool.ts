import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { createRequire } from "node:module";
import type { CatalogPart, PartsCatalog } from "../../api/context.js";
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

/**
 * The catalog a compute thread answers with, as the main thread loaded it: its name and parts (the
 * thread stamps them again with catalogOf, so the same stamp). Handed over, not read from the file
 * again, so the threads and the main thread answer from the same data even if the file has changed.
 */
export interface CatalogData {
  readonly id: string;
  readonly parts: readonly CatalogPart[];
}

export const catalogData = (c: PartsCatalog): CatalogData => ({ id: c.stamp.id, parts: c.list() });

/** A pool that can also be retired: closed once the tasks given to it so far have settled. */
export interface RetirablePool extends ComputePool {
  closeWhenIdle(): Promise<void>;
}

/** A pool of worker threads running the router; aborting a task terminates its thread (a hard stop). */
export function createComputePool(opts: {
  threads: number;
  catalog: CatalogData;
  rulesDir?: string | undefined;
  /** the verdict records' signing key (PEM), so a thread signs as the main thread does */
  recordKeyPem?: string | undefined;
}): RetirablePool | undefined {
  const filename = workerFile();
  if (filename === undefined || opts.threads < 1) return undefined;
  // piscina loaded with the first pool (the HTTP server starts its pool after it listens)
  const { Piscina } = createRequire(import.meta.url)("piscina") as typeof import("piscina");
  const pool = new Piscina({
    filename,
    minThreads: opts.threads,
    maxThreads: opts.threads,
    idleTimeout: 60_000,
    workerData: { catalog: opts.catalog, rulesDir: opts.rulesDir, recordKeyPem: opts.recordKeyPem },
  });
  let up: Promise<void> | undefined;
  // tasks given and not yet settled, so that a retired pool closes after its last one (closeWhenIdle)
  let active = 0;
  let idle: (() => void) | undefined;
  const run = <T>(task: unknown, o: Parameters<typeof pool.run>[1]): Promise<T> => {
    active += 1;
    return (pool.run(task, o) as Promise<T>).finally(() => {
      active -= 1;
      if (active === 0) idle?.();
    });
  };
  const options = (name: string, signal?: AbortSignal) => (signal === undefined ? { name } : { name, signal });
  return {
    threads: opts.threads,
    call: (path, inputs, signal, bounded) => run<ItemResult[]>({ path, inputs, bounded }, options("call", signal)),
    callJson: (path, inputs, signal) => run<ItemJson[]>({ path, inputs }, options("callJson", signal)),
    report: (task, signal) => run<ReportAnswer>(task, options("report", signal)),
    // the chunk's bytes are transferred, not copied: the caller hands over a buffer of its own
    batchChunk: (chunk, signal) =>
      run<ChunkAnswer>(chunk, { ...options("batchChunk", signal), transferList: [chunk.bytes.buffer as ArrayBuffer] }),
    ready: () => {
      up ??= run(null, options("ping")).then(() => undefined);
      return up;
    },
    close: () => pool.destroy(),
    closeWhenIdle: async () => {
      if (active > 0) await new Promise<void>((r) => (idle = r));
      await pool.destroy();
    },
  };
}

/**
 * A compute pool whose threads start on the first call or on `start()`, whichever comes first. The
 * HTTP server starts it just after it listens: each thread loads the whole router (as long as the
 * main thread takes to start), and on a small machine threads starting alongside the main thread
 * would double its start-up. A call that arrives before the threads are up waits in the pool's
 * queue, within its compute budget, like any call while the threads are busy.
 *
 * `useCatalog` (a catalog reload) starts a new set of threads with the new catalog while the old
 * ones answer; once one of the new threads answers, calls go to the new threads (and `commit` is
 * called, in the same turn), and the old ones finish the calls they were given, on the old
 * catalog, and stop.
 */
export function deferredComputePool(
  opts: Parameters<typeof createComputePool>[0],
): (ComputePool & { start(): void; useCatalog(catalog: CatalogData, commit: () => void): Promise<void> }) | undefined {
  if (workerFile() === undefined || opts.threads < 1) return undefined;
  let current = opts;
  let inner: RetirablePool | undefined;
  let closed = false;
  const retiring = new Set<Promise<void>>();
  const make = () => {
    const p = createComputePool(current);
    if (p === undefined) throw new Error("compute pool: the worker file is missing");
    return p;
  };
  const get = (): ComputePool => {
    inner ??= make();
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
    useCatalog: async (catalog, commit) => {
      current = { ...current, catalog };
      if (inner === undefined || closed) {
        commit(); // not started: its threads will start with this catalog
        return;
      }
      const next = make();
      try {
        await next.ready();
      } catch (e) {
        await next.close();
        throw e;
      }
      if (closed) {
        await next.close();
        return;
      }
      const old = inner;
      inner = next;
      commit();
      const done = old.closeWhenIdle().finally(() => retiring.delete(done));
      retiring.add(done);
    },
    close: async () => {
      closed = true;
      await Promise.all([inner?.close(), ...retiring]);
    },
  };
}
