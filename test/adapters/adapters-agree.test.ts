import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { PassThrough, Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { type BatchOutputLine, runBatch } from "../../adapters/batch/run-batch.js";
import type { Problem } from "../../contracts/problem.js";
import { type Answer, errorAnswer, sharedCases } from "../helpers/cases.js";
import { demoContext, testApp } from "../helpers/app.js";
import { builtCli } from "../helpers/build-once.js";

// One case suite, run through every adapter: the numbers must be identical (same router, in process
// or in worker threads). Source of truth: the router itself, so this is a consistency check.
const cases = sharedCases();
const { app } = testApp();
const post = (url: string, body: unknown) =>
  app.request(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
const fromProblem = (p: Problem): Answer => errorAnswer({ code: p.code, issues: p.issues });
const fromBatch = (o: BatchOutputLine): Answer => (o.ok ? { ok: true, result: o.result } : errorAnswer(o.error));

async function viaTrpc(): Promise<Answer[]> {
  const out: Answer[] = [];
  for (const c of cases) {
    const b = (await (await post(`/trpc/${c.procedure}`, c.input)).json()) as {
      result?: { data: unknown };
      error?: { data: { backstop: Problem } };
    };
    out.push(
      b.result
        ? { ok: true, result: b.result.data }
        : fromProblem((b.error as { data: { backstop: Problem } }).data.backstop),
    );
  }
  return out;
}
async function viaV1(): Promise<Answer[]> {
  const out: Answer[] = [];
  for (const c of cases) {
    const res = await post(`/v1/${c.procedure}`, c.input);
    const b = (await res.json()) as unknown;
    out.push(res.ok ? { ok: true, result: b } : fromProblem(b as Problem));
  }
  return out;
}
async function viaBulk(): Promise<Answer[]> {
  const out: Answer[] = [];
  for (const procedure of [...new Set(cases.map((c) => c.procedure))]) {
    const mine = cases.filter((c) => c.procedure === procedure);
    const b = (await (
      await post(
        `/v1/${procedure}/bulk`,
        mine.map((c) => c.input),
      )
    ).json()) as { results: ({ ok: true; result: unknown } | { ok: false; problem: Problem })[] };
    b.results.forEach((r, i) => {
      out[cases.indexOf(mine[i] as (typeof cases)[number])] = r.ok
        ? { ok: true, result: r.result }
        : fromProblem(r.problem);
    });
  }
  return out;
}
async function viaBatch(): Promise<Answer[]> {
  const sink = new PassThrough();
  const chunks: string[] = [];
  sink.on("data", (c) => chunks.push(String(c)));
  await runBatch(Readable.from([cases.map((c) => JSON.stringify(c)).join("\n")]), sink, demoContext());
  return chunks
    .join("")
    .trim()
    .split("\n")
    .map((l) => fromBatch(JSON.parse(l) as BatchOutputLine));
}
function viaBatchCliWorkers(): Answer[] {
  const dir = mkdtempSync(join(tmpdir(), "backstop-agree-"));
  writeFileSync(join(dir, "in.jsonl"), `${cases.map((c) => JSON.stringify(c)).join("\n")}\n`);
  spawnSync(
    "node",
    [builtCli(), "batch", "--in", join(dir, "in.jsonl"), "--out", join(dir, "out.jsonl"), "--workers", "2"],
    { encoding: "utf8" },
  );
  return readFileSync(join(dir, "out.jsonl"), "utf8")
    .trim()
    .split("\n")
    .map((l) => fromBatch(JSON.parse(l) as BatchOutputLine));
}

describe("one case suite through /trpc, /v1, bulk /v1, batch and batch with worker threads", () => {
  it("gives identical answers everywhere", async () => {
    const reference = await viaTrpc();
    expect(reference.filter((a) => a.ok).length).toBeGreaterThanOrEqual(3);
    expect(reference.filter((a) => !a.ok).length).toBeGreaterThanOrEqual(3);
    expect(await viaV1()).toEqual(reference);
    expect(await viaBulk()).toEqual(reference);
    expect(await viaBatch()).toEqual(reference);
    expect(viaBatchCliWorkers()).toEqual(reference);
    // byte-for-byte: the /v1 body is the JSON of tRPC's result data
    const c = cases[0] as (typeof cases)[number];
    const t = (await (await post(`/trpc/${c.procedure}`, c.input)).json()) as { result: { data: unknown } };
    expect(await (await post(`/v1/${c.procedure}`, c.input)).text()).toBe(JSON.stringify(t.result.data));
  });
});
