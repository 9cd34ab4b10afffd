import { readFileSync } from "node:fs";
import { join } from "node:path";
import { PassThrough, Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { type BatchOutputLine, runBatch } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { demoContext, testApp } from "../helpers/app.js";
import { KNOWN_BAD } from "./designs.js";

// The cases a new user met with the built-in sets, each of which passed a design that a computed
// figure showed destroyed or short of its requirement; now each fails (or says it misses the
// requirement) through /trpc, /v1 and the batch alike.

const design = (id: string) => {
  const d = KNOWN_BAD.find((x) => x.id === id);
  if (d === undefined) throw new Error(`no design ${id}`);
  return d.bad;
};
const both = design("clamp-5j-under-load-dump-a") as { requirement: Record<string, unknown>; candidates: unknown[] };
const REVIEWS: readonly { readonly id: string; readonly rule: string; readonly input: Record<string, unknown> }[] = [
  {
    id: "schottky-10a-60v-at-125c-under-28v-reverse",
    rule: "reverse-leakage-runaway",
    input: design("schottky-reverse-runaway"),
  },
  {
    id: "ideal-diode-clamp-5j-30a-load-dump-a",
    rule: "clamp-energy",
    input: {
      ...both,
      requirement: { ...both.requirement, transients: ["iso16750-2-load-dump-a-12v", "iso7637-2-pulse-2a"] },
    },
  },
  {
    id: "ideal-diode-clamp-5j-30a-pulse-2a",
    rule: "clamp-peak-current",
    input: {
      ...both,
      requirement: { ...both.requirement, transients: ["iso16750-2-load-dump-a-12v", "iso7637-2-pulse-2a"] },
    },
  },
  {
    id: "controller-pin-20v-under-28v-reverse",
    rule: "controller-reverse-max",
    input: design("controller-pin-20v-reverse"),
  },
  {
    id: "start-voltage-above-start-profile-bottom",
    rule: "start-at-profile-minimum",
    input: design("controller-start-above-crank-bottom"),
  },
  {
    id: "ideal-diode-0.5mj-within-eas-at-25c-not-at-150c",
    rule: "avalanche-energy",
    input: design("ideal-diode-avalanche-energy-hot-start"),
  },
  {
    id: "ideal-diode-repeating-0.5mj-over-0.3mj-ear",
    rule: "avalanche-energy-repetitive",
    input: design("ideal-diode-repetitive-avalanche-energy"),
  },
  {
    id: "ideal-diode-57v-pulse-1-over-cold-breakdown",
    rule: "fet-vds-reverse-transient-cold",
    input: design("ideal-diode-vds-breakdown-cold"),
  },
  {
    id: "ideal-diode-full-on-into-2200uF-over-tj-max",
    rule: "inrush-tj",
    input: design("inrush-uncontrolled-into-2200uF"),
  },
  {
    id: "ideal-diode-slew-2.2a-at-16v-outside-soa",
    rule: "inrush-soa",
    input: design("inrush-slew-outside-soa"),
  },
  {
    id: "switch-thermal-shutdown-before-4700uF-charged",
    rule: "inrush-completes",
    input: design("inrush-current-limit-thermal-shutdown"),
  },
  {
    id: "switch-shuts-down-charging-470uF-at-the-24v-jump-start",
    rule: "inrush-completes",
    input: design("inrush-at-jump-start-thermal-shutdown"),
  },
  {
    id: "switch-4.5a-limit-ahead-of-30w-converter-starting-at-6v",
    rule: "inrush-completes",
    input: design("inrush-converter-stalls-at-its-start"),
  },
  {
    id: "back-to-back-pair-at-2a-limit-outside-soa-at-24v",
    rule: "inrush-soa",
    input: design("inrush-pair-limit-outside-soa"),
  },
  {
    id: "switch-cut-off-15v-inside-16v-supply",
    rule: "switch-cutoff-above-supply",
    input: design("switch-cutoff-inside-supply-range"),
  },
  {
    id: "switch-6a-limit-ahead-of-8a-load",
    rule: "switch-current-limit-above-load",
    input: design("switch-current-limit-below-load"),
  },
  {
    id: "switch-without-cut-off-passes-35v-to-32v-load",
    rule: "load-overvoltage",
    input: design("load-dump-reaches-the-load"),
  },
];
const HOLD_UP = (
  JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "holdUp.json"), "utf8")) as {
    input: Record<string, unknown>;
  }
).input;

type Review = { candidates: { verdict: string; rules: { verdicts: { ruleId: string; outcome: string }[] } }[] };
type HoldUp = {
  stages: {
    result: { outcome: string };
    meetsRequirement?: boolean;
    requirementReason?: string;
    rules?: { verdicts: { ruleId: string; outcome: string }[] };
  }[];
};

const { app } = testApp();
const post = (url: string, body: unknown) =>
  app.request(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
async function viaTrpc(procedure: string, input: unknown): Promise<unknown> {
  return ((await (await post(`/trpc/${procedure}`, input)).json()) as { result: { data: unknown } }).result.data;
}
async function viaV1(procedure: string, input: unknown): Promise<unknown> {
  return (await post(`/v1/${procedure}`, input)).json();
}
async function viaBatch(procedure: string, input: unknown): Promise<unknown> {
  const sink = new PassThrough();
  const chunks: string[] = [];
  sink.on("data", (c) => chunks.push(String(c)));
  await runBatch(Readable.from([JSON.stringify({ id: "x", procedure, input })]), sink, demoContext());
  const line = JSON.parse(chunks.join("").trim()) as BatchOutputLine;
  if (!line.ok) throw new Error(JSON.stringify(line.error));
  return line.result;
}
const ADAPTERS = [
  ["/trpc", viaTrpc],
  ["/v1", viaV1],
  ["batch", viaBatch],
] as const;

describe.each(ADAPTERS)("the new user's cases through %s", (_name, call) => {
  it.each(REVIEWS.map((c) => [c.id, c] as const))("%s: fail, on its rule, under every built-in set", async (_id, c) => {
    for (const ruleSet of ["default", "vehicle", "consumer"]) {
      const out = (await call("review", { ...c.input, ruleSet })) as Review;
      const cand = out.candidates[0];
      expect(cand?.verdict, ruleSet).toBe("fail");
      expect(cand?.rules.verdicts.find((v) => v.ruleId === c.rule)?.outcome, `${ruleSet}: ${c.rule}`).toBe("fail");
    }
  });
  it("holdUp (the shipped example): a stage that holds but fails the required 2 ms says it misses the requirement", async () => {
    const out = (await call("holdUp", HOLD_UP)) as HoldUp;
    let short = 0;
    for (const s of out.stages) {
      const rule = s.rules?.verdicts.find((v) => v.ruleId === "hold-up-time");
      expect(s.meetsRequirement, s.requirementReason).toBe(rule?.outcome === "pass");
      if (s.meetsRequirement === false) {
        short += 1;
        expect(s.requirementReason).toMatch(/ < required 2 ms: the requirement is not met$/);
      }
    }
    expect(short).toBeGreaterThan(0);
  });
});
