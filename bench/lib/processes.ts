/** The bench's processes: the servers it measures, the load driver and one-off node runs. */
import { type ChildProcess, spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { projectRoot } from "../../adapters/project-root.js";

export const root = projectRoot();
export const quick = process.env.BENCH_QUICK === "1";
export const dist = (...p: string[]) => join(root, "dist", ...p);
/** what `npm start` runs */
export const MAIN = dist("bundle", "main.js");
export const RSS_PRELOAD = dist("bench", "lib", "max-rss.js");
export const log = (s: string) => process.stderr.write(`${s}\n`);

export interface Server {
  readonly child: ChildProcess;
  readonly base: string;
  readonly output: string[];
}

/** A server script on a loopback port; resolves once it prints where it listens. */
export function startServer(script: string, env: Record<string, string> = {}): Promise<Server> {
  const child = spawn(process.execPath, [script], {
    env: { ...process.env, PORT: "0", HOST: "127.0.0.1", LOG_LEVEL: "info", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const output: string[] = [];
  return new Promise((resolve, reject) => {
    const timer = setTimeout(
      () => reject(new Error(`${script} did not start: ${output.join("").slice(-2000)}`)),
      30_000,
    );
    child.stdout?.on("data", (d: Buffer) => {
      // keep only the start of the log: the request lines are not needed and would grow without bound
      if (output.length < 50) output.push(String(d));
      const m = /listening on http:\/\/localhost:(\d+)/.exec(output.join(""));
      if (m) {
        clearTimeout(timer);
        resolve({ child, base: `http://127.0.0.1:${m[1]}`, output });
      }
    });
    child.stderr?.on("data", (d: Buffer) => output.length < 50 && output.push(String(d)));
    child.once("exit", (code) => reject(new Error(`${script} exited ${code}: ${output.join("").slice(-2000)}`)));
  });
}

export async function stop(s: Server): Promise<void> {
  if (s.child.exitCode !== null) return;
  const gone = new Promise<void>((r) => s.child.once("exit", () => r()));
  s.child.kill("SIGTERM");
  const t = setTimeout(() => s.child.kill("SIGKILL"), 10_000);
  await gone;
  clearTimeout(t);
}

export interface Load {
  readonly requestsPerSecond: number;
  readonly totalRequests: number;
  readonly p50Ms: number;
  readonly p99Ms: number;
  readonly maxMs: number;
  readonly errors: number;
  readonly timeouts: number;
  readonly non2xx: number;
}

/** autocannon in its own process (see load-driver.ts). */
export function drive(
  base: string,
  bodies: { path: string; body: string }[],
  connections: number,
  durationS: number,
  warmupS = 1,
): Promise<Load> {
  const specDir = mkdtempSync(join(tmpdir(), "backstop-load-"));
  const spec = join(specDir, "spec.json");
  writeFileSync(spec, JSON.stringify({ url: base, connections, durationS, warmupS, bodies, timeoutS: 30 }));
  return new Promise<Load>((resolve, reject) => {
    const child = spawn(process.execPath, [dist("bench", "lib", "load-driver.js"), spec], {
      stdio: ["ignore", "pipe", "inherit"],
    });
    let out = "";
    child.stdout.on("data", (d: Buffer) => {
      out += String(d);
    });
    child.once("exit", (code) =>
      code === 0
        ? resolve(JSON.parse(out.trim().split("\n").at(-1) ?? "{}") as Load)
        : reject(new Error(`load driver exited ${code}`)),
    );
  }).finally(() => rmSync(specDir, { recursive: true, force: true }));
}

export function runNode(
  args: string[],
  env: Record<string, string> = {},
): Promise<{ code: number | null; stdout: string; stderr: string; wallMs: number }> {
  const t0 = performance.now();
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d: Buffer) => {
      stdout += String(d);
    });
    child.stderr.on("data", (d: Buffer) => {
      stderr += String(d);
    });
    child.once("exit", (code) => resolve({ code, stdout, stderr, wallMs: performance.now() - t0 }));
  });
}
