import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { batteryChargeOutput } from "../../contracts/battery-charge.js";
import { holdUpOutput } from "../../contracts/hold-up.js";
import { oringOutput } from "../../contracts/oring.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { postTrpc, testApp } from "../helpers/app.js";

type ErrBody = {
  error: {
    data: { httpStatus: number; backstop: { code: string; issues: { path: (string | number)[]; message: string }[] } };
  };
};
const example = (p: string): Record<string, unknown> =>
  (
    JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", `${p}.json`), "utf8")) as {
      input: Record<string, unknown>;
    }
  ).input;

describe("reverse-current procedures over HTTP (tRPC)", () => {
  const { app } = testApp();
  const outputs = {
    turnOff: turnOffOutput,
    holdUp: holdUpOutput,
    oring: oringOutput,
    batteryCharge: batteryChargeOutput,
  } as const;

  it.each(Object.keys(outputs))("%s answers its example within its output contract", async (proc) => {
    const r = await postTrpc(app, proc, example(proc));
    expect(r.status).toBe(200);
    const data = (r.body as { result: { data: unknown } }).result.data;
    const parsed = outputs[proc as keyof typeof outputs].parse(data);
    expect(parsed.caution).toMatch(/verify/);
  });

  it("turnOff exposes the blocking and avalanche metrics", async () => {
    const r = await postTrpc(app, "turnOff", example("turnOff"));
    const out = turnOffOutput.parse((r.body as { result: { data: unknown } }).result.data);
    if (out.outcome !== "blocks") throw new Error(out.outcome);
    expect(out.metrics.blocksReverseCurrent).toBe(true);
    expect(out.metrics.avalancheEnergyRatio).toBeGreaterThan(0);
    expect(out.assumptions.join(" ")).toMatch(/reverse turn-off timing from the stage controller/);
  });

  const bat = example("batteryCharge") as { source: { ocvPoints: unknown[] } };
  const cases: [string, string, unknown, (string | number)[]][] = [
    [
      "a state-of-charge curve that is not monotonic",
      "batteryCharge",
      {
        ...bat,
        source: {
          ...bat.source,
          ocvPoints: [
            { soc: 0, voltageV: 12.9 },
            { soc: 0.5, voltageV: 13.6 },
            { soc: 1, voltageV: 13.1 },
          ],
        },
      },
      ["source", "ocvPoints", 2, "voltageV"],
    ],
    [
      "SoC points out of order",
      "batteryCharge",
      {
        ...bat,
        source: {
          ...bat.source,
          ocvPoints: [
            { soc: 0.5, voltageV: 12.9 },
            { soc: 0.2, voltageV: 13.6 },
          ],
        },
      },
      ["source", "ocvPoints", 1, "soc"],
    ],
    [
      "a negative capacitance",
      "turnOff",
      { ...example("turnOff"), capacitor: { capacitanceF: "-470 uF", esrOhm: 0.02 } },
      ["capacitor", "capacitanceF"],
    ],
    [
      "a negative hold-up capacitance",
      "holdUp",
      { ...example("holdUp"), capacitor: { capacitanceF: -1e-3, esrOhm: 0.02 } },
      ["capacitor", "capacitanceF"],
    ],
    ["zero sources", "oring", { ...example("oring"), sources: [] }, ["sources"]],
    ["an input that does not fall", "turnOff", { ...example("turnOff"), inputAfterV: "14 V" }, ["inputAfterV"]],
    [
      "a decaying input that starts above the output",
      "turnOff",
      { ...example("turnOff"), inputDecay: { startV: "13 V", timeConstantS: "20 us" } },
      ["inputDecay", "startV"],
    ],
    [
      "a decay without its time constant",
      "turnOff",
      { ...example("turnOff"), inputDecay: { startV: "3 V" } },
      ["inputDecay", "timeConstantS"],
    ],
    [
      "a hold-up input decaying from above the output",
      "holdUp",
      {
        ...example("holdUp"),
        input: { ...(example("holdUp")["input"] as object), inputDecay: { startV: "12 V", timeConstantS: "1 ms" } },
      },
      ["input", "inputDecay", "startV"],
    ],
    [
      "a controller stage without turn-off timing",
      "turnOff",
      { ...example("turnOff"), stage: { kind: "catalog-part", partId: "demo-integrated-ideal-diode-5a-36v" } },
      ["turnOff"],
    ],
    ["a load without its minimum voltage", "turnOff", { ...example("turnOff"), loadMinV: undefined }, ["loadMinV"]],
  ];
  it.each(cases)("rejects %s with 400 naming the field", async (_what, proc, input, path) => {
    const r = await postTrpc(app, proc, input);
    expect(r.status).toBe(400);
    const b = (r.body as ErrBody).error.data.backstop;
    expect(b.issues.map((i) => i.path.join("."))).toContain(path.join("."));
  });
});
