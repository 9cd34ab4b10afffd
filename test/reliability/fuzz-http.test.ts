import type { ChildProcess } from "node:child_process";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { procedureEntries } from "../../api/procedure-registry.js";
import { DEFAULT_LIMITS } from "../../contracts/limits.js";
import { startBuiltServer } from "../helpers/built-server.js";
import { exampleInputs, RESOURCE_MUTATIONS, resourceBody } from "./request-fuzz.js";

/**
 * The resource families of issue 22 (nesting depth, width, size) against the built server as it
 * ships, compute threads and all, where an input crosses to a thread (the in-process fuzz in
 * fuzz.test.ts has no thread hand-off): every procedure over /v1, bulk and /trpc, and the report
 * routes. Property: never a 5xx, and the server logs no internal error. Seeded, so a failure replays.
 */
const SEED = 20_261_203;
const RUNS = 2;
let server: { child: ChildProcess; base: string; logs: string[] };
let cases = 0;

beforeAll(async () => {
  server = await startBuiltServer({
    BACKSTOP_HTTP_PROCESSES: "1",
    BACKSTOP_WORKERS: "1",
    BACKSTOP_REQUEST_TIMEOUT_MS: "3000",
    LOG_LEVEL: "warn",
  });
}, 60_000);
afterAll(() => {
  if (server?.child.exitCode === null) server.child.kill("SIGKILL");
});

async function send(path: string, body: string): Promise<void> {
  cases += 1;
  const res = await fetch(`${server.base}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body,
  });
  const text = await res.text();
  if (res.status >= 500 && !(res.status === 503 && text.includes("compute-timeout")))
    throw new Error(`5xx: ${path} ${res.status}: ${text.slice(0, 300)} <- ${body.slice(0, 200)}`);
}

describe("fuzzing the built server with deep, wide and large inputs: zero 5xx", () => {
  const examples = exampleInputs();
  const procedures = procedureEntries().map((e) => e.path);

  it.each(procedures)(
    "%s over /v1, bulk and /trpc",
    async (procedure) => {
      const input = examples.get(procedure);
      const paths = [
        `/v1/${procedure}`,
        `/trpc/${procedure}`,
        ...(procedure === "review" || procedure === "bridgeAc" ? [`/v1/${procedure}/report?format=markdown`] : []),
      ];
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...RESOURCE_MUTATIONS), fc.nat(), async (kind, node) => {
          const body = resourceBody(input, kind, node, DEFAULT_LIMITS.maxInputDepth);
          for (const path of paths) await send(path, body);
          if (kind !== "big-string") await send(`/v1/${procedure}/bulk`, `[${body}]`);
        }),
        { numRuns: RESOURCE_MUTATIONS.length * RUNS, seed: SEED },
      );
    },
    120_000,
  );

  it("ran every case and the server logged no internal error", () => {
    expect(cases).toBeGreaterThanOrEqual(procedures.length * RESOURCE_MUTATIONS.length * RUNS * 2);
    expect(
      server.logs
        .join("")
        .split("\n")
        .filter((l) => /"level":50/.test(l)),
    ).toEqual([]);
  });
});
