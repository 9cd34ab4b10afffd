import cluster, { type Worker } from "node:cluster";
import type { Logger } from "../logging/logger.js";
import type { answerMetricsRequests } from "./cluster-metrics.js";

/** Exit code of a server process that could not start (bad configuration): not worth restarting. */
export const CONFIG_FAILURE_EXIT = 2;
const RESTARTS_PER_MINUTE = 5;

/**
 * The primary of a server of several HTTP processes (node's cluster: the primary holds the
 * listening socket and hands connections to the processes in turn). It serves no request itself:
 * - starts `processes` copies of `exec` (the first, then the others once it listens) and restarts one that dies (at most 5 a minute, then it
 *   stops the server with exit 1); a process that exits 2 (it could not start) stops the server with 2;
 * - prints the first process's "listening" line once;
 * - answers the processes' requests for the metrics of all of them (see cluster-metrics.ts);
 * - on SIGTERM or SIGINT passes the signal to every process (each drains as a lone server does) and
 *   exits once all have, 0 if every one exited 0.
 */
export function runPrimary(o: { readonly processes: number; readonly exec: string }): void {
  const { processes, exec } = o;
  cluster.setupPrimary({ exec, args: process.argv.slice(2) });
  let stopping = false;
  let printed = false;
  let worst = 0;
  const restarts: number[] = [];
  const listened = new WeakSet<Worker>();
  // The logger and the metrics gathering (pino, prom-client) are loaded once the first process is
  // on its way: it need not wait for them. Every handler waits for them.
  let logger: Logger;
  let metrics: ReturnType<typeof answerMetricsRequests>;
  let loaded: Promise<void> | undefined;
  const load = () =>
    Promise.all([import("../logging/logger.js"), import("./cluster-metrics.js")]).then(([l, m]) => {
      logger = l.createLogger();
      metrics = m.answerMetricsRequests();
    });

  const start = (index: number): Worker => {
    const w = cluster.fork({ BACKSTOP_HTTP_PROCESSES: String(processes), BACKSTOP_PROCESS_INDEX: String(index) });
    w.on("message", (m: unknown) => void (loaded as Promise<void>).then(() => onMessage(w, m)));
    w.on("exit", (code, signal) => void (loaded as Promise<void>).then(() => onExit(index, code, signal, listened.has(w))));
    return w;
  };
  const onMessage = (w: Worker, m: unknown) => {
      const msg = m as { type?: unknown; text?: unknown };
      if (msg !== null && typeof msg === "object" && msg.type === "backstop:listening" && typeof msg.text === "string") {
        listened.add(w);
        if (printed) return;
        printed = true;
        logger.flush(() => process.stdout.write(msg.text as string));
        // the others start once the first serves: started together they would share the CPUs and
        // all be ready later than one alone
        for (let i = 1; i < processes && !stopping; i += 1) start(i);
      } else metrics(w, m);
  };
  const onExit = (index: number, code: number | null, signal: string | null, hadListened: boolean) => {
      if (stopping) {
        // one still starting when the signal came had nothing to drain: ended by it, it ended well
        worst = Math.max(worst, code ?? (hadListened ? 1 : 0));
        if (Object.keys(cluster.workers ?? {}).length === 0) finish();
        return;
      }
      if (code === CONFIG_FAILURE_EXIT) {
        logger.fatal({ process: index }, "an HTTP process could not start; stopping");
        stop("SIGTERM", CONFIG_FAILURE_EXIT);
        return;
      }
      const now = Date.now();
      restarts.push(now);
      while ((restarts[0] as number) < now - 60_000) restarts.shift();
      if (restarts.length > RESTARTS_PER_MINUTE) {
        logger.fatal({ process: index, code, signal }, `HTTP processes died more than ${RESTARTS_PER_MINUTE} times in a minute; stopping`);
        stop("SIGTERM", 1);
        return;
      }
      logger.error({ process: index, code, signal }, "an HTTP process died; starting another");
      setTimeout(() => stopping || start(index), 200).unref();
  };

  let exitCode: number | undefined;
  const finish = () => {
    logger.info({ exitCode: exitCode ?? worst }, "every HTTP process has exited");
    logger.flush(() => process.exit(exitCode ?? (worst === 0 ? 0 : 1)));
  };
  function stop(signal: NodeJS.Signals, code?: number): void {
    if (stopping) return;
    stopping = true;
    exitCode = code;
    logger.info({ signal, processes: Object.keys(cluster.workers ?? {}).length }, "stopping: the signal passed to every HTTP process");
    const live = Object.values(cluster.workers ?? {}).filter((w): w is Worker => w !== undefined);
    if (live.length === 0) finish();
    else for (const w of live) w.process.kill(signal);
  }
  process.on("SIGTERM", () => void (loaded as Promise<void>).then(() => stop("SIGTERM")));
  process.on("SIGINT", () => void (loaded as Promise<void>).then(() => stop("SIGINT")));

  start(0);
  loaded = load();
  void loaded.then(() => logger.info({ processes }, "backstop primary started"));
}
