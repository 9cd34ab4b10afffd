import { describe, expect, it } from "vitest";
import { operatingPointOutput } from "../../contracts/operating-point.js";
import { postTrpc, testApp } from "../helpers/app.js";

const good = {
  stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
  supplyV: "12 V",
  load: { kind: "constant-current", currentA: 3 },
  ambientC: 85,
};

type ErrBody = {
  error: {
    data: { httpStatus: number; backstop: { code: string; issues: { path: (string | number)[]; message: string }[] } };
  };
};

describe("operatingPoint over HTTP (tRPC)", () => {
  const { app, logs } = testApp();

  it("answers a valid request with a solved point that matches the output contract", async () => {
    const r = await postTrpc(app, "operatingPoint", good, { "x-request-id": "req-abc-1" });
    expect(r.status).toBe(200);
    const data = (r.body as { result: { data: unknown } }).result.data;
    const parsed = operatingPointOutput.parse(data);
    expect(parsed.outcome).toBe("solved");
    expect(parsed.modelVersion).toMatch(/\d+\.\d+\.\d+/);
    expect(parsed.caution).toMatch(/verify/);
    expect(r.headers.get("x-request-id")).toBe("req-abc-1");
    expect(logs.some((l) => l.includes('"requestId":"req-abc-1"'))).toBe(true);
  });

  it("also answers GET with the input in the query string", async () => {
    const res = await app.request(`/trpc/operatingPoint?input=${encodeURIComponent(JSON.stringify(good))}`);
    expect(res.status).toBe(200);
  });

  const cases: [string, unknown, (string | number)[]][] = [
    ["missing field", { ...good, supplyV: undefined }, ["supplyV"]],
    [
      "a voltage where amps are due",
      { ...good, load: { kind: "constant-current", currentA: "5 V" } },
      ["load", "currentA"],
    ],
    ["a negative resistance", { ...good, sourceResistanceOhm: -0.1 }, ["sourceResistanceOhm"]],
    ["NaN", { ...good, ambientC: "NaN" }, ["ambientC"]],
    [
      "a string where a number is due",
      {
        ...good,
        stage: {
          kind: "pn-diode",
          diode: { model: "shockley", saturationCurrentA: 1e-9, ideality: "abc", seriesResistanceOhm: 0 },
          reverseRatingV: 100,
          tjMaxC: 150,
          thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
        },
      },
      ["stage", "diode", "ideality"],
    ],
    ["an unknown part id", { ...good, stage: { kind: "catalog-part", partId: "no-such-part" } }, ["stage", "partId"]],
    ["an unknown stage kind", { ...good, stage: { kind: "vacuum-tube" } }, ["stage", "kind"]],
    [
      "points that cannot be fitted",
      {
        ...good,
        stage: {
          kind: "schottky-diode",
          diode: {
            model: "points",
            points: [
              { currentA: 0.1, voltageV: 0.3 },
              { currentA: 1, voltageV: 0.6 },
              { currentA: 10, voltageV: 0.65 },
            ],
          },
          reverseRatingV: 40,
          tjMaxC: 150,
          thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
        },
      },
      ["stage", "diode", "points"],
    ],
  ];
  it.each(cases)("rejects %s with 400 naming the field", async (_what, input, path) => {
    const r = await postTrpc(app, "operatingPoint", input);
    expect(r.status).toBe(400);
    const b = (r.body as ErrBody).error.data.backstop;
    expect(b.issues.map((i) => i.path.join("."))).toContain(path.join("."));
    expect(JSON.stringify(r.body)).not.toMatch(/at .*\.(ts|js):\d+/); // no stack trace
  });

  it("rejects malformed JSON with 400 and keeps serving", async () => {
    const res = await app.request("/trpc/operatingPoint", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{not json",
    });
    expect(res.status).toBe(400);
    expect((await postTrpc(app, "operatingPoint", good)).status).toBe(200);
  });

  it("has a health probe and a JSON 404", async () => {
    expect((await app.request("/healthz")).status).toBe(200);
    expect((await app.request("/nope")).status).toBe(404);
  });
});
