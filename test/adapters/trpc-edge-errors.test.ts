import type { ChildProcess } from "node:child_process";
import { createTRPCClient, httpBatchLink, httpBatchStreamLink, httpLink, TRPCClientError } from "@trpc/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AppRouter } from "../../api/router.js";
import { startBuiltServer } from "../helpers/built-server.js";

// The edge's refusals (no valid API key, a body over BACKSTOP_MAX_BODY_BYTES) as @trpc/client reads
// them from the built server: a tRPC error with its code and status, over each HTTP link (one call
// a request, a batch, a streamed batch); /v1 keeps answering problem+json. Before, /trpc answered
// problem+json too, which the client could not read ("Unable to transform response").

const KEY = "edge-test-key-0123456789abcdef";
const MAX_BODY = 4096;
let server: { child: ChildProcess; base: string };
beforeAll(async () => {
  server = await startBuiltServer({ BACKSTOP_API_KEYS: KEY, BACKSTOP_MAX_BODY_BYTES: String(MAX_BODY) });
}, 120_000);
afterAll(() => {
  server?.child.kill();
});

type Link = typeof httpLink | typeof httpBatchLink | typeof httpBatchStreamLink;
const LINKS: [string, Link][] = [
  ["httpLink", httpLink],
  ["httpBatchLink", httpBatchLink],
  ["httpBatchStreamLink", httpBatchStreamLink],
];
const client = (link: Link, key?: string) =>
  createTRPCClient<AppRouter>({
    links: [
      link({
        url: `${server.base}/trpc`,
        methodOverride: "POST",
        headers: key === undefined ? {} : { authorization: `Bearer ${key}` },
      }),
    ],
  });
const op = {
  stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
  supplyV: "12 V",
  load: { kind: "constant-current", currentA: 3 },
  ambientC: "85 degC",
} as const;

async function refusalOf(p: Promise<unknown>): Promise<TRPCClientError<AppRouter>> {
  const e = await p.then(
    () => undefined,
    (err: unknown) => err,
  );
  if (!(e instanceof TRPCClientError)) throw new Error(`expected a TRPCClientError, got ${String(e)}`);
  return e as TRPCClientError<AppRouter>;
}

describe("edge refusals through @trpc/client against the built server", () => {
  it.each(LINKS)(
    "%s: no key or a wrong key is UNAUTHORIZED (401), with the edge's message and code",
    async (_n, link) => {
      for (const key of [undefined, "wrong-key-0123456789abcdef"]) {
        const c = client(link, key);
        const [a, b] = await Promise.all([refusalOf(c.operatingPoint.query(op)), refusalOf(c.rules.list.query({}))]);
        for (const e of [a, b]) {
          expect(e.message).toMatch(/a valid API key is required/);
          expect(e.data?.code).toBe("UNAUTHORIZED");
          expect(e.data?.httpStatus).toBe(401);
          expect(e.data?.backstop.code).toBe("unauthorized");
        }
      }
      // with the key the same calls answer
      const r = await client(link, KEY).operatingPoint.query(op);
      expect(r.outcome).toBe("solved");
    },
  );

  it.each(LINKS)("%s: a body over the limit is PAYLOAD_TOO_LARGE (413)", async (_n, link) => {
    const big = { ...op, stage: { ...op.stage, partId: "x".repeat(MAX_BODY) } };
    const e = await refusalOf(client(link, KEY).operatingPoint.query(big));
    expect(e.data?.code).toBe("PAYLOAD_TOO_LARGE");
    expect(e.data?.httpStatus).toBe(413);
    expect(e.message).toMatch(new RegExp(`exceeds ${MAX_BODY} bytes \\(BACKSTOP_MAX_BODY_BYTES\\)`));
  });

  it("the refusal's status and WWW-Authenticate are on /trpc's response; /v1 keeps problem+json", async () => {
    const trpc = await fetch(`${server.base}/trpc/operatingPoint`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(op),
    });
    expect(trpc.status).toBe(401);
    expect(trpc.headers.get("content-type")).toMatch(/^application\/json/);
    expect(trpc.headers.get("www-authenticate")).toBe('Bearer realm="backstop"');
    expect(((await trpc.json()) as { error: { data: { code: string } } }).error.data.code).toBe("UNAUTHORIZED");
    const v1 = await fetch(`${server.base}/v1/operatingPoint`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(op),
    });
    expect(v1.status).toBe(401);
    expect(v1.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    expect(((await v1.json()) as { code: string }).code).toBe("unauthorized");
    const v1Big = await fetch(`${server.base}/v1/operatingPoint`, {
      method: "POST",
      headers: { "content-type": "application/json", authorization: `Bearer ${KEY}` },
      body: JSON.stringify({ ...op, pad: "x".repeat(MAX_BODY) }),
    });
    expect(v1Big.status).toBe(413);
    expect(v1Big.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    // a body streamed without a length is counted as it comes, and refused in tRPC's shape on /trpc
    const chunk = new TextEncoder().encode(" ".repeat(1024));
    let sent = 0;
    const streamed = await fetch(`${server.base}/trpc/operatingPoint`, {
      method: "POST",
      headers: { "content-type": "application/json", authorization: `Bearer ${KEY}` },
      body: new ReadableStream({
        pull(ctl) {
          if (sent >= MAX_BODY * 2) ctl.close();
          else {
            sent += chunk.length;
            ctl.enqueue(chunk);
          }
        },
      }),
      duplex: "half",
    } as RequestInit);
    expect(streamed.status).toBe(413);
    expect(((await streamed.json()) as { error: { data: { code: string } } }).error.data.code).toBe(
      "PAYLOAD_TOO_LARGE",
    );
  });
});
