import { type ChildProcess, spawn } from "node:child_process";
import { join } from "node:path";
import { projectRoot } from "../../adapters/project-root.js";
import { ensureBuilt } from "./build-once.js";

// a file that starts the built server needs dist/
ensureBuilt();

/**
 * The built server as it ships (dist/bundle/main.js, built on first use, build-once.ts) as a process on a loopback port chosen
 * by the system; resolves once it says where it listens, rejects after 30 s with what it printed.
 */
export function startBuiltServer(
  env: Record<string, string>,
): Promise<{ child: ChildProcess; port: number; base: string; logs: string[] }> {
  const child = spawn("node", [join(projectRoot(), "dist", "bundle", "main.js")], {
    env: { ...process.env, PORT: "0", HOST: "127.0.0.1", LOG_LEVEL: "info", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const logs: string[] = [];
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start: ${logs.join("")}`)), 30_000);
    child.stdout?.on("data", (d: Buffer) => {
      logs.push(String(d));
      const m = /listening on http:\/\/localhost:(\d+)/.exec(logs.join(""));
      if (m) {
        clearTimeout(timer);
        resolve({ child, port: Number(m[1]), base: `http://127.0.0.1:${m[1]}`, logs });
      }
    });
    child.stderr?.on("data", (d: Buffer) => logs.push(String(d)));
  });
}

/** Resolves once the server's output holds `text` (a log line it writes when the event happens). */
export function untilLogged(server: { child: ChildProcess; logs: string[] }, text: string): Promise<void> {
  return new Promise((resolve, reject) => {
    if (server.logs.join("").includes(text)) return resolve();
    const look = () => {
      if (!server.logs.join("").includes(text)) return;
      server.child.stdout?.off("data", look);
      server.child.stderr?.off("data", look);
      server.child.off("exit", gone);
      resolve();
    };
    const gone = () => reject(new Error(`the server exited before it logged "${text}": ${server.logs.join("")}`));
    // after the output's own listeners (startBuiltServer's), which fill `logs`
    server.child.stdout?.on("data", look);
    server.child.stderr?.on("data", look);
    server.child.once("exit", gone);
  });
}
