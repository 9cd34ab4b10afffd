import { type ChildProcess, spawnSync } from "node:child_process";
import { generateKeyPairSync } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { recordSignerOf } from "../../adapters/record/signing-key.js";
import { builtCli } from "../helpers/build-once.js";
import { startBuiltServer } from "../helpers/built-server.js";
import example from "../../examples/requests/operatingPoint.json" with { type: "json" };
import review from "../../examples/requests/review.json" with { type: "json" };

const children: ChildProcess[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
});

describe("the built server signs in its main thread and its compute threads with the one key", () => {
  const pem = generateKeyPairSync("ed25519").privateKey.export({ type: "pkcs8", format: "pem" }).toString();
  const signer = recordSignerOf(pem);

  it("an inline /v1 call, a bulk item (compute thread) and /trpc carry the same signed record; verify says valid", async () => {
    const s = await startBuiltServer({ BACKSTOP_RECORD_KEY: pem, BACKSTOP_WORKERS: "1", BACKSTOP_BUILD_ID: "test-1" });
    children.push(s.child);
    const post = async (path: string, body: unknown) => {
      const res = await fetch(`${s.base}${path}`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(body),
      });
      expect(res.status, path).toBe(200);
      return res.text();
    };
    const key = (await (await fetch(`${s.base}/v1/record-key`)).json()) as { keyId: string };
    expect(key.keyId).toBe(signer.keyId);
    const inline = await post("/v1/operatingPoint", example.input); // the main thread (a cheap, small call)
    const bulk = JSON.parse(await post("/v1/operatingPoint/bulk", [example.input])) as {
      results: { result: unknown }[];
    };
    const trpc = JSON.parse(await post("/trpc/operatingPoint", example.input)) as { result: { data: unknown } };
    expect(JSON.stringify(bulk.results[0]?.result)).toBe(inline);
    expect(JSON.stringify(trpc.result.data)).toBe(inline);
    const result = JSON.parse(inline) as { record: { buildVersion: string; signature: { keyId: string } } };
    expect(result.record.signature.keyId).toBe(signer.keyId);
    expect(result.record.buildVersion).toMatch(/\+test-1$/);
    // a review runs in a compute thread; its record is checked by the service's verify (in a thread too)
    const reviewed = JSON.parse(await post("/v1/review", review.input)) as { record: { signature?: unknown } };
    expect(reviewed.record.signature).toBeDefined();
    const report = JSON.parse(
      await post("/v1/verify", {
        records: [
          { procedure: "operatingPoint", input: example.input, result },
          { procedure: "review", input: review.input, result: reviewed },
        ],
      }),
    ) as { reports: { status: string; signature: string }[] };
    expect(report.reports.map((r) => [r.status, r.signature])).toEqual([
      ["unchanged", "valid"],
      ["unchanged", "valid"],
    ]);
    s.child.kill("SIGTERM");
  });
});

describe("the shipped command line: batch in its compute threads, then verify", () => {
  it("signs every line in the threads with the one key; the filed lines verify valid and unchanged", () => {
    const pem = generateKeyPairSync("ed25519").privateKey.export({ type: "pkcs8", format: "pem" }).toString();
    const dir = mkdtempSync(join(tmpdir(), "backstop-record-cli-"));
    try {
      const requests = Array.from({ length: 40 }, (_, k) => ({
        id: `case-${k}`,
        procedure: "operatingPoint",
        input: { ...example.input, ambientC: 20 + k },
      }));
      const inFile = join(dir, "requests.jsonl");
      writeFileSync(inFile, `${requests.map((r) => JSON.stringify(r)).join("\n")}\n`);
      const env = { ...process.env, BACKSTOP_RECORD_KEY: pem };
      const outFile = join(dir, "results.jsonl");
      const batch = spawnSync("node", [builtCli(), "batch", "--in", inFile, "--out", outFile, "--workers", "1"], {
        env: { ...env, BACKSTOP_TEST_WORKER_FAULT: "none" }, // every chunk to the thread (poolOnly)
        encoding: "utf8",
      });
      expect(batch.status, batch.stderr).toBe(0);
      const results = readFileSync(outFile, "utf8")
        .trim()
        .split("\n")
        .map((l) => JSON.parse(l) as { result: unknown });
      const filed = requests.map((r, k) => JSON.stringify({ ...r, result: results[k]?.result }));
      const recordsFile = join(dir, "records.jsonl");
      writeFileSync(recordsFile, `${filed.join("\n")}\n`);
      const reportFile = join(dir, "report.jsonl");
      const verify = spawnSync("node", [builtCli(), "verify", "--in", recordsFile, "--out", reportFile], {
        env,
        encoding: "utf8",
      });
      expect(verify.status, verify.stderr).toBe(0);
      const report = readFileSync(reportFile, "utf8")
        .trim()
        .split("\n")
        .map((l) => JSON.parse(l) as Record<string, unknown>);
      expect(report.length).toBe(40);
      expect(report.every((r) => r.status === "unchanged" && r.signature === "valid")).toBe(true);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
