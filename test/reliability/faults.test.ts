import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { connect } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { startBuiltServer } from "../helpers/built-server.js";
import { builtCli } from "../helpers/build-once.js";

/**
 * Faults against the built code (dist/ built on first use, test/helpers/build-once.ts): a worker thread that
 * throws or dies mid-batch, kill -9 of a batch and its rerun, and slow clients against the server.
 * SIGTERM under load is test/adapters/server-process.test.ts.
 */
const bin = builtCli();
const dir = mkdtempSync(join(tmpdir(), "backstop-faults-"));
const MARKER = "__backstop_test_worker_fault__"; // adapters/compute/worker.ts, test hook
const good = (a: number) => ({
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: a },
  ambientC: 25,
});
const lines = (n: number, id: (i: number) => string) =>
  `${Array.from({ length: n }, (_, i) => JSON.stringify({ id: id(i), procedure: "operatingPoint", input: good((i % 40) / 10) })).join("\n")}\n`;
const batch = (args: string[], env: Record<string, string> = {}) =>
  spawnSync("node", [bin, "batch", ...args], { encoding: "utf8", env: { ...process.env, ...env } });

describe("batch: a worker thread that throws or dies", () => {
  const input = join(dir, "faulty.jsonl");
  writeFileSync(
    input,
    lines(400, (i) => (i === 137 || i === 311 ? `${MARKER}-${i}` : `r${i}`)),
  );
  const clean = batch(["--in", input, "--out", join(dir, "clean.jsonl"), "--workers", "2"]);

  it.each(["throw", "crash"])(
    "%s: those rows are reported, every other row is answered as without the fault",
    (mode) => {
      const out = join(dir, `fault-${mode}.jsonl`);
      const r = batch(["--in", input, "--out", out, "--workers", "2"], { BACKSTOP_TEST_WORKER_FAULT: mode });
      expect(clean.status).toBe(0);
      expect(r.status, r.stderr).toBe(1); // some rows rejected
      const got = readFileSync(out, "utf8").trim().split("\n");
      const want = readFileSync(join(dir, "clean.jsonl"), "utf8").trim().split("\n");
      expect(got).toHaveLength(400);
      const failed = got
        .map(
          (l) => JSON.parse(l) as { id: string; line: number; ok: boolean; error?: { code: string; message: string } },
        )
        .filter((o) => !o.ok);
      expect(failed.map((f) => [f.id, f.line, f.error?.code])).toEqual([
        [`${MARKER}-137`, 138, "internal"],
        [`${MARKER}-311`, 312, "internal"],
      ]);
      expect(failed[0]?.error?.message).toMatch(/worker thread failed/);
      for (let i = 0; i < 400; i += 1) if (i !== 137 && i !== 311) expect(got[i]).toBe(want[i]);
    },
    60_000,
  );
});

describe("batch: kill -9", () => {
  it("leaves nothing under the final name; the rerun is byte-identical to an undisturbed run", async () => {
    const input = join(dir, "big.jsonl");
    writeFileSync(
      input,
      lines(30_000, (i) => `k${i}`),
    );
    const out = join(dir, "killed.jsonl");
    const child = spawn("node", [bin, "batch", "--in", input, "--out", out, "--workers", "1"], {
      env: { ...process.env, BACKSTOP_PROGRESS_MS: "1" },
      stdio: ["ignore", "ignore", "pipe"],
    });
    await new Promise<void>((resolve) =>
      child.stderr.on("data", (d: Buffer) => (/[1-9]\d* rows/.test(String(d)) ? resolve() : undefined)),
    );
    child.kill("SIGKILL");
    expect(await new Promise((r) => child.on("exit", (_c, s) => r(s)))).toBe("SIGKILL");
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir).some((f) => f.startsWith("killed.jsonl.partial-"))).toBe(true); // what kill -9 leaves: only the temp file
    const rerun = batch(["--in", input, "--out", out, "--workers", "1"]);
    expect(rerun.status).toBe(0);
    // the dead run's partial is removed by the next run to the same output, and said so
    expect(readdirSync(dir).filter((f) => f.startsWith("killed.jsonl.partial-"))).toEqual([]);
    expect(String(rerun.stderr)).toMatch(/removed killed\.jsonl\.partial-\d+, left by a run that no longer exists/);
    expect(batch(["--in", input, "--out", join(dir, "reference.jsonl"), "--workers", "2"]).status).toBe(0);
    expect(readFileSync(out).equals(readFileSync(join(dir, "reference.jsonl")))).toBe(true);
  }, 120_000);
});

describe("server: slow clients are cut off by the header and request deadlines", () => {
  let child: ChildProcess | undefined;
  afterAll(() => {
    if (child?.exitCode === null) child.kill("SIGKILL");
  });

  it("a stalled header or body is answered 408 and closed; other clients are served meanwhile", async () => {
    const server = await startBuiltServer({
      LOG_LEVEL: "warn",
      BACKSTOP_WORKERS: "0",
      BACKSTOP_HEADERS_TIMEOUT_MS: "400",
      BACKSTOP_RECEIVE_TIMEOUT_MS: "800",
    });
    const c = server.child;
    child = c;
    const port = server.port;
    /** open a connection, send `sent`, then nothing; resolves with what came back and when the server closed it */
    const stall = (sent: string) =>
      new Promise<{ reply: string; closedAfterMs: number }>((resolve, reject) => {
        const t0 = performance.now();
        let reply = "";
        const s = connect(port, "127.0.0.1", () => s.write(sent));
        s.on("data", (d) => {
          reply += String(d);
        });
        s.on("error", reject);
        s.on("close", () => resolve({ reply, closedAfterMs: performance.now() - t0 }));
        setTimeout(() => {
          s.destroy();
          reject(new Error("the server kept a stalled connection open for 10 s"));
        }, 10_000).unref();
      });
    const header = stall("POST /v1/operatingPoint HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: appl");
    const body = stall(
      `POST /v1/operatingPoint HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: 1000\r\n\r\n{"stage":`,
    );
    const served = await fetch(`http://127.0.0.1:${port}/v1/operatingPoint`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(good(2)),
    });
    expect(served.status).toBe(200);
    for (const r of [await header, await body]) {
      expect(r.reply).toMatch(/^HTTP\/1\.1 408/);
      expect(r.closedAfterMs).toBeLessThan(5_000);
    }
    expect((await fetch(`http://127.0.0.1:${port}/readyz`)).status).toBe(200);
    c.kill("SIGTERM");
    expect(await new Promise((r) => c.on("exit", (code) => r(code)))).toBe(0);
  }, 60_000);
});
