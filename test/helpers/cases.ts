import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { projectRoot } from "../../adapters/project-root.js";

/** One case of the shared suite: a procedure and an input (valid or not). */
export interface Case {
  readonly id: string;
  readonly procedure: string;
  readonly input: unknown;
}

const op = {
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: 2 },
  ambientC: 25,
};

/** Every example request (so new procedures join automatically) plus cases that exercise errors and outcomes. */
export function sharedCases(): Case[] {
  const dir = join(projectRoot(), "examples", "requests");
  const examples = readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as Case);
  return [
    ...examples,
    {
      id: "op-resistive",
      procedure: "operatingPoint",
      input: { ...op, load: { kind: "resistive", resistanceOhm: "6 ohm" } },
    },
    {
      id: "op-hot-collapse",
      procedure: "operatingPoint",
      input: { ...op, supplyV: "5 V", load: { kind: "constant-power", powerW: 200, minVoltageV: 3 } },
    },
    {
      id: "op-wrong-unit",
      procedure: "operatingPoint",
      input: { ...op, load: { kind: "constant-current", currentA: "5 V" } },
    },
    {
      id: "op-unknown-part",
      procedure: "operatingPoint",
      input: { ...op, stage: { kind: "catalog-part", partId: "no-such-part" } },
    },
    { id: "op-missing-field", procedure: "operatingPoint", input: { ...op, supplyV: undefined } },
  ];
}

/** What every adapter must agree on: the result, or the error code and its field paths. */
export type Answer = { ok: true; result: unknown } | { ok: false; code: string; paths: string[] };
export const errorAnswer = (e: { code: string; issues: { path: (string | number)[] }[] }): Answer => ({
  ok: false,
  code: e.code,
  paths: e.issues.map((i) => i.path.join(".")).sort(),
});
