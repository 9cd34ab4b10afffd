/**
 * Where the bytes of a review's answer go (the soak's memory): the example review
 * (examples/requests/review.json) answered in process through the one call definition, its JSON
 * text's length by path, largest first: the top level, each candidate's fields summed over the
 * candidates, and the start-up profiles' parts. A script, not a test: `npm run bench:review-size`,
 * optionally with a request file as its argument.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { loadCatalogFile } from "../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG, projectRoot } from "../adapters/project-root.js";
import { callProcedure } from "../api/procedure-registry.js";

const file = process.argv[2] ?? join(projectRoot(), "examples", "requests", "review.json");
const request = JSON.parse(readFileSync(file, "utf8")) as { input: unknown };
const answer = callProcedure("review", { catalog: loadCatalogFile(DEMO_CATALOG()) }, request.input) as Record<
  string,
  unknown
>;
const size = (v: unknown): number => Buffer.byteLength(JSON.stringify(v) ?? "");
const total = size(answer);
const rows: [string, number][] = [];
const add = (path: string, v: unknown) => rows.push([path, size(v)]);

for (const [k, v] of Object.entries(answer)) add(k, v);
const candidates = (answer.candidates ?? []) as Record<string, unknown>[];
const summed = new Map<string, number>();
const sum = (path: string, v: unknown) => summed.set(path, (summed.get(path) ?? 0) + size(v));
for (const c of candidates) {
  for (const [k, v] of Object.entries(c)) sum(`candidates[*].${k}`, v);
  const startUp = c.startUp as Record<string, unknown> | undefined;
  for (const [k, v] of Object.entries(startUp ?? {})) sum(`candidates[*].startUp.${k}`, v);
  const profiles = (startUp?.profiles ?? []) as { result: Record<string, unknown> }[];
  for (const p of profiles) sum("candidates[*].startUp.profiles[*].result.samples", p.result.samples);
  const turnOff = c.turnOff as { event?: Record<string, unknown> } | undefined;
  for (const [k, v] of Object.entries(turnOff?.event ?? {})) sum(`candidates[*].turnOff.event.${k}`, v);
}
rows.push(...summed);
rows.sort((a, b) => b[1] - a[1]);
const kB = (n: number) => (n / 1000).toFixed(1).padStart(8);
console.log(`review answer: ${kB(total)} kB of JSON, ${candidates.length} candidates (${file})`);
for (const [path, n] of rows.filter(([, n]) => n >= total * 0.005))
  console.log(`${kB(n)} kB ${((n / total) * 100).toFixed(1).padStart(5)} %  ${path}`);
