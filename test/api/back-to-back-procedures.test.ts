import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker, processLine } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { demoContext } from "../helpers/app.js";

const PAIR = "demo-back-to-back-40v-2x5mohm";
const invoker = procedureInvoker(demoContext());
const example = (procedure: string): string =>
  readFileSync(join(projectRoot(), "examples", "requests", `${procedure}.json`), "utf8");

async function run(text: string): Promise<Record<string, unknown>> {
  const out = await processLine(JSON.stringify(JSON.parse(text)), 1, invoker);
  if (!out.ok) throw new Error(JSON.stringify(out.error));
  return out.result as Record<string, unknown>;
}

// The back-to-back pair through every procedure that takes a stage; the examples of review,
// holdUp, batteryCharge and sizing.spec carry it already, sizing.catalog walks the whole catalog.
describe("the back-to-back pair in the procedures that take a stage", () => {
  it.each(["operatingPoint", "turnOff", "oring"])("%s answers for it", async (procedure) => {
    const r = await run(example(procedure).replaceAll("demo-ideal-diode-60v-3mohm", PAIR));
    expect(JSON.stringify(r)).toContain("nfet-back-to-back");
  });

  it("the operating point drops 2·I·R(Tj) with the controller's quiescent power apart from the die", async () => {
    const r = (await run(example("operatingPoint").replaceAll("demo-ideal-diode-60v-3mohm", PAIR))) as {
      point: Record<string, number>;
    };
    const p = r.point;
    // both channels: dropV = I·channelResistanceOhm (the pair's 2·R) while no body diode conducts (closed form)
    expect(
      Math.abs((p["dropV"] as number) - (p["currentA"] as number) * (p["channelResistanceOhm"] as number)),
    ).toBeLessThan(1e-6);
    expect(p["controllerLossW"]).toBeCloseTo(60e-6 * (p["stageInputV"] as number), 12);
  });

  it("the review judges it with the pair's rules (input-side FET against the highest input, reverse FET against the pulses)", async () => {
    const r = (await run(example("review"))) as {
      candidates: { stage: { kind: string }; rules: { verdicts: { ruleId: string; outcome: string }[] } }[];
    };
    const c = r.candidates.find((x) => x.stage.kind === "nfet-back-to-back");
    const outcome = (id: string) => c?.rules.verdicts.find((v) => v.ruleId === id)?.outcome;
    expect(outcome("pair-forward-blocking")).toBe("pass");
    expect(outcome("fet-vds-reverse-steady")).toBe("pass");
    // its 40 V FETs see the held output plus the negative pulse: more than 40 V
    expect(outcome("fet-vds-reverse-transient")).toBe("fail");
    expect(outcome("controller-reverse-max")).toBe("pass");
  });
});

describe("the back-to-back pair between two batteries", () => {
  it("does not let the target drain the source (an ideal-diode controller turns both off)", async () => {
    const line = JSON.parse(example("batteryCharge")) as { input: Record<string, unknown> };
    const r = (await run(JSON.stringify({ ...line, input: { ...line.input, ruleSet: "default" } }))) as {
      stages: {
        stage: { kind: string };
        metrics: Record<string, unknown>;
        rules: { verdicts: { ruleId: string; outcome: string }[] };
      }[];
    };
    const pair = r.stages.find((x) => x.stage.kind === "nfet-back-to-back");
    expect(pair?.metrics["targetCanDrainSource"]).toBe(false);
    expect(pair?.rules.verdicts.find((v) => v.ruleId === "battery-back-drain")?.outcome).toBe("pass");
  });
});

describe("operatingPoint in the chatter band at a controller's start threshold", () => {
  it("flags it on the point and says so in the assumptions", async () => {
    // demo ideal diode, start 3.2 V: 4.05 V behind 0.3 Ω into 1 Ω. Running, the input is about
    // 4.05/1.3 = 3.12 V (below start); on the body diode (~0.74 V) about (4.05 + 0.3·0.74)/1.3 = 3.29 V.
    const input = {
      stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" },
      supplyV: 4.05,
      sourceResistanceOhm: 0.3,
      load: { kind: "resistive", resistanceOhm: 1 },
      ambientC: 25,
    };
    const r = (await run(JSON.stringify({ id: "chatter", procedure: "operatingPoint", input }))) as {
      point: { mode: string; startChatter?: { startV: number; runningInputV: number; belowStartInputV: number } };
      assumptions: string[];
    };
    expect(r.point.mode).toBe("body-diode");
    expect(r.point.startChatter?.startV).toBe(3.2);
    expect(r.point.startChatter?.runningInputV).toBeLessThan(3.2);
    expect(r.point.startChatter?.belowStartInputV).toBeGreaterThanOrEqual(3.2);
    expect(r.assumptions.some((a) => a.startsWith("point.startChatter:"))).toBe(true);
    // The flag reaches the rules: start-no-chatter fails at this point, passes a volt higher.
    const ruled = async (supplyV: number) => {
      const o = (await run(
        JSON.stringify({
          id: "chatter",
          procedure: "operatingPoint",
          input: { ...input, supplyV, ruleSet: "default" },
        }),
      )) as { rules: { verdicts: { ruleId: string; outcome: string }[] } };
      return o.rules.verdicts.find((v) => v.ruleId === "start-no-chatter")?.outcome;
    };
    expect(await ruled(4.05)).toBe("fail");
    expect(await ruled(5.05)).toBe("pass");
  });
});
