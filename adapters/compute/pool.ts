import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Piscina } from "piscina";
import type { BatchOutputLine } from "../batch/run-batch.js";
import type { ItemResult } from "./call.js";

/** The compiled worker (dist/adapters/compute/worker.js); absent when running from TypeScript sources. */
export function workerFile(): string | undefined {
  const url = new URL("./worker.js", import.meta.url);
  const file = fileURLToPath(url);
  return file.endsWith(".js") && existsSync(file) && import.meta.url.endsWith(".js") ? file : undefined;
}

export interface ComputePool {
  readonly threads: number;
  call(path: string, inputs: unknown[], signal?: AbortSignal): Promise<ItemResult[]>;
  lines(records: { raw: string; lineNo: number }[], signal?: AbortSignal): Promise<BatchOutputLine[]>;
  close(): Promise<void>;
}

/** A pool of worker threads running the router; aborting a task terminates its thread (a hard stop). */
export function createComputePool(opts: { threads: number; catalogPath: string; rulesDir?: string | undefined }): ComputePool | undefined {
  const filename = workerFile();
  if (filename === undefined || opts.threads < 1) return undefined;
  const pool = new Piscina({ filename, minThreads: opts.threads, maxThreads: opts.threads, idleTimeout: 60_000, workerData: { catalogPath: opts.catalogPath, rulesDir: opts.rulesDir } });
  const options = (name: string, signal?: AbortSignal) => (signal === undefined ? { name } : { name, signal });
  return {
    threads: opts.threads,
    call: (path, inputs, signal) => pool.run({ path, inputs }, options("call", signal)) as Promise<ItemResult[]>,
    lines: (records, signal) => pool.run({ records }, options("lines", signal)) as Promise<BatchOutputLine[]>,
    close: () => pool.destroy(),
  };
}
