/**
 * Where the verdict record's time goes (issue 21), in process, on the example operating point
 * (examples/requests/operatingPoint.json): canonical JSON of the sent input, the understood input
 * and the result, SHA-256 of each (node:crypto), and the whole call with and without its record
 * (the call's answer through the one call definition, against the handler's own answer time being
 * the same call minus the seal). A script, not a test: `npm run bench:record` prints µs a step as
 * the median of ROUNDS rounds of N calls each, with the lowest and highest round.
 */
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { loadavg } from "node:os";
import { join } from "node:path";
import { loadCatalogFile } from "../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG, projectRoot } from "../adapters/project-root.js";
import { callProcedure } from "../api/procedure-registry.js";
import { recordCall, sha256Of, withoutRecord } from "../api/record/verdict-record.js";
import { operatingPointInput } from "../contracts/operating-point.js";
import { canonicalJson } from "../domain/rules/rule-set-hash.js";

const N = Number(process.env.BENCH_RECORD_N ?? 5000);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 7);

const example = JSON.parse(
  readFileSync(join(projectRoot(), "examples", "requests", "operatingPoint.json"), "utf8"),
) as { input: unknown };
const sent = example.input;
const ctx = { catalog: loadCatalogFile(DEMO_CATALOG()) };
const understood = operatingPointInput.parse(sent);
const answer = callProcedure("operatingPoint", ctx, sent) as Record<string, unknown>;
const result = withoutRecord(answer);
const part = ctx.catalog.find("demo-ideal-diode-60v-3mohm");

/** µs a call of f: median, lowest and highest of ROUNDS rounds of N calls */
function time(f: () => unknown): { median: number; low: number; high: number } {
  let sink = 0;
  for (let i = 0; i < N; i += 1) sink += f() === undefined ? 0 : 1; // warm-up
  const us: number[] = [];
  for (let r = 0; r < ROUNDS; r += 1) {
    const t0 = performance.now();
    for (let i = 0; i < N; i += 1) sink += f() === undefined ? 0 : 1;
    us.push(((performance.now() - t0) * 1000) / N);
  }
  if (sink < 0) throw new Error("unreachable");
  us.sort((a, b) => a - b);
  return {
    median: us[Math.floor(us.length / 2)] ?? Number.NaN,
    low: us[0] ?? Number.NaN,
    high: us.at(-1) ?? Number.NaN,
  };
}

const hashText = (s: string) => createHash("sha256").update(s).digest("hex");
const texts = { sent: canonicalJson(sent), understood: canonicalJson(understood), result: canonicalJson(result) };
const steps: [string, () => unknown][] = [
  ["JSON.stringify(result) (for scale)", () => JSON.stringify(result)],
  ["canonicalJson(sent input)", () => canonicalJson(sent)],
  ["canonicalJson(understood input)", () => canonicalJson(understood)],
  ["canonicalJson(result)", () => canonicalJson(result)],
  ["canonicalJson(catalog part)", () => canonicalJson(part)],
  ["sha256 of the sent input's text", () => hashText(texts.sent)],
  ["sha256 of the result's text", () => hashText(texts.result)],
  ["sha256Of(sent input)", () => sha256Of(sent)],
  [
    "sha256Of(understood input + part digest)",
    () => sha256Of({ input: understood, parts: [{ id: "p", sha256: "x" }] }),
  ],
  ["sha256Of(result)", () => sha256Of(result)],
  [
    "the seal: the whole record added to a result",
    () => recordCall(ctx).seal("operatingPoint", sent, understood, result, []),
  ],
  ["operatingPoint call with its record (callProcedure)", () => callProcedure("operatingPoint", ctx, sent)],
];

const load0 = loadavg().map((x) => x.toFixed(2));
process.stdout.write(
  `record cost, ${N} calls x ${ROUNDS} rounds, node ${process.version}, load ${load0.join(" ")}\n` +
    `bytes: sent ${texts.sent.length}, understood ${texts.understood.length}, result ${texts.result.length}\n`,
);
for (const [name, f] of steps) {
  const t = time(f);
  process.stdout.write(
    `${name.padEnd(52)} ${t.median.toFixed(2).padStart(7)} µs  (${t.low.toFixed(2)}-${t.high.toFixed(2)})\n`,
  );
}
process.stdout.write(
  `load at end ${loadavg()
    .map((x) => x.toFixed(2))
    .join(" ")}\n`,
);
