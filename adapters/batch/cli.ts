import { createReadStream, createWriteStream, renameSync, rmSync } from "node:fs";
import { finished } from "node:stream/promises";
import { parseArgs } from "node:util";
import { loadCatalogFile } from "../catalog/file-catalog.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import { DEMO_CATALOG } from "../project-root.js";
import { runBatch } from "./run-batch.js";

const USAGE = "usage: backstop batch --in requests.jsonl --out results.jsonl [--catalog parts.json]";

/** `backstop batch`: exit 0 all rows ok, 1 some rows failed, 2 could not run. */
export async function main(argv: string[]): Promise<number> {
  const [verb, ...rest] = argv;
  if (verb !== "batch") {
    process.stderr.write(`${USAGE}\n`);
    return 2;
  }
  let values: { in?: string; out?: string; catalog?: string };
  try {
    values = parseArgs({ args: rest, options: { in: { type: "string" }, out: { type: "string" }, catalog: { type: "string" } } }).values;
  } catch (e) {
    process.stderr.write(`${(e as Error).message}\n${USAGE}\n`);
    return 2;
  }
  if (values.in === undefined || values.out === undefined) {
    process.stderr.write(`${USAGE}\n`);
    return 2;
  }
  const outPath = values.out;
  const partial = `${outPath}.partial-${process.pid}`;
  try {
    const catalog = loadCatalogFile(values.catalog ?? process.env.BACKSTOP_CATALOG ?? DEMO_CATALOG());
    const input = createReadStream(values.in);
    const output = createWriteStream(partial);
    const ruleSets = loadRuleSetStore(process.env.BACKSTOP_RULES_DIR);
    for (const r of ruleSets.refused()) process.stderr.write(`backstop batch: rule set file ${r.file} refused: ${r.problems.map((p) => p.message).join("; ")}\n`);
    const counts = await runBatch(input, output, { catalog, ruleSets });
    output.end();
    await finished(output);
    renameSync(partial, outPath);
    process.stderr.write(`backstop batch: ${counts.lines} lines, ${counts.ok} ok, ${counts.failed} failed -> ${outPath}\n`);
    return counts.failed > 0 ? 1 : 0;
  } catch (e) {
    rmSync(partial, { force: true });
    process.stderr.write(`backstop batch could not run: ${(e as Error).message}\n`);
    return 2;
  }
}
