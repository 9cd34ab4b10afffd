import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { bridgeAcOutput, bridgeDcOutput } from "../../contracts/bridge.js";
import { postTrpc, testApp } from "../helpers/app.js";

const example = (name: string) =>
  (
    JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", `${name}.json`), "utf8")) as {
      input: Record<string, unknown>;
    }
  ).input;

type ErrBody = { error: { data: { backstop: { code: string; issues: { path: (string | number)[] }[] } } } };

describe("bridge procedures over HTTP (tRPC)", () => {
  const { app } = testApp();

  it("bridgeAc: active against diode bridge, with saving, metrics for rules and the caution", async () => {
    const r = await postTrpc(app, "bridgeAc", example("bridgeAc"));
    expect(r.status).toBe(200);
    const out = bridgeAcOutput.parse((r.body as { result: { data: unknown } }).result.data);
    expect(out.caution).toMatch(/verify/);
    expect(out.bridge.outcome).toBe("solved");
    expect(out.compareTo?.outcome).toBe("solved");
    expect(out.saving?.lossSavingW).toBeGreaterThan(0);
    expect(out.saving?.hottestTjReductionK).toBeGreaterThan(0);
    for (const k of [
      "element.line1High.peakRepetitiveCurrentA",
      "element.line2Low.reverseV",
      "element.line1Low.reverseRatingV",
      "capacitor.rippleCurrentRmsA",
      "capacitor.rippleRatingA",
    ]) {
      expect(Number.isFinite(out.metrics[k])).toBe(true);
    }
  });

  it("bridgeDc: both polarities for both bridges", async () => {
    const r = await postTrpc(app, "bridgeDc", example("bridgeDc"));
    expect(r.status).toBe(200);
    const out = bridgeDcOutput.parse((r.body as { result: { data: unknown } }).result.data);
    expect(out.bridge.positive.outcome).toBe("solved");
    expect(out.bridge.negative.outcome).toBe("solved");
    expect(out.saving?.positive?.lossSavingW).toBeGreaterThan(0);
    expect(out.metrics["negative.element.line2High.lossW"]).toBeGreaterThan(0);
  });

  const ac = example("bridgeAc");
  const cases: [string, unknown, (string | number)[]][] = [
    ["zero frequency", { ...ac, frequencyHz: 0 }, ["frequencyHz"]],
    ["a negative capacitance", { ...ac, capacitanceF: "-10 uF" }, ["capacitanceF"]],
    [
      "a stage kind that cannot sit in a bridge",
      { ...ac, bridge: { all: { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" } } },
      ["bridge", "all", "kind"],
    ],
  ];
  it.each(cases)("rejects %s with the field path", async (_name, input, path) => {
    const r = await postTrpc(app, "bridgeAc", input);
    expect(r.status).toBe(400);
    const issues = (r.body as ErrBody).error.data.backstop.issues;
    expect(issues.some((i) => JSON.stringify(i.path) === JSON.stringify(path))).toBe(true);
  });
});
