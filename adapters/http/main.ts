// The server's entry point (`npm start`). One HTTP process, or with BACKSTOP_HTTP_PROCESSES > 1
// (by default one per CPU of the process's budget, at most 4) a primary that runs that many
// (cluster-primary.ts). Either way the server itself is server-process.ts, loaded only where it
// runs: the primary stays small, so the processes start as fast as a lone one.
import cluster from "node:cluster";
import { fileURLToPath } from "node:url";
import { cpuBudget } from "../cpu-budget.js";
import { httpProcessesFromEnv } from "./config.js";

const serverProcess = new URL("./server-process.js", import.meta.url);
// a file of its own in the bundle too (a computed specifier is not bundled in): a lone server never loads it
const primary = new URL("./cluster-primary.js", import.meta.url);

let processes: number;
try {
  processes = httpProcessesFromEnv(process.env, cpuBudget());
} catch (e) {
  process.stderr.write(`backstop: ${(e as Error).message}\n`);
  process.exit(2); // as a server process that cannot start (cluster-primary.ts, CONFIG_FAILURE_EXIT)
}
if (processes <= 1 || !cluster.isPrimary) await import(serverProcess.href);
else {
  const { runPrimary } = (await import(primary.href)) as typeof import("./cluster-primary.js");
  runPrimary({ processes, exec: fileURLToPath(serverProcess) });
}
