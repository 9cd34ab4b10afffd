import { type ChildProcess, spawn } from "node:child_process";
import { once } from "node:events";
import { Agent, request } from "node:http";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { startBuiltServer, untilLogged } from "../helpers/built-server.js";

// The built server as a process on a loopback port (dist/ is built on first use, test/helpers/build-once.ts):
// one HTTP process, as a container runs it (deploy/deployment.yaml).
const good = {
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: 2 },
  ambientC: 25,
};

const post = (url: string, body: unknown) =>
  fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
const exited = (c: ChildProcess) =>
  new Promise<number | null>((r) => (c.exitCode !== null ? r(c.exitCode) : c.on("exit", (code) => r(code))));
/** Resolves once the server's output holds `text` (a log line it writes when the event happens). */
const logged = (s: { child: ChildProcess; logs: string[] }, text: string) =>
  new Promise<void>((resolve) => {
    if (s.logs.join("").includes(text)) return resolve();
    const look = () => {
      if (!s.logs.join("").includes(text)) return;
      s.child.stdout?.off("data", look);
      resolve();
    };
    s.child.stdout?.on("data", look);
  });

/** One request on a keep-alive agent: its status and whether the answer said Connection: close. */
const once_ = (base: string, path: string, body: string, agent: Agent) =>
  new Promise<{ status: number; close: boolean }>((resolve, reject) => {
    const req = request(
      `${base}${path}`,
      {
        method: "POST",
        agent,
        headers: { "content-type": "application/json", "content-length": Buffer.byteLength(body) },
      },
      (res) => {
        res.resume();
        res.on("end", () => resolve({ status: res.statusCode ?? 0, close: res.headers.connection === "close" }));
      },
    );
    req.on("error", reject);
    req.end(body);
  });

describe("the server process", () => {
  const children: ChildProcess[] = [];
  const start = async (env: Record<string, string>) => {
    const s = await startBuiltServer(env);
    children.push(s.child);
    return s;
  };
  afterAll(() => {
    for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
  });

  it("warns when auth is off; /v1 and bulk /v1 (worker threads) equal /trpc; quick latency figures", async () => {
    const s = await start({ BACKSTOP_WORKERS: "1" });
    expect(s.logs.join("")).toMatch(/API-key auth is OFF/);
    const v1 = await (await post(`${s.base}/v1/operatingPoint`, good)).text();
    const trpc = (await (await post(`${s.base}/trpc/operatingPoint`, good)).json()) as { result: { data: unknown } };
    expect(v1).toBe(JSON.stringify(trpc.result.data));
    // a single operating point runs in the main thread; bulk goes to the worker threads: same bytes
    const bulk = await (await post(`${s.base}/v1/operatingPoint/bulk`, [good, { ...good, supplyV: "x" }, good])).text();
    const bad = (await (await post(`${s.base}/v1/operatingPoint`, { ...good, supplyV: "x" })).json()) as Record<
      string,
      unknown
    >;
    const { instance: _i, requestId: _r, ...badInBulk } = bad;
    expect(bulk).toBe(
      JSON.stringify({
        results: [
          { ok: true, result: trpc.result.data },
          { ok: false, problem: badInBulk },
          { ok: true, result: trpc.result.data },
        ],
        ok: 2,
        failed: 1,
      }),
    );
    const time = async (url: string, n: number) => {
      const t0 = performance.now();
      for (let i = 0; i < n; i += 1) await (await post(url, good)).arrayBuffer();
      return (performance.now() - t0) / n;
    };
    const trpcMs = await time(`${s.base}/trpc/operatingPoint`, 30);
    const v1Ms = await time(`${s.base}/v1/operatingPoint`, 30);
    const t0 = performance.now();
    await (
      await post(
        `${s.base}/v1/operatingPoint/bulk`,
        Array.from({ length: 1000 }, () => good),
      )
    ).arrayBuffer();
    console.log(
      `latency (mean of 30, loopback): /trpc ${trpcMs.toFixed(2)} ms, /v1 ${v1Ms.toFixed(2)} ms; bulk 1000 cases ${(performance.now() - t0).toFixed(0)} ms`,
    );
    s.child.kill("SIGTERM");
    expect(await exited(s.child)).toBe(0);
  });

  it("SIGTERM under load: /readyz flips first, every accepted request completes, exit 0", async () => {
    const s = await start({ BACKSTOP_WORKERS: "1", BACKSTOP_DRAIN_DELAY_MS: "1000" });
    expect((await fetch(`${s.base}/readyz`)).status).toBe(200);
    // each bulk request on a connection of its own, written out in full before the signal
    const agent = new Agent({ keepAlive: false });
    const sent: Promise<void>[] = [];
    const inFlight = Array.from({ length: 24 }, (_, i) => {
      const body = JSON.stringify(Array.from({ length: 40 + i }, () => good));
      return new Promise<{ status: number; n: number }>((resolve, reject) => {
        const req = request(
          `${s.base}/v1/operatingPoint/bulk`,
          {
            method: "POST",
            agent,
            headers: { "content-type": "application/json", "content-length": Buffer.byteLength(body) },
          },
          (res) => {
            let text = "";
            res.on("data", (d: Buffer) => {
              text += String(d);
            });
            res.on("end", () =>
              resolve({ status: res.statusCode ?? 0, n: (JSON.parse(text) as { results: unknown[] }).results.length }),
            );
          },
        );
        req.on("error", reject);
        sent.push(once(req, "finish").then(() => undefined));
        req.end(body);
      });
    });
    await Promise.all(sent);
    s.child.kill("SIGTERM");
    // still serving, but not ready, once the process has taken the signal
    await logged(s, "draining: readiness is now false");
    expect((await fetch(`${s.base}/readyz`)).status).toBe(503);
    const done = await Promise.all(inFlight);
    expect(done.map((d) => d.status)).toEqual(done.map(() => 200));
    expect(done.map((d) => d.n)).toEqual(done.map((_, i) => 40 + i));
    expect(await exited(s.child)).toBe(0);
    const log = s.logs.join("");
    expect(log.indexOf("draining")).toBeLessThan(log.indexOf("in-flight requests finished"));
    agent.destroy();
  });

  // Issue 22: at the listener's close, requests written on connections already accepted and not yet
  // served were reset. Here the listener closes at once (no drain delay) while keep-alive loops keep
  // the main thread busy with single calls (answered in it), so requests are queued unread at the
  // close; more loops send bulk calls to the compute thread; idle keep-alive connections are open too.
  it("SIGTERM with busy and idle keep-alive connections: every request sent on an accepted connection is answered, none reset", async () => {
    const s = await start({ BACKSTOP_WORKERS: "1", BACKSTOP_DRAIN_DELAY_MS: "0" });
    const single = JSON.stringify(good);
    const bulk = JSON.stringify(Array.from({ length: 20 }, () => good));
    // one keep-alive connection a loop; each sends its next request as soon as the last is answered,
    // and stops at the first answer that says Connection: close
    let answeredOnce = 0;
    let allAnswering: () => void = () => undefined;
    const answering = new Promise<void>((r) => {
      allAnswering = r;
    });
    const loops = 24;
    const loop = async (path: string, body: string) => {
      const agent = new Agent({ keepAlive: true, maxSockets: 1 });
      const statuses: number[] = [];
      try {
        for (;;) {
          const r = await once_(s.base, path, body, agent);
          statuses.push(r.status);
          if (statuses.length === 1 && ++answeredOnce === loops) allAnswering();
          if (r.close) return { statuses, error: undefined };
        }
      } catch (e) {
        return { statuses, error: (e as { code?: string }).code ?? String(e) };
      } finally {
        agent.destroy();
      }
    };
    // idle keep-alive connections: one answered request each, then nothing; the server must end them cleanly
    const idle = await Promise.all(
      Array.from({ length: 4 }, async () => {
        const agent = new Agent({ keepAlive: true, maxSockets: 1 });
        const r = await once_(s.base, "/v1/operatingPoint", single, agent);
        const socket = Object.values(agent.freeSockets)[0]?.[0];
        if (socket === undefined) throw new Error("the agent kept no idle socket");
        const errors: string[] = [];
        socket.on("error", (e: NodeJS.ErrnoException) => errors.push(e.code ?? e.message));
        return { status: r.status, closed: once(socket, "close"), errors, agent };
      }),
    );
    const running = [
      ...Array.from({ length: loops - 8 }, () => loop("/v1/operatingPoint", single)),
      ...Array.from({ length: 8 }, () => loop("/v1/operatingPoint/bulk", bulk)),
    ];
    await answering;
    s.child.kill("SIGTERM");
    const done = await Promise.all(running);
    expect(done.map((d) => d.error)).toEqual(done.map(() => undefined));
    for (const d of done) expect(d.statuses.every((x) => x === 200)).toBe(true);
    await Promise.all(idle.map((c) => c.closed));
    expect(idle.map((c) => [c.status, c.errors])).toEqual(idle.map(() => [200, []]));
    for (const c of idle) c.agent.destroy();
    expect(await exited(s.child)).toBe(0);
  });

  it("stops with exit 2 on a bad setting, naming it; warns that BACKSTOP_HTTP_PROCESSES is no longer read", async () => {
    const child = spawn("node", [join(projectRoot(), "dist", "bundle", "main.js")], {
      env: { ...process.env, PORT: "0", HOST: "127.0.0.1", BACKSTOP_MAX_BODY_BYTES: "lots" },
      stdio: ["ignore", "ignore", "pipe"],
    });
    children.push(child);
    let err = "";
    child.stderr?.on("data", (d: Buffer) => {
      err += String(d);
    });
    expect(await exited(child)).toBe(2);
    expect(err).toMatch(/BACKSTOP_MAX_BODY_BYTES must be a positive integer/);
    const s = await start({ BACKSTOP_HTTP_PROCESSES: "4", BACKSTOP_WORKERS: "0" });
    // the warning is its own log line, which may reach the pipe after the listening line
    await untilLogged(s, "BACKSTOP_HTTP_PROCESSES is no longer read");
    expect(s.logs.join("")).toMatch(/BACKSTOP_HTTP_PROCESSES is no longer read/);
    s.child.kill("SIGTERM");
    expect(await exited(s.child)).toBe(0);
  });
});
