import { workerData } from "node:worker_threads";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { processLine } from "../batch/run-batch.js";
import { loadCatalogFile } from "../catalog/file-catalog.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import { type ItemResult, callOne } from "./call.js";

/**
 * A worker thread of the compute pool (piscina): the same router, in this thread, with its own
 * catalog. A task that runs past its deadline is stopped by terminating the thread.
 */
const { catalogPath, rulesDir } = workerData as { catalogPath: string; rulesDir?: string | undefined };
const invoker = procedureInvoker({ catalog: loadCatalogFile(catalogPath), ruleSets: loadRuleSetStore(rulesDir) });

/** HTTP /v1: the items of one request (or a slice of a bulk request), in order. */
export async function call({ path, inputs }: { path: string; inputs: unknown[] }): Promise<ItemResult[]> {
  const invoke = invoker(path);
  if (invoke === undefined) throw new Error(`no procedure ${path}`);
  const out: ItemResult[] = [];
  for (const input of inputs) out.push(await callOne(invoke, input));
  return out;
}

/** Batch: raw JSON lines with their line numbers → one output record each, in order. */
export async function lines({ records }: { records: { raw: string; lineNo: number }[] }) {
  const out = [];
  for (const r of records) out.push(await processLine(r.raw, r.lineNo, invoker));
  return out;
}
