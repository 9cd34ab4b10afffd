import { describe, expect, it } from "vitest";
import { csvRowToLine } from "../../adapters/batch/formats.js";
import { processLine } from "../../adapters/batch/run-batch.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import { demoContext, testApp } from "../helpers/app.js";
import { exampleInputs } from "../reliability/request-fuzz.js";

/**
 * A table of misspellings, wrong units, wrong shapes and hostile keys, each sent over /v1, /trpc,
 * a batch JSON Lines line and a batch CSV row: every one refused (never 200, never 5xx) with an
 * issue at the exact path whose message says what to type instead.
 */
type Path = (string | number)[];
type Json = Record<string, unknown>;
type Edit = (input: Json) => void;

interface Case {
  readonly name: string;
  readonly procedure: string;
  readonly edit: Edit;
  readonly path: Path;
  readonly hint: RegExp;
}

const examples = exampleInputs();

function nodeAt(root: Json, path: Path): Json {
  let n: unknown = root;
  for (const k of path) n = (n as Record<string | number, unknown>)[k];
  return n as Json;
}
/** Set `value` at `path` (an own property, even for `__proto__`). */
const set =
  (path: Path, value: unknown): Edit =>
  (input) => {
    const parent = nodeAt(input, path.slice(0, -1));
    Object.defineProperty(parent, path.at(-1) as string, {
      value,
      enumerable: true,
      writable: true,
      configurable: true,
    });
  };
const rename =
  (path: Path, to: string): Edit =>
  (input) => {
    const parent = nodeAt(input, path.slice(0, -1));
    const from = path.at(-1) as string;
    const value = parent[from];
    delete parent[from];
    Object.defineProperty(parent, to, { value, enumerable: true, writable: true, configurable: true });
  };
const remove =
  (path: Path): Edit =>
  (input) => {
    delete nodeAt(input, path.slice(0, -1))[path.at(-1) as string];
  };
const both =
  (...edits: Edit[]): Edit =>
  (input) => {
    for (const e of edits) e(input);
  };

const PFET = {
  kind: "pfet-high-side",
  mosfet: {
    rdsOn: [
      { gateSourceV: 4.5, rdsOnOhm: "19 mOhm" },
      { gateSourceV: 10, rdsOnOhm: "12 mOhm" },
    ],
    thresholdV: 2,
    vgsMaxV: 20,
    vdsMaxV: 40,
    tjMaxC: 175,
    bodyDiode: { model: "shockley", saturationCurrentA: "5 nA", ideality: 1.4, seriesResistanceOhm: "15 mOhm" },
  },
  thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
};
const inlinePfet: Edit = (input) => set(["stage"], structuredClone(PFET))(input);
const INLINE_SET = {
  id: "mine",
  version: "1",
  description: "a company set",
  rules: [
    {
      id: "tj",
      title: "Tj",
      appliesTo: "all",
      expression: "tjWorstC <= part.tjMaxC - 25 K",
      severity: "fail",
      source: "common practice",
      rationale: "margin",
    },
  ],
};
const inlineSet: Edit = (input) => set(["ruleSet"], structuredClone(INLINE_SET))(input);
const meant = (name: string) => new RegExp(`did you mean \`${name.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\``);
const NEVER = /never a field/;

const op = (name: string, edit: Edit, path: Path, hint: RegExp): Case => ({
  name,
  procedure: "operatingPoint",
  edit,
  path,
  hint,
});
const CASES: Case[] = [
  // misspelled fields
  op(
    "sourceResistanceOhms",
    rename(["sourceResistanceOhm"], "sourceResistanceOhms"),
    ["sourceResistanceOhms"],
    meant("sourceResistanceOhm"),
  ),
  op("ambientc (case)", rename(["ambientC"], "ambientc"), ["ambientc"], meant("ambientC")),
  op("ambient_C", rename(["ambientC"], "ambient_C"), ["ambient_C"], meant("ambientC")),
  op(
    "supplyVolts (far off: the list)",
    rename(["supplyV"], "supplyVolts"),
    ["supplyVolts"],
    /valid fields here: .*supplyV/,
  ),
  op("thermals", set(["thermals"], { kind: "junction-ambient", rthJaKPerW: 200 }), ["thermals"], meant("thermal")),
  op("load.current", rename(["load", "currentA"], "current"), ["load", "current"], meant("currentA")),
  op("stage.partid", rename(["stage", "partId"], "partid"), ["stage", "partid"], meant("partId")),
  op("ruleSets", set(["ruleSets"], "default"), ["ruleSets"], meant("ruleSet")),
  op("ruleMetric", set(["ruleMetric"], { supplyMinV: 9 }), ["ruleMetric"], meant("ruleMetrics")),
  op(
    "ruleMetrics.supplyMinv",
    set(["ruleMetrics"], { supplyMinv: 9 }),
    ["ruleMetrics", "supplyMinv"],
    meant("supplyMinV"),
  ),
  op(
    "mosfet.rdsOnTemps",
    both(inlinePfet, set(["stage", "mosfet", "rdsOnTemps"], { law: "power", exponent: 2 })),
    ["stage", "mosfet", "rdsOnTemps"],
    meant("rdsOnTemp"),
  ),
  op(
    "mosfet.rdsOn[0].rdsOnOhms",
    both(inlinePfet, rename(["stage", "mosfet", "rdsOn", 0, "rdsOnOhm"], "rdsOnOhms")),
    ["stage", "mosfet", "rdsOn", 0, "rdsOnOhms"],
    meant("rdsOnOhm"),
  ),
  op(
    "mosfet.vdsMax",
    both(inlinePfet, rename(["stage", "mosfet", "vdsMaxV"], "vdsMax")),
    ["stage", "mosfet", "vdsMax"],
    meant("vdsMaxV"),
  ),
  op(
    "bodyDiode.idealty",
    both(inlinePfet, rename(["stage", "mosfet", "bodyDiode", "ideality"], "idealty")),
    ["stage", "mosfet", "bodyDiode", "idealty"],
    meant("ideality"),
  ),
  op(
    "thermal.rthJcKPerW on junction-ambient",
    both(inlinePfet, set(["stage", "thermal", "rthJcKPerW"], 5)),
    ["stage", "thermal", "rthJcKPerW"],
    meant("rthJaKPerW"),
  ),
  op("stage.gateClamp", both(inlinePfet, set(["stage", "gateClamp"], 15)), ["stage", "gateClamp"], meant("gateClampV")),
  // wrong shapes and values
  op(
    "load.kind constant_current",
    set(["load", "kind"], "constant_current"),
    ["load", "kind"],
    /expected one of constant-current, resistive, constant-power/,
  ),
  op("load without kind", set(["load"], { currentA: 3 }), ["load", "kind"], /required: one of constant-current/),
  op("stage.kind pfet", set(["stage"], { kind: "pfet" }), ["stage", "kind"], /expected one of .*pfet-high-side/),
  op(
    "bodyDiode.model spice",
    both(inlinePfet, set(["stage", "mosfet", "bodyDiode", "model"], "spice")),
    ["stage", "mosfet", "bodyDiode", "model"],
    /expected one of shockley, points/,
  ),
  op(
    "thermal.kind junction_ambient",
    both(inlinePfet, set(["stage", "thermal", "kind"], "junction_ambient")),
    ["stage", "thermal", "kind"],
    /expected one of junction-ambient, junction-case-sink/,
  ),
  op("supplyV missing", remove(["supplyV"]), ["supplyV"], /required/),
  op("supplyV true", set(["supplyV"], true), ["supplyV"], /expected a number in V or a string with a unit/),
  op(
    "stage.partId near a known one",
    set(["stage", "partId"], "demo-schottky-5a-45"),
    ["stage", "partId"],
    /did you mean "demo-schottky-5a-45v"/,
  ),
  op(
    "rdsOn not an array",
    both(inlinePfet, set(["stage", "mosfet", "rdsOn"], { gateSourceV: 10, rdsOnOhm: 0.01 })),
    ["stage", "mosfet", "rdsOn"],
    /expected array/,
  ),
  // wrong units and meaningless ranges
  op("ambientC 85 C (coulomb)", set(["ambientC"], "85 C"), ["ambientC"], /coulomb.*type "85 degC"/),
  op("ambientC 85 F (farad)", set(["ambientC"], "85 F"), ["ambientC"], /farad.*type "85 degF"/),
  op("ambientC 1000", set(["ambientC"], 1000), ["ambientC"], /at most 400 degC/),
  op("ambientC 500 degC", set(["ambientC"], "500 degC"), ["ambientC"], /at most 400 degC/),
  op("ambientC -300", set(["ambientC"], -300), ["ambientC"], /greater than -273\.15 degC/),
  op("ambientC 12 V", set(["ambientC"], "12 V"), ["ambientC"], /wrong dimension.*type a value in degC/),
  op(
    "sourceResistanceOhm 20mR",
    set(["sourceResistanceOhm"], "20mR"),
    ["sourceResistanceOhm"],
    /R is not read as ohm; type "20 mohm"/,
  ),
  op("sourceResistanceOhm 4.7R", set(["sourceResistanceOhm"], "4.7 R"), ["sourceResistanceOhm"], /type "4\.7 ohm"/),
  op(
    "sourceResistanceOhm 20 mV",
    set(["sourceResistanceOhm"], "20 mV"),
    ["sourceResistanceOhm"],
    /type a value in ohm/,
  ),
  op("supplyV 12 A", set(["supplyV"], "12 A"), ["supplyV"], /wrong dimension.*such as "1\.5 V"/),
  op("supplyV 12 (no unit)", set(["supplyV"], "12"), ["supplyV"], /no unit.*such as "1\.5 V"/),
  op("supplyV twelve volts", set(["supplyV"], "twelve volts"), ["supplyV"], /cannot read.*such as "1\.5 V"/),
  op("supplyV 12 v (lower case)", set(["supplyV"], "12 v"), ["supplyV"], /such as "1\.5 V"/),
  op("load.currentA -3", set(["load", "currentA"], -3), ["load", "currentA"], /at least 0 A/),
  op(
    "mosfet.tjMaxC 175 C",
    both(inlinePfet, set(["stage", "mosfet", "tjMaxC"], "175 C")),
    ["stage", "mosfet", "tjMaxC"],
    /type "175 degC"/,
  ),
  op(
    "thermal.rthJaKPerW 50 K",
    both(inlinePfet, set(["stage", "thermal", "rthJaKPerW"], "50 K")),
    ["stage", "thermal", "rthJaKPerW"],
    /type a value in K\/W/,
  ),
  // hostile keys
  op("__proto__ at the top", set(["__proto__"], { polluted: "yes" }), ["__proto__"], NEVER),
  op("constructor at the top", set(["constructor"], { prototype: { polluted: "yes" } }), ["constructor"], NEVER),
  op("prototype at the top", set(["prototype"], { polluted: "yes" }), ["prototype"], NEVER),
  op("load.__proto__", set(["load", "__proto__"], { polluted: "yes" }), ["load", "__proto__"], NEVER),
  op("stage.constructor", set(["stage", "constructor"], { polluted: "yes" }), ["stage", "constructor"], NEVER),
  op(
    "ruleMetrics.__proto__",
    set(["ruleMetrics"], JSON.parse('{"__proto__": {"polluted": "yes"}}')),
    ["ruleMetrics", "__proto__"],
    NEVER,
  ),
  op(
    "mosfet.__proto__",
    both(inlinePfet, set(["stage", "mosfet", "__proto__"], { polluted: "yes" })),
    ["stage", "mosfet", "__proto__"],
    NEVER,
  ),
  // rules.evaluate, rules.show, rules.list
  {
    name: "metrics.tjWorstc",
    procedure: "rules.evaluate",
    edit: rename(["metrics", "tjWorstC"], "tjWorstc"),
    path: ["metrics", "tjWorstc"],
    hint: meant("tjWorstC"),
  },
  {
    name: "part.tjmaxC",
    procedure: "rules.evaluate",
    edit: rename(["part", "tjMaxC"], "tjmaxC"),
    path: ["part", "tjmaxC"],
    hint: meant("tjMaxC"),
  },
  {
    name: "metric (for metrics)",
    procedure: "rules.evaluate",
    edit: rename(["metrics"], "metric"),
    path: ["metric"],
    hint: meant("metrics"),
  },
  {
    name: "metrics value 150 degC",
    procedure: "rules.evaluate",
    edit: set(["metrics", "tjWorstC"], "150 degC"),
    path: ["metrics", "tjWorstC"],
    hint: /expected a number in the metric's unit/,
  },
  {
    name: "stageKind nfet",
    procedure: "rules.evaluate",
    edit: set(["stageKind"], "nfet"),
    path: ["stageKind"],
    hint: /expected one of .*nfet-ideal-diode/,
  },
  {
    name: "ruleSet vehicel",
    procedure: "rules.evaluate",
    edit: set(["ruleSet"], "vehicel"),
    path: ["ruleSet"],
    hint: /vehicle/,
  },
  {
    name: "inline set: severity error",
    procedure: "rules.evaluate",
    edit: both(inlineSet, set(["ruleSet", "rules", 0, "severity"], "error")),
    path: ["ruleSet", "rules", 0, "severity"],
    hint: /expected one of fail, warn \(got "error"\)/,
  },
  {
    name: "inline set: no description",
    procedure: "rules.evaluate",
    edit: both(inlineSet, remove(["ruleSet", "description"])),
    path: ["ruleSet", "description"],
    hint: /required/,
  },
  {
    name: "inline set: severty",
    procedure: "rules.evaluate",
    edit: both(inlineSet, rename(["ruleSet", "rules", 0, "severity"], "severty")),
    path: ["ruleSet", "rules", 0, "severty"],
    hint: meant("severity"),
  },
  {
    name: "inline set: rule __proto__",
    procedure: "rules.evaluate",
    edit: both(inlineSet, set(["ruleSet", "rules", 0, "__proto__"], { polluted: "yes" })),
    path: ["ruleSet", "rules", 0, "__proto__"],
    hint: NEVER,
  },
  {
    name: "metrics.__proto__",
    procedure: "rules.evaluate",
    edit: set(["metrics", "__proto__"], { polluted: "yes" }),
    path: ["metrics", "__proto__"],
    hint: NEVER,
  },
  { name: "ids (for id)", procedure: "rules.show", edit: rename(["id"], "ids"), path: ["ids"], hint: meant("id") },
  {
    name: "rules.list with a stray key",
    procedure: "rules.list",
    edit: set(["verbose"], true),
    path: ["verbose"],
    hint: /unknown field `verbose`/,
  },
  // turnOff
  {
    name: "loop.inductanceHenry",
    procedure: "turnOff",
    edit: rename(["loop", "inductanceH"], "inductanceHenry"),
    path: ["loop", "inductanceHenry"],
    hint: meant("inductanceH"),
  },
  {
    name: "capacitor.esr",
    procedure: "turnOff",
    edit: rename(["capacitor", "esrOhm"], "esr"),
    path: ["capacitor", "esr"],
    hint: /valid fields here: .*esrOhm/,
  },
  { name: "tjC 85 C", procedure: "turnOff", edit: set(["tjC"], "85 C"), path: ["tjC"], hint: /type "85 degC"/ },
  {
    name: "avalancheRatingJ 50 mA",
    procedure: "turnOff",
    edit: set(["avalancheRatingJ"], "50 mA"),
    path: ["avalancheRatingJ"],
    hint: /type a value in J/,
  },
  // review
  {
    name: "supply.class vehicle-12v",
    procedure: "review",
    edit: set(["requirement", "supply", "class"], "vehicle-12v"),
    path: ["requirement", "supply", "class"],
    hint: /did you mean "vehicle-12v-[ab]"\?.*known: .*custom/,
  },
  {
    name: "supply.clas",
    procedure: "review",
    edit: rename(["requirement", "supply", "class"], "clas"),
    path: ["requirement", "supply", "clas"],
    hint: meant("class"),
  },
  {
    name: "ambient.max",
    procedure: "review",
    edit: rename(["requirement", "ambient", "maxC"], "max"),
    path: ["requirement", "ambient", "max"],
    hint: meant("maxC"),
  },
  {
    name: "ambient.maxC 500",
    procedure: "review",
    edit: set(["requirement", "ambient", "maxC"], 500),
    path: ["requirement", "ambient", "maxC"],
    hint: /at most 400 degC/,
  },
  {
    name: "transients: unknown id",
    procedure: "review",
    edit: set(["requirement", "transients"], ["no-such-pulse"]),
    path: ["requirement", "transients", 0],
    hint: /no built-in transient "no-such-pulse".*known: /,
  },
  {
    name: "datasheetMax.rdsOnFactr",
    procedure: "review",
    edit: rename(["candidates", 0, "datasheetMax", "rdsOnFactor"], "rdsOnFactr"),
    path: ["candidates", 0, "datasheetMax", "rdsOnFactr"],
    hint: meant("rdsOnFactor"),
  },
  {
    name: "turnOff.loop.resistanceOhms",
    procedure: "review",
    edit: rename(["requirement", "turnOff", "loop", "resistanceOhm"], "resistanceOhms"),
    path: ["requirement", "turnOff", "loop", "resistanceOhms"],
    hint: meant("resistanceOhm"),
  },
  {
    name: "mission[0].ambientC 40 C",
    procedure: "review",
    edit: set(["requirement", "mission", 0, "ambientC"], "40 C"),
    path: ["requirement", "mission", 0, "ambientC"],
    hint: /type "40 degC"/,
  },
  {
    name: "candidates[0].stage.__proto__",
    procedure: "review",
    edit: set(["candidates", 0, "stage", "__proto__"], { polluted: "yes" }),
    path: ["candidates", 0, "stage", "__proto__"],
    hint: NEVER,
  },
  // one misspelling in each other procedure
  ...(["holdUp", "oring", "bridgeDc", "bridgeAc", "batteryCharge", "sizing.spec", "sizing.catalog"] as const).map(
    (procedure): Case => {
      const key = Object.keys(examples.get(procedure) as Json)[0] as string;
      return { name: `${key}s`, procedure, edit: rename([key], `${key}s`), path: [`${key}s`], hint: meant(key) };
    },
  ),
];

const inputOf = (c: Case): Json => {
  const input = structuredClone((examples.get(c.procedure) ?? {}) as Json);
  c.edit(input);
  return input;
};

/** The issue at `path`, or a failure naming what came instead. */
function expectIssue(body: ErrorBody | undefined, c: Case, surface: string): void {
  const issues = body?.issues ?? [];
  const at = issues.find((i) => JSON.stringify(i.path) === JSON.stringify(c.path));
  expect(at, `${surface} ${c.name}: no issue at ${JSON.stringify(c.path)} in ${JSON.stringify(body)}`).toBeDefined();
  expect(at?.message, `${surface} ${c.name}`).toMatch(c.hint);
}

/** A JSON input as CSV columns (dotted paths, array indexes as segments) and cells. */
function flatten(v: unknown, prefix: string, out: [string, string][]): void {
  if (Array.isArray(v) && v.length > 0) for (const [i, x] of v.entries()) flatten(x, `${prefix}.${i}`, out);
  else if (typeof v === "object" && v !== null && !Array.isArray(v) && Object.keys(v).length > 0)
    for (const k of Object.keys(v)) flatten((v as Json)[k], prefix ? `${prefix}.${k}` : k, out);
  else if (typeof v === "string")
    out.push([
      prefix,
      /^[{["]/.test(v) || /^-?\d/.test(v) || v === "true" || v === "false" || v === "" ? JSON.stringify(v) : v,
    ]);
  else out.push([prefix, typeof v === "object" ? JSON.stringify(v) : String(v)]);
}

describe("refused with the exact path and a hint, on every surface", () => {
  const { app } = testApp();
  const invoker = procedureInvoker(demoContext());

  it("the table holds at least 60 cases", () => {
    expect(CASES.length).toBeGreaterThanOrEqual(60);
  });

  it.each(CASES.map((c) => [`${c.procedure}: ${c.name}`, c] as const))("%s", async (_label, c) => {
    const input = inputOf(c);
    const body = JSON.stringify(input);
    for (const surface of ["v1", "trpc"] as const) {
      const res = await app.request(`/${surface}/${c.procedure}`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body,
      });
      expect(res.status, `${surface} ${c.name}`).toBeGreaterThanOrEqual(400);
      expect(res.status, `${surface} ${c.name}`).toBeLessThan(500);
      const json = (await res.json()) as ErrorBody & { error?: { data?: { backstop?: ErrorBody } } };
      expectIssue(surface === "v1" ? json : json.error?.data?.backstop, c, surface);
    }
    const line = await processLine(`{"id":"c","procedure":${JSON.stringify(c.procedure)},"input":${body}}`, 1, invoker);
    expect(line.ok).toBe(false);
    if (!line.ok) {
      expect(line.error.code).not.toBe("internal");
      expectIssue(line.error, c, "jsonl");
    }
    const cols: [string, string][] = [];
    flatten(JSON.parse(body), "", cols);
    const row = csvRowToLine(["id", ...cols.map(([k]) => k)], ["c", ...cols.map(([, v]) => v)], c.procedure);
    const csv = "raw" in row ? await processLine(row.raw, 1, invoker) : { ok: false as const, error: row.error };
    expect(csv.ok, `csv ${c.name}`).toBe(false);
    if (!csv.ok) {
      expect(csv.error.code).not.toBe("internal");
      expectIssue(csv.error, c, "csv");
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it.each([
    ["inputs for input", `{"id":1,"procedure":"rules.list","inputs":{}}`, ["inputs"], meant("input")],
    ["procedur for procedure", `{"id":1,"procedur":"rules.list","input":{}}`, ["procedur"], meant("procedure")],
    [
      "a __proto__ key in the line",
      `{"id":1,"procedure":"rules.list","input":{},"__proto__":{"polluted":"yes"}}`,
      ["__proto__"],
      NEVER,
    ],
  ] as const)("a batch line with %s", async (_name, raw, path, hint) => {
    const out = await processLine(raw, 1, invoker);
    expect(out.ok).toBe(false);
    if (!out.ok)
      expectIssue(out.error, { name: raw, procedure: "", edit: () => undefined, path: [...path], hint }, "jsonl");
  });

  it("a tRPC batch over the limit says the limit", async () => {
    const calls = Array.from({ length: 101 }, () => "rules.list").join(",");
    const res = await app.request(`/trpc/${calls}?batch=1`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{}",
    });
    expect(res.status).toBe(400);
    const text = await res.text();
    expect(text).toMatch(/at most 100 calls/);
  });
});
