import { Writable } from "node:stream";
import { loadCatalogFile } from "../../adapters/catalog/file-catalog.js";
import { createApp } from "../../adapters/http/app.js";
import { createLogger } from "../../adapters/logging/logger.js";
import { DEMO_CATALOG } from "../../adapters/project-root.js";
import type { Context } from "../../api/context.js";

/** The demo catalog context and an in-process app with logs captured (no open port). */
export function demoContext(): Context {
  return { catalog: loadCatalogFile(DEMO_CATALOG()) };
}

export function testApp() {
  const logs: string[] = [];
  const sink = new Writable({
    write(chunk, _e, done) {
      logs.push(String(chunk));
      done();
    },
  });
  const app = createApp({ ctx: demoContext(), logger: createLogger("info", sink) });
  return { app, logs };
}

export async function postTrpc(
  app: ReturnType<typeof testApp>["app"],
  procedure: string,
  input: unknown,
  headers: Record<string, string> = {},
) {
  const res = await app.request(`/trpc/${procedure}`, {
    method: "POST",
    headers: { "content-type": "application/json", ...headers },
    body: JSON.stringify(input),
  });
  return { status: res.status, body: (await res.json()) as Record<string, unknown>, headers: res.headers };
}
