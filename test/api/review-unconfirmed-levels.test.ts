import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { reviewOutput } from "../../contracts/review.js";
import { TRANSIENT_LIBRARY } from "../../domain/review/transient-library.js";
import { demoContext } from "../helpers/app.js";

// A built-in pulse whose level is not confirmed for the edition in force (ISO 7637-2:2011's 24 V levels,
// docs/references.md "Built-in values", status M) may be milder than the test a release is judged against:
// the review says so in its assumptions, pulse by pulse, and a confirmed pulse says nothing.
const review = procedureInvoker(demoContext())("review");
const example = JSON.parse(readFileSync(join(projectRoot(), "examples/requests/review.json"), "utf8")).input;

async function assumptionsFor(supplyClass: string, transients: string[]) {
  if (review === undefined) throw new Error("review missing");
  const { startProfile: _omit, ...requirement } = example.requirement;
  const r = reviewOutput.parse(
    await review({
      requirement: { ...requirement, supply: { class: supplyClass }, transients },
      candidates: [example.candidates[0]],
    }),
  );
  return r.assumptions.filter((a) => a.startsWith("level unconfirmed"));
}

describe("the review flags a built-in pulse level that is not confirmed", () => {
  it("24 V pulses 3a/3b (the 2004 edition's level IV, the 2011 level unconfirmed) each carry the flag", async () => {
    const got = await assumptionsFor("vehicle-24v-h", ["iso7637-2-pulse-3a-24v", "iso7637-2-pulse-3b-24v"]);
    expect(got).toHaveLength(2);
    expect(got[0]).toContain("iso7637-2-pulse-3a-24v: −200 V");
    expect(got[1]).toContain("iso7637-2-pulse-3b-24v: +200 V");
    for (const a of got) expect(a).toContain("may be milder");
  });

  it("the confirmed 12 V level IV pulses 3a/3b carry none", async () => {
    expect(await assumptionsFor("vehicle-12v-b", ["iso7637-2-pulse-3a-12v", "iso7637-2-pulse-3b-12v"])).toEqual([]);
  });

  it("the flag follows the library: every flagged pulse, and only those, is named", async () => {
    const flagged = TRANSIENT_LIBRARY.filter((t) => t.unconfirmed !== undefined).map((t) => t.id);
    expect(flagged.sort()).toEqual(
      [
        "iso7637-2-pulse-1-24v",
        "iso7637-2-pulse-2a",
        "iso7637-2-pulse-2b-24v",
        "iso7637-2-pulse-3a-24v",
        "iso7637-2-pulse-3b-24v",
      ].sort(),
    );
    for (const t of TRANSIENT_LIBRARY) expect(t.title.includes("unconfirmed")).toBe(t.unconfirmed !== undefined);
    const got = await assumptionsFor("vehicle-24v-h", [
      "iso7637-2-pulse-1-24v",
      "iso7637-2-pulse-2a",
      "iso7637-2-pulse-2b-24v",
    ]);
    expect(got.map((a) => a.split(":")[0])).toEqual([
      "level unconfirmed, iso7637-2-pulse-1-24v",
      "level unconfirmed, iso7637-2-pulse-2a",
      "level unconfirmed, iso7637-2-pulse-2b-24v",
    ]);
  });
});
