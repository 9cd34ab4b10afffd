import { readFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { startBuiltServer, untilLogged } from "../helpers/built-server.js";

// Issue 22's bounds, through the built server as it ships (one HTTP process, one compute thread),
// with a small compute budget and answer limit so each case runs in about a second.
const example = (p: string) =>
  (
    JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", `${p}.json`), "utf8")) as {
      input: Record<string, unknown>;
    }
  ).input;
const review = example("review");
const reviewRequirement = review.requirement as Record<string, unknown>;
const reviewCandidates = review.candidates as unknown[];
const { monteCarlo: _mc, ...plainReview } = review;
const rulesEvaluate = example("rules.evaluate");
const bridgeAc = example("bridgeAc");
const profile = (n: number) => Array.from({ length: n }, (_, i) => ({ timeS: i * 0.001, voltageV: 8 + (i % 7) }));
/** the liveness probe's timeout in deploy/deployment.yaml, seconds */
const LIVENESS_TIMEOUT_S = Number(
  /livenessProbe:\n(?:\s+\w+:.*\n)*?\s+timeoutSeconds: (\d+)/.exec(
    readFileSync(join(projectRoot(), "deploy", "deployment.yaml"), "utf8"),
  )?.[1],
);
const deep = (n: number) => `${'{"a":'.repeat(n)}1${"}".repeat(n)}`;

let server: Awaited<ReturnType<typeof startBuiltServer>>;
beforeAll(async () => {
  server = await startBuiltServer({
    BACKSTOP_HTTP_PROCESSES: "1",
    BACKSTOP_WORKERS: "1",
    BACKSTOP_REQUEST_TIMEOUT_MS: "4000",
    BACKSTOP_MAX_ANSWER_BYTES: "1000000",
    LOG_LEVEL: "info", // for the start-up line "rule sets ready"
  });
  // past start-up: the built-in rule sets compiled in the main thread (its log line), the compute
  // thread up (a thread starting on a busy host may take past the budget: its first calls are retried)
  await untilLogged(server, "rule sets ready");
  let warm = 0;
  for (let k = 0; k < 10 && warm !== 200; k += 1) warm = (await post("/v1/rules.evaluate", rulesEvaluate)).status;
  expect(warm).toBe(200);
}, 60_000);
afterAll(() => {
  if (server?.child.exitCode === null) server.child.kill("SIGKILL");
});

const post = async (path: string, body: unknown, headers: Record<string, string> = {}) => {
  const res = await fetch(`${server.base}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json", ...headers },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, text, json: () => JSON.parse(text) as Record<string, unknown> };
};
/** The backstop error body of a /v1 problem or a /trpc error. */
const bodyOf = (r: { json: () => Record<string, unknown> }) => {
  const j = r.json();
  if ("error" in j)
    return (j.error as { data: { backstop: { code: string; message: string; issues: { message: string }[] } } }).data
      .backstop;
  return { code: j.code as string, message: j.detail as string, issues: j.issues as { message: string }[] };
};

describe("limits on inputs: 422 naming the limit, over /v1, bulk, /trpc and reports", () => {
  it("a 10,000-deep input is refused before any hand-off (it was a 500 on /v1/rules.evaluate)", async () => {
    for (const [path, text] of [
      ["/v1/rules.evaluate", deep(10_000)],
      ["/v1/rules.evaluate/bulk", `[${deep(10_000)}]`],
      ["/trpc/rules.evaluate", deep(10_000)],
      ["/v1/review/report", deep(10_000)],
      ["/v1/review", deep(65)],
    ] as const) {
      const r = await post(path, text);
      expect([path, r.status]).toEqual([path, 422]);
      expect(bodyOf(r).code).toBe("limit-exceeded");
      expect(bodyOf(r).message).toMatch(/BACKSTOP_MAX_INPUT_DEPTH/);
    }
    expect((await post("/v1/review", deep(60))).status).toBe(400); // within the depth limit: an ordinary invalid input
  });

  it("a metrics record of 50,000 names: one issue naming the limit, a small answer (was 75-224 MB)", async () => {
    const metrics = Object.fromEntries(Array.from({ length: 50_000 }, (_, i) => [`noSuchMetric${i}`, 1]));
    for (const path of ["/v1/rules.evaluate", "/trpc/rules.evaluate"]) {
      const r = await post(path, { ...rulesEvaluate, metrics });
      expect(r.status).toBe(422);
      expect(bodyOf(r).issues).toHaveLength(1);
      expect(bodyOf(r).message).toMatch(/at most 256 \(limit BACKSTOP_MAX_METRICS\)/);
      expect(r.text.length).toBeLessThan(5000);
    }
  });

  it("an error answer lists the first 20 issues and counts the rest", async () => {
    const metrics = Object.fromEntries(Array.from({ length: 200 }, (_, i) => [`noSuchMetric${i}`, 1]));
    for (const path of ["/v1/rules.evaluate", "/trpc/rules.evaluate"]) {
      const r = await post(path, { ...rulesEvaluate, metrics });
      expect(r.status).toBe(400);
      const issues = bodyOf(r).issues;
      expect(issues).toHaveLength(21);
      expect(issues[20]?.message).toMatch(
        /^180 more issues not listed \(the first 20 of 200 are; limit BACKSTOP_MAX_ERROR_ISSUES\)/,
      );
      expect(r.text.length).toBeLessThan(8000);
    }
  });

  it("candidates, profile points x candidates and Monte Carlo samples past their limits", async () => {
    const many = {
      ...plainReview,
      candidates: Array.from({ length: 65 }, (_, i) => reviewCandidates[i % reviewCandidates.length]),
    };
    const r1 = await post("/v1/review", many);
    expect(r1.status).toBe(422);
    expect(bodyOf(r1).message).toMatch(/candidates in one review: at most 64 \(limit BACKSTOP_MAX_CANDIDATES\)/);
    const long = {
      ...plainReview,
      requirement: { ...reviewRequirement, startProfile: profile(600) },
      candidates: reviewCandidates.slice(0, 2),
    };
    const r2 = await post("/trpc/review", long);
    expect(r2.status).toBe(422);
    expect(bodyOf(r2).message).toMatch(
      /start-up profile points times candidates is 1200: at most 1000 \(limit BACKSTOP_MAX_PROFILE_WORK\)/,
    );
    const mc = { ...review, monteCarlo: { ...(review.monteCarlo as object), samples: 100_001 } };
    const r3 = await post("/v1/review", mc);
    expect(r3.status).toBe(422);
    expect(bodyOf(r3).message).toMatch(/BACKSTOP_MAX_MONTE_CARLO_SAMPLES/);
  });
});

describe("limits on answers and time", () => {
  it("an answer past BACKSTOP_MAX_ANSWER_BYTES is 422 answer-too-large on /v1, bulk, /trpc and reports", async () => {
    const big = {
      ...plainReview,
      requirement: { ...reviewRequirement, startProfile: profile(200) },
      candidates: reviewCandidates.slice(0, 1),
      curves: true, // the profile's samples, so that the answer passes 1 MB
    };
    for (const path of ["/v1/review", "/trpc/review", "/v1/review/report?format=json"]) {
      const r = await post(path, big);
      expect([path, r.status]).toEqual([path, 422]);
      expect(bodyOf(r).code).toBe("answer-too-large");
      expect(bodyOf(r).message).toMatch(/at most 1000000 \(limit BACKSTOP_MAX_ANSWER_BYTES\)/);
    }
    const bulk = await post(
      "/v1/review/bulk",
      Array.from({ length: 2 }, () => ({ ...big, requirement: { ...reviewRequirement, startProfile: profile(60) } })),
    ); // about 0.7 MB each
    expect(bulk.status).toBe(422);
    expect(bodyOf(bulk).code).toBe("answer-too-large");
  });

  it("/trpc and reports run under the compute budget, off the request thread: /livez answers meanwhile, within the liveness probe's timeout", async () => {
    // a server of its own with a 1 s budget and room for 1,000,000 Monte Carlo samples: tens of seconds
    // of compute with a small answer (100,000, the default limit, can finish within 1 s on Node 22)
    const own = await startBuiltServer({
      BACKSTOP_HTTP_PROCESSES: "1",
      BACKSTOP_WORKERS: "1",
      BACKSTOP_REQUEST_TIMEOUT_MS: "1000",
      BACKSTOP_MAX_MONTE_CARLO_SAMPLES: "1000000",
      LOG_LEVEL: "info",
    });
    try {
      const slow = { ...review, monteCarlo: { ...(review.monteCarlo as object), samples: 1_000_000 } };
      // past its start-up warm-up: the built-in rule sets compile in the main thread, then it logs this
      await untilLogged(own, "rule sets ready");
      for (const path of ["/trpc/review", "/v1/review/report?format=markdown"]) {
        const call = fetch(`${own.base}${path}`, {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify(slow),
        }).then(async (res) => {
          const text = await res.text();
          return { status: res.status, text, json: () => JSON.parse(text) as Record<string, unknown> };
        });
        let done = false;
        void call.finally(() => {
          done = true;
        });
        const probes: number[] = [];
        while (!done) {
          const t0 = performance.now();
          expect((await fetch(`${own.base}/livez`)).status).toBe(200);
          probes.push(performance.now() - t0);
          await new Promise((r) => setTimeout(r, 50));
        }
        const r = await call;
        expect([path, r.status]).toEqual([path, 503]);
        expect(bodyOf(r).code).toBe("compute-timeout");
        // the event: /livez kept being answered while the call ran (a request thread busy with the
        // call would have answered none until it ended); the bound: each probe within the timeout of
        // the pod's liveness probe, past which the kubelet counts a failure (deploy/deployment.yaml)
        expect(probes.length).toBeGreaterThan(3);
        const sorted = [...probes].sort((a, b) => a - b);
        console.log(
          `${path}: /livez ms during the call, median ${sorted[Math.floor(sorted.length / 2)]?.toFixed(0)}, max ${sorted.at(-1)?.toFixed(0)} over ${sorted.length}`,
        );
        expect(sorted.at(-1)).toBeLessThan(LIVENESS_TIMEOUT_S * 1000);
      }
    } finally {
      own.child.kill("SIGKILL"); // also when an expectation fails: no server left behind
    }
  });
});

describe("reports", () => {
  it("bridgeAc with sourceRmsV 5e-324 draws (it was a 500); ?id= and candidate labels are escaped in Markdown", async () => {
    const tiny = await post("/v1/bridgeAc/report?format=markdown", { ...bridgeAc, sourceRmsV: 5e-324 });
    expect(tiny.status).toBe(200);
    const label = "<img src=x onerror=alert(1)> *bold* [link](http://example.invalid) | cell";
    const id = "<script>x</script>_[a](b)";
    const labelled = { ...plainReview, candidates: [{ ...(reviewCandidates[0] as object), label }] };
    const md = await post(`/v1/review/report?format=markdown&id=${encodeURIComponent(id)}`, labelled);
    expect(md.status).toBe(200);
    expect(md.text).not.toMatch(/(^|[^\\])<script>/m);
    expect(md.text).not.toMatch(/(^|[^\\])<img/m);
    expect(md.text).not.toMatch(/(^|[^\\])\[link\]\(/m);
    expect(md.text).toContain("\\<script>x\\</script>\\_\\[a\\](b)");
    expect(md.text).toContain("\\<img src=x onerror=alert(1)> \\*bold\\* \\[link\\](http://example.invalid) \\| cell");
  });
});
