import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Element } from "@xmldom/xmldom";
import { beforeAll, describe, expect, it } from "vitest";
import { procedureInvoker } from "../../../adapters/batch/run-batch.js";
import { projectRoot } from "../../../adapters/project-root.js";
import { bridgeCharts, renderBridgeAcReport } from "../../../adapters/report/bridge-report.js";
import { type BridgeAcOutput, bridgeAcOutput } from "../../../contracts/bridge.js";
import { demoContext } from "../../helpers/app.js";
import { axisScales, byClass, parseSvg, pathPoints } from "../../helpers/svg-readback.js";

const POSITIONS = ["line1High", "line2High", "line1Low", "line2Low"] as const;

describe("AC bridge report", () => {
  let result: BridgeAcOutput;
  let id: string;
  beforeAll(async () => {
    const line = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "bridgeAc.json"), "utf8")) as {
      id: string;
      input: object;
    };
    id = line.id;
    const invoke = procedureInvoker(demoContext())("bridgeAc");
    if (invoke === undefined) throw new Error("bridgeAc missing");
    result = bridgeAcOutput.parse(await invoke({ ...line.input, waveform: true }));
  });

  it("draws each element's current and the voltages over one period: points read back to the result's waveform", () => {
    let checked = 0;
    for (const which of ["bridge", "compareTo"] as const) {
      const o = result[which];
      if (o === undefined || !("steadyState" in o)) throw new Error(`${which} has no steady state`);
      const s = o.steadyState;
      const w = s.waveform;
      if (w === undefined) throw new Error("no waveform");
      const charts = bridgeCharts(s, which, "t");
      expect(charts.map((c) => c.kind)).toEqual(["element-current", "voltages"]);
      for (const chart of charts) {
        const svg = parseSvg(chart.svg).documentElement as Element;
        const unit = /\((µs|ms|s)\)$/.exec(byClass(svg, "x-label")[0]?.textContent ?? "")?.[1];
        const f = unit === "µs" ? 1e6 : unit === "ms" ? 1e3 : 1;
        expect(byClass(svg, "y-label")[0]?.textContent).toMatch(/\((A|V)\)$/);
        const want = new Map<string, readonly number[]>(
          chart.kind === "element-current"
            ? POSITIONS.map((p) => [p, w.elementCurrentA[p]])
            : [
                ["source", w.sourceV],
                ["output", w.outputV],
              ],
        );
        const { x, y } = axisScales(svg);
        const groups = byClass(svg, "series");
        expect(groups.map((g) => g.getAttribute("data-series"))).toEqual([...want.keys()]);
        for (const g of groups) {
          const ys = want.get(g.getAttribute("data-series") ?? "") ?? [];
          const got = pathPoints(g.getElementsByTagName("path")[0]?.getAttribute("d") ?? "");
          expect(got).toHaveLength(w.timeS.length);
          got.forEach(([px, py], k) => {
            expect(Math.abs(x.invert(px) - (w.timeS[k] ?? 0) * f)).toBeLessThanOrEqual(2e-3 * x.perPx + 1e-12);
            expect(Math.abs(y.invert(py) - (ys[k] ?? 0))).toBeLessThanOrEqual(2e-3 * y.perPx + 1e-12);
            checked += 1;
          });
        }
        // Greyscale: dash pattern and marker differ per series.
        const dashes = groups.map(
          (g) => g.getElementsByTagName("path")[0]?.getAttribute("stroke-dasharray") ?? "solid",
        );
        expect(new Set(dashes).size).toBe(dashes.length);
        if (chart.kind === "element-current") {
          // The marks are the reported peak currents, drawn at their sample.
          const marks = byClass(svg, "mark").map((m) => Number(m.getAttribute("data-y")));
          expect(marks).toEqual(s.elements.slice(0, 2).map((e) => e.peakCurrentA));
        }
      }
    }
    expect(checked).toBeGreaterThan(500);
  });

  it("page: caution, versions, the per-element table and the verdicts (failing first); deterministic, self-contained", () => {
    const a = renderBridgeAcReport(result, { id });
    expect(renderBridgeAcReport(result, { id }).html).toBe(a.html);
    expect(a.svgs).toHaveLength(4);
    for (const s of a.svgs) expect(s.svg).not.toMatch(/NaN|Infinity|undefined/);
    expect(a.markdown).toContain(result.caution);
    expect(a.markdown).toContain(`model version ${result.modelVersion}`);
    const rules = result.rules;
    if (rules === undefined) throw new Error("the example asks for the default rules");
    expect(a.markdown).toContain(`rule set ${rules.ruleSet.id} version ${rules.ruleSet.version}`);
    const o = result.bridge;
    if (!("steadyState" in o)) throw new Error(o.outcome);
    for (const e of o.steadyState.elements)
      expect(a.markdown).toMatch(new RegExp(`^\\| ${e.position} \\| ${e.mode} \\|`, "m"));
    const rows =
      a.markdown
        .split("## Compared")[0]
        ?.split("\n")
        .filter((l) => /^\| [a-z-]+ \| (\*\*)?(FAIL|WARN|PASS|n\/a)/.test(l)) ?? [];
    const order = (r: string) => (r.includes("**FAIL**") ? 0 : r.includes("**WARN**") ? 1 : 2);
    expect(rows.length).toBe(rules.verdicts.length);
    expect(rows.map(order)).toEqual([...rows.map(order)].sort((p, q) => p - q));
    expect(a.html).not.toMatch(/<script|<link|<img|src=|url\(/i);
  });
});
