import { type ChildProcess, execFileSync, spawn } from "node:child_process";
import { request } from "node:http";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { startBuiltServer } from "../helpers/built-server.js";

// The built server with two HTTP processes (adapters/http/cluster-primary.ts): connections spread
// over both, /metrics counts the whole server, a process that dies is replaced, SIGTERM drains all.
const good = JSON.stringify({ stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" }, supplyV: 12, load: { kind: "constant-current", currentA: 2 }, ambientC: 25 });
const exited = (c: ChildProcess) => new Promise<number | null>((r) => (c.exitCode !== null ? r(c.exitCode) : c.on("exit", (code) => r(code))));

/** One POST on a connection of its own (so the primary hands each to a process in turn). */
function post(base: string, path: string, body: string): Promise<number> {
  const u = new URL(path, base);
  return new Promise((resolve, reject) => {
    const req = request({ host: u.hostname, port: u.port, path: u.pathname, method: "POST", agent: false, timeout: 5000, headers: { "content-type": "application/json", "content-length": Buffer.byteLength(body) } }, (res) => {
      res.resume();
      res.on("end", () => resolve(res.statusCode ?? 0));
    });
    req.on("error", reject);
    req.on("timeout", () => req.destroy(new Error("no answer within 5 s")));
    req.end(body);
  });
}

const childPids = (pid: number) =>
  execFileSync("ps", ["-o", "pid=", "--ppid", String(pid)], { encoding: "utf8" })
    .split("\n")
    .map((l) => Number(l.trim()))
    .filter((n) => n > 0);

describe("a server of two HTTP processes", () => {
  const children: ChildProcess[] = [];
  afterAll(() => {
    for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
  });

  it("serves from both, counts the whole server in /metrics, replaces a process that dies, and drains on SIGTERM", async () => {
    const s = await startBuiltServer({ BACKSTOP_HTTP_PROCESSES: "2", BACKSTOP_WORKERS: "1" });
    children.push(s.child);
    expect(s.logs.join("")).toMatch(/\(2 HTTP processes\)/);
    // the second starts once the first listens
    for (let t = 0; t < 100 && !/"process":1,[^\n]*"msg":"backstop listening"/.test(s.logs.join("")); t += 1) await new Promise((r) => setTimeout(r, 50));
    const n = 40;
    const statuses = await Promise.all(Array.from({ length: n }, () => post(s.base, "/v1/operatingPoint", good)));
    expect(statuses).toEqual(statuses.map(() => 200));
    const metrics = await (await fetch(`${s.base}/metrics`)).text();
    expect(metrics).toMatch(new RegExp(`backstop_http_requests_total\\{route="v1",status="200"\\} ${n}\\b`));
    expect(metrics).toMatch(new RegExp(`backstop_procedure_duration_seconds_count\\{procedure="operatingPoint",outcome="solved",adapter="v1"\\} ${n}\\b`));
    await new Promise((r) => setTimeout(r, 150)); // log lines are written within 50 ms
    const served = new Set(
      s.logs
        .join("")
        .split("\n")
        .filter((l) => l.includes('"msg":"request"') && l.includes("/v1/operatingPoint"))
        .map((l) => (JSON.parse(l) as { process?: number }).process),
    );
    expect([...served].sort()).toEqual([0, 1]);

    // kill -9 of one HTTP process: the primary starts another, and the server answers on
    const pid = s.child.pid as number;
    const before = childPids(pid);
    expect(before.length).toBe(2);
    process.kill(before[0] as number, "SIGKILL");
    let after: number[] = [];
    for (let t = 0; t < 50 && after.length < 2; t += 1) {
      await new Promise((r) => setTimeout(r, 100));
      after = childPids(pid).filter((p) => p !== before[0]);
    }
    expect(after.length).toBe(2);
    expect(s.logs.join("")).toMatch(/an HTTP process died; starting another/);
    await new Promise((r) => setTimeout(r, 1500)); // the new process is listening
    const again = await Promise.all(Array.from({ length: 10 }, () => post(s.base, "/v1/operatingPoint", good)));
    expect(again).toEqual(again.map(() => 200));

    s.child.kill("SIGTERM");
    expect(await exited(s.child)).toBe(0);
    expect(s.logs.join("")).toMatch(/every HTTP process has exited/);
    for (const p of after) expect(() => process.kill(p, 0)).toThrow();
  }, 30_000);

  it("stops with exit 2 when its processes cannot start (a bad setting)", async () => {
    const child = spawn("node", [join(projectRoot(), "dist", "bundle", "main.js")], {
      env: { ...process.env, PORT: "0", HOST: "127.0.0.1", BACKSTOP_HTTP_PROCESSES: "2", BACKSTOP_MAX_BODY_BYTES: "lots" },
      stdio: ["ignore", "pipe", "pipe"],
    });
    children.push(child);
    let err = "";
    child.stderr?.on("data", (d: Buffer) => {
      err += String(d);
    });
    child.stdout?.resume();
    expect(await exited(child)).toBe(2);
    expect(err).toMatch(/BACKSTOP_MAX_BODY_BYTES must be a positive integer/);
  }, 20_000);

  it("refuses a process count that is not a whole number from 1 to 64", async () => {
    const child = spawn("node", [join(projectRoot(), "dist", "bundle", "main.js")], { env: { ...process.env, PORT: "0", BACKSTOP_HTTP_PROCESSES: "two" }, stdio: ["ignore", "ignore", "pipe"] });
    children.push(child);
    let err = "";
    child.stderr?.on("data", (d: Buffer) => {
      err += String(d);
    });
    expect(await exited(child)).toBe(2);
    expect(err).toMatch(/BACKSTOP_HTTP_PROCESSES must be "auto" or a whole number from 1 to 64, got "two"/);
  });
});
