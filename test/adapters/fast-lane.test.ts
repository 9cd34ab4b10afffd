import { readdirSync, readFileSync } from "node:fs";
import { Agent, createServer, request as httpRequest, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { join } from "node:path";
import { Writable } from "node:stream";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApp } from "../../adapters/http/app.js";
import { DEFAULT_HTTP_CONFIG, type HttpConfig } from "../../adapters/http/config.js";
import { createRequestListener } from "../../adapters/http/fast-lane.js";
import { createMetrics } from "../../adapters/http/metrics.js";
import { createLogger } from "../../adapters/logging/logger.js";
import { projectRoot } from "../../adapters/project-root.js";
import { demoContext } from "../helpers/app.js";
import { exampleInputs, mutatedBody, mutationArb } from "../reliability/request-fuzz.js";

// The lane (adapters/http/fast-lane.ts) must answer every request exactly as the Hono app answers
// it on its own. Oracle: the same app served without the lane (fastLane: false), sent the same
// requests; status, body and the headers a client reads must match, and so must the metrics and
// the request log lines.

interface Served {
  readonly server: Server;
  readonly base: string;
  readonly logs: string[];
  ready: boolean;
}

const KEY = "lane-test-key-0123456789";

async function serve(fastLane: boolean, config: Partial<HttpConfig> = {}): Promise<Served> {
  const logs: string[] = [];
  const sink = new Writable({
    write(c, _e, done) {
      logs.push(String(c));
      done();
    },
  });
  const ctx = demoContext();
  const logger = createLogger("info", sink);
  const full = { ...DEFAULT_HTTP_CONFIG, ...config };
  const metrics = createMetrics();
  const served = { logs, ready: true } as Served;
  const isReady = () => served.ready;
  const app = createApp({ ctx, logger, config: full, metrics, isReady });
  const server = createServer(createRequestListener({ app, ctx, logger, config: full, metrics, isReady, fastLane }));
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
  Object.assign(served, { server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` });
  return served;
}

interface Sent {
  readonly method: string;
  readonly path: string;
  readonly headers?: Record<string, string>;
  readonly body?: string | Buffer;
  /** send the body with chunked transfer coding (no content-length) */
  readonly chunked?: boolean;
}
interface Got {
  readonly status: number;
  readonly headers: Record<string, string | undefined>;
  readonly body: string;
}

// kept-alive connections, so `connection: close` in an answer is the server's own
const agent = new Agent({ keepAlive: true, maxSockets: 1 });

/** One request through node's own client (so chunked bodies and odd headers are possible). */
function send(base: string, s: Sent): Promise<Got> {
  const url = new URL(s.path, base);
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { ...(s.headers ?? {}) };
    if (s.body !== undefined && !s.chunked) headers["content-length"] = String(Buffer.byteLength(s.body));
    const req = httpRequest({ host: url.hostname, port: url.port, path: url.pathname + url.search, method: s.method, headers, agent }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => {
        const pick = (k: string) => {
          const v = res.headers[k];
          return Array.isArray(v) ? v.join(", ") : v;
        };
        resolve({
          status: res.statusCode ?? 0,
          headers: { "content-type": pick("content-type"), vary: pick("vary"), connection: pick("connection"), "www-authenticate": pick("www-authenticate"), allow: pick("allow"), "x-request-id": pick("x-request-id") },
          body: Buffer.concat(chunks).toString("utf8"),
        });
      });
    });
    req.on("error", reject);
    if (s.body !== undefined) req.end(s.body);
    else req.end();
  });
}

const op = JSON.stringify(JSON.parse(readFileSync(join(projectRoot(), "examples", "http", "operatingPoint.body.json"), "utf8")));
const examples = readdirSync(join(projectRoot(), "examples", "requests")).map((f) => JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", f), "utf8")) as { procedure: string; input: unknown });
const JSONH = { "content-type": "application/json" };

/** Requests of the lane's shapes whose input holds an unknown key: refused (400) on the lane as in the app. */
function unknownKeyCases(): Sent[] {
  const misspelt = op.replace('"sourceResistanceOhm"', '"sourceResistanceOhms"');
  const proto = `${op.slice(0, -1)},"__proto__":{"polluted":"yes"}}`;
  return [
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: misspelt },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: proto },
    { method: "POST", path: "/v1/rules.list", headers: JSONH, body: '{"verbose":true}' },
    { method: "POST", path: "/trpc/operatingPoint", headers: JSONH, body: misspelt },
    { method: "GET", path: `/trpc/operatingPoint?input=${encodeURIComponent(proto)}` },
  ];
}

/** The requests both servers are sent: every shape the lane takes, and every near miss it must hand on. */
function cases(): Sent[] {
  const bad = JSON.stringify({ ...(JSON.parse(op) as object), supplyV: "12 A" });
  const list: Sent[] = [];
  for (const e of examples) {
    list.push({ method: "POST", path: `/v1/${e.procedure}`, headers: JSONH, body: JSON.stringify(e.input) });
    list.push({ method: "POST", path: `/trpc/${e.procedure}`, headers: JSONH, body: JSON.stringify(e.input) });
    list.push({ method: "GET", path: `/trpc/${e.procedure}?input=${encodeURIComponent(JSON.stringify(e.input))}` });
  }
  list.push(
    { method: "POST", path: "/v1/operatingPoint", headers: { ...JSONH, "x-request-id": "client-id-1" }, body: op },
    { method: "POST", path: "/v1/operatingPoint", headers: { ...JSONH, "x-request-id": "not a token!" }, body: op },
    { method: "POST", path: "/v1/operatingPoint", headers: { "content-type": "text/plain" }, body: op },
    { method: "POST", path: "/v1/operatingPoint", body: op },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: bad },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: "{not json" },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: "" },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: `\uFEFF${op}` },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: Buffer.concat([Buffer.from(op.slice(0, -1)), Buffer.from([0xff, 0xfe]), Buffer.from("}")]) },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: op, chunked: true },
    { method: "POST", path: "/v1/operatingPoint?x=1", headers: JSONH, body: op },
    { method: "POST", path: "/v1/operatingPoint/", headers: JSONH, body: op },
    { method: "POST", path: "/v1/operatingPoint/bulk", headers: JSONH, body: `[${op},${bad}]` },
    { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: JSON.stringify({ ...(JSON.parse(op) as object), note: "x".repeat(20_000) }) },
    { method: "GET", path: "/v1/operatingPoint" },
    { method: "PUT", path: "/v1/operatingPoint", headers: JSONH, body: op },
    { method: "POST", path: "/v1/noSuchProcedure", headers: JSONH, body: op },
    { method: "POST", path: "/trpc/operatingPoint", headers: { ...JSONH, "x-request-id": "client-id-2" }, body: op },
    { method: "POST", path: "/trpc/operatingPoint", headers: JSONH, body: bad },
    { method: "POST", path: "/trpc/operatingPoint", headers: JSONH, body: "{not json" },
    { method: "POST", path: "/trpc/operatingPoint", headers: { "content-type": "text/plain" }, body: op },
    { method: "POST", path: "/trpc/operatingPoint", headers: { "content-type": "application/json; charset=utf-8" }, body: op },
    { method: "POST", path: "/trpc/operatingPoint", headers: { "content-type": "Application/JSON" }, body: op },
    { method: "POST", path: "/v1/operatingPoint", headers: { ...JSONH, expect: "100-continue" }, body: op },
    { method: "POST", path: "/trpc/operatingPoint", body: op },
    { method: "POST", path: "/trpc/operatingPoint", headers: { ...JSONH, "trpc-accept": "application/jsonl" }, body: op },
    { method: "POST", path: "/trpc/operatingPoint?batch=1", headers: JSONH, body: `{"0":${op}}` },
    { method: "POST", path: "/trpc/operatingPoint", headers: JSONH, body: op, chunked: true },
    { method: "GET", path: `/trpc/operatingPoint?input=${encodeURIComponent(op)}&x=1` },
    { method: "GET", path: "/trpc/operatingPoint" },
    { method: "GET", path: `/trpc/operatingPoint?input=${encodeURIComponent("{not json")}` },
    { method: "GET", path: `/trpc/operatingPoint?input=${encodeURIComponent(bad)}` },
    { method: "POST", path: "/trpc/noSuchProcedure", headers: JSONH, body: op },
    { method: "GET", path: "/livez" },
    ...unknownKeyCases(),
  );
  return list;
}

/** What two answers to the same request must share (a generated request id differs, so only its form is compared). */
function comparable(g: Got): unknown {
  const id = g.headers["x-request-id"];
  const generated = id !== undefined && /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/.test(id);
  let body = g.body;
  if (generated) body = body.replaceAll(id as string, "<id>");
  return { status: g.status, headers: { ...g.headers, "x-request-id": generated ? "<uuid>" : id }, body };
}

/** The request log lines without their timing, in order. */
function requestLines(logs: readonly string[]): unknown[] {
  return logs
    .flatMap((l) => l.split("\n"))
    .filter((l) => l.includes('"msg":"request"'))
    .map((l) => {
      const { requestId, method, path, status } = JSON.parse(l) as Record<string, unknown>;
      return { requestId: typeof requestId === "string" && requestId.includes("client-id") ? requestId : "<id>", method, path, status };
    });
}

/** The counts of the metrics (durations differ run to run; how many calls fell where must not). */
async function counts(base: string): Promise<string[]> {
  const text = (await send(base, { method: "GET", path: "/metrics" })).body;
  return text.split("\n").filter((l) => /^backstop_(procedure_duration_seconds_count|http_requests_total)\{/.test(l) && !l.includes('route="metrics"'));
}

describe("the request lane answers as the app does", () => {
  let lane: Served;
  let plain: Served;
  beforeAll(async () => {
    [lane, plain] = await Promise.all([serve(true), serve(false)]);
  });
  afterAll(() => {
    agent.destroy();
    lane.server.close();
    plain.server.close();
    lane.server.closeAllConnections();
    plain.server.closeAllConnections();
  });

  it("gives the same status, headers and body for every request, the lane's shapes and their near misses", async () => {
    for (const c of cases()) {
      const [a, b] = [await send(lane.base, c), await send(plain.base, c)];
      expect(comparable(a), `${c.method} ${c.path.slice(0, 60)}`).toEqual(comparable(b));
      expect(a.headers.connection, "a kept-alive connection").toBe("keep-alive");
    }
  });

  it("refuses an unknown key on the lane: 400 naming the key", async () => {
    for (const c of unknownKeyCases()) {
      const [a, b] = [await send(lane.base, c), await send(plain.base, c)];
      expect(comparable(a)).toEqual(comparable(b));
      expect(a.status, `${c.method} ${c.path.slice(0, 40)}`).toBe(400);
      expect(a.body).toMatch(/unknown field `(sourceResistanceOhms|__proto__|verbose)`/);
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it("counts the same calls and logs the same request lines", async () => {
    expect(await counts(lane.base)).toEqual(await counts(plain.base));
    const a = requestLines(lane.logs);
    expect(a.length).toBeGreaterThan(cases().length - 1);
    expect(a).toEqual(requestLines(plain.logs));
  });

  // Property: for the lane's own procedures, the example with one field mutated (the fuzz suite's
  // mutations: type, sign, magnitude, unit, missing, extra, huge string, deep nesting) and random
  // JSON get the same answer with and without the lane. Seeded, so a failure replays.
  it("answers mutated and random bodies as the app does", async () => {
    const examples = exampleInputs();
    for (const procedure of ["operatingPoint", "rules.show"]) {
      const input = examples.get(procedure);
      const body = fc.oneof({ weight: 4, arbitrary: mutationArb.map((m) => mutatedBody(input, m)) }, { weight: 1, arbitrary: fc.jsonValue().map((v) => JSON.stringify(v)) });
      await fc.assert(
        fc.asyncProperty(body, fc.constantFrom("v1", "trpc"), async (b, surface) => {
          const c = { method: "POST", path: `/${surface}/${procedure}`, headers: JSONH, body: b };
          const [x, y] = [await send(lane.base, c), await send(plain.base, c)];
          expect(comparable(x)).toEqual(comparable(y));
        }),
        { numRuns: 150, seed: 20_261_201 },
      );
    }
  }, 60_000);

  it("closes the connection after each answer while draining", async () => {
    lane.ready = false;
    plain.ready = false;
    try {
      for (const c of [
        { method: "POST", path: "/v1/operatingPoint", headers: JSONH, body: op },
        { method: "POST", path: "/trpc/operatingPoint", headers: JSONH, body: op },
      ]) {
        const [a, b] = [await send(lane.base, c), await send(plain.base, c)];
        expect(a.headers.connection).toBe("close");
        expect(b.headers.connection).toBe("close");
        expect(comparable(a)).toEqual(comparable(b));
      }
    } finally {
      lane.ready = true;
      plain.ready = true;
    }
  });
});

describe("the request lane with API keys", () => {
  it("answers a call with a valid key and leaves a missing or wrong key to the app's 401", async () => {
    const [lane, plain] = await Promise.all([serve(true, { apiKeys: [KEY] }), serve(false, { apiKeys: [KEY] })]);
    try {
      const keyed: Record<string, string>[] = [JSONH, { ...JSONH, authorization: `Bearer ${KEY}` }, { ...JSONH, "x-api-key": KEY }, { ...JSONH, "x-api-key": `${KEY}x` }];
      for (const headers of keyed) {
        for (const path of ["/v1/operatingPoint", "/trpc/operatingPoint"]) {
          const c = { method: "POST", path, headers, body: op };
          const [a, b] = [await send(lane.base, c), await send(plain.base, c)];
          expect(comparable(a)).toEqual(comparable(b));
          expect(a.status).toBe(headers === JSONH || headers["x-api-key"]?.endsWith("x") ? 401 : 200);
        }
      }
    } finally {
      lane.server.close();
      plain.server.close();
      lane.server.closeAllConnections();
      plain.server.closeAllConnections();
    }
  });
});
