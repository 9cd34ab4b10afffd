import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Element } from "@xmldom/xmldom";
import { beforeAll, describe, expect, it } from "vitest";
import { procedureInvoker } from "../../../adapters/batch/run-batch.js";
import { projectRoot } from "../../../adapters/project-root.js";
import { candidateCharts } from "../../../adapters/report/review-charts.js";
import { renderReviewReport } from "../../../adapters/report/review-report.js";
import { type ReviewOutput, reviewOutput } from "../../../contracts/review.js";
import { demoContext } from "../../helpers/app.js";
import { axisScales, byClass, parseSvg, pathPoints } from "../../helpers/svg-readback.js";

type Cand = ReviewOutput["candidates"][number];
const invoke = procedureInvoker(demoContext())("review");
async function review(input: unknown): Promise<ReviewOutput> {
  if (invoke === undefined) throw new Error("review procedure missing");
  // Reports ask the review for its sweeps.
  return reviewOutput.parse(await invoke({ ...(input as object), curves: true }));
}

/** The report writes a true minus sign. */
const minus = (v: number) => String(v).replace("-", "−");

/** What each chart must show, computed here from the review result without the renderer. */
function expectedSeries(c: Cand, kind: string, xUnit = "s"): Map<string, [number, number][]> {
  const stable = (o: string) => o === "solved" || o === "over-temperature";
  const curves = c.curves;
  if (curves === undefined) throw new Error("the review was asked for curves");
  const load = (y: (r: NonNullable<Cand["curves"]>["load"][number]) => number | undefined) =>
    curves.load
      .filter((r) => stable(r.outcome) && r.currentA !== undefined && y(r) !== undefined)
      .map((r) => [r.currentA ?? 0, y(r) ?? 0] as [number, number]);
  const profiles = c.startUp.profiles;
  switch (kind) {
    case "drop-vs-current":
      return new Map([["drop", load((r) => r.dropV)]]);
    case "loss-vs-current":
      return new Map([["loss", load((r) => r.lossW)]]);
    case "tj-vs-current":
      return new Map([["Tj", load((r) => r.tjC)]]);
    case "tj-vs-ambient":
      return new Map([
        [
          "Tj",
          curves.ambient.filter((r) => stable(r.outcome)).map((r) => [r.ambientC, r.tjC ?? 0] as [number, number]),
        ],
      ]);
    case "startup-voltage":
      return new Map([
        ["supply", (profiles[0]?.result.samples ?? []).map((s) => [s.timeS, s.supplyV] as [number, number])],
        ...profiles.map(
          (p) =>
            [
              `load, ${minus(p.ambientC)} °C`,
              (p.result.samples ?? []).map((s) => [s.timeS, s.loadV] as [number, number]),
            ] as [string, [number, number][]],
        ),
      ]);
    case "startup-tj":
      return new Map(
        profiles.map(
          (p) =>
            [
              `Tj, ${minus(p.ambientC)} °C`,
              (p.result.samples ?? []).map((s) => [s.timeS, s.tjC] as [number, number]),
            ] as [string, [number, number][]],
        ),
      );
    case "turnoff-current": {
      const e = c.turnOff?.event;
      const w = e && "waveform" in e ? e.waveform : undefined;
      if (w === undefined) throw new Error("no turn-off waveform");
      // The x axis is in the unit its label names: µs, ms or s.
      const f = xUnit === "µs" ? 1e6 : xUnit === "ms" ? 1e3 : 1;
      return new Map([["reverse current", w.timeS.map((t, k) => [t * f, -(w.currentA[k] ?? 0)] as [number, number])]]);
    }
    default:
      throw new Error(`unknown chart ${kind}`);
  }
}

const LIMIT_METRIC: Record<string, string> = {
  "drop-vs-current": "dropWorstV",
  "loss-vs-current": "lossWorstW",
  "tj-vs-current": "tjWorstC",
  "tj-vs-ambient": "tjWorstC",
  "startup-voltage": "loadVMinV",
  "startup-tj": "tjWorstC",
  "turnoff-current": "peakReverseCurrentA",
};

describe("design-review report", () => {
  let result: ReviewOutput;
  let id: string;
  beforeAll(async () => {
    const line = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
      id: string;
      input: unknown;
    };
    id = line.id;
    result = await review(line.input);
  });

  it("every SVG parses as XML, standalone, with axis labels that carry units", () => {
    const rep = renderReviewReport(result, { id });
    // Seven charts per candidate: three against current, Tj against ambient, two of the start-up
    // profile, the turn-off reverse current (the example has a turn-off section).
    expect(rep.svgs).toHaveLength(7 * result.candidates.length);
    for (const s of rep.svgs) {
      const svg = parseSvg(s.svg).documentElement;
      if (!svg) throw new Error("empty SVG");
      expect(svg.getAttribute("xmlns")).toBe("http://www.w3.org/2000/svg");
      for (const cls of ["x-label", "y-label"])
        expect(byClass(svg, cls)[0]?.textContent).toMatch(/\((A|V|W|°C|s|ms|µs)\)$/);
      expect(s.svg).not.toMatch(/NaN|Infinity|undefined/);
    }
  });

  it("each chart's plotted points, limits and marks read back through the axis scale to the numbers in the result", () => {
    let checked = 0;
    for (const c of result.candidates) {
      for (const chart of candidateCharts(c)) {
        const svg = parseSvg(chart.svg).documentElement;
        if (!svg) throw new Error("empty SVG");
        const { x, y } = axisScales(svg);
        const expected = expectedSeries(
          c,
          chart.kind,
          /\((\w+|µs)\)$/.exec(byClass(svg, "x-label")[0]?.textContent ?? "")?.[1],
        );
        const groups = byClass(svg, "series");
        expect(groups.map((g) => g.getAttribute("data-series"))).toEqual([...expected.keys()]);
        for (const g of groups) {
          const want = expected.get(g.getAttribute("data-series") ?? "") ?? [];
          const got = pathPoints(g.getElementsByTagName("path")[0]?.getAttribute("d") ?? "");
          expect(got).toHaveLength(want.length);
          // Coordinates are written to 1e-3 px; tick positions too: 2e-3 px of either axis's scale.
          got.forEach(([px, py], i) => {
            const [wx, wy] = want[i] ?? [Number.NaN, Number.NaN];
            expect(Math.abs(x.invert(px) - wx)).toBeLessThanOrEqual(2e-3 * x.perPx + 1e-12);
            expect(Math.abs(y.invert(py) - wy)).toBeLessThanOrEqual(2e-3 * y.perPx + 1e-12);
            checked += 1;
          });
        }
        // Limits: the thresholds of the applied rules on this chart's metric, drawn where they are.
        const lhs = new RegExp(`^\\s*${LIMIT_METRIC[chart.kind]}\\s*(<=|>=|<|>)`);
        const thresholds = c.rules.verdicts
          .filter((v) => v.outcome !== "not-applicable" && v.threshold !== null && lhs.test(v.expression))
          .map((v) => v.threshold);
        const limits = byClass(svg, "limit");
        expect(limits.map((l) => Number(l.getAttribute("data-value")))).toEqual(thresholds);
        for (const l of limits) {
          const yy = Number(l.getElementsByTagName("line")[0]?.getAttribute("y1"));
          expect(Math.abs(y.invert(yy) - Number(l.getAttribute("data-value")))).toBeLessThanOrEqual(
            2e-3 * y.perPx + 1e-12,
          );
        }
        // Greyscale: no two series share a dash pattern.
        const dashes = groups.map(
          (g) => g.getElementsByTagName("path")[0]?.getAttribute("stroke-dasharray") ?? "solid",
        );
        expect(new Set(dashes).size).toBe(dashes.length);
      }
      // The Tj-against-current mark is the worst-Tj corner, at its current and junction temperature.
      const tjChart = candidateCharts(c).find((ch) => ch.kind === "tj-vs-current");
      const w = c.worst.tjC;
      if (tjChart && w) {
        const mark = byClass(parseSvg(tjChart.svg).documentElement as Element, "mark")[0];
        expect(Number(mark?.getAttribute("data-y"))).toBe(w.value);
        expect(Number(mark?.getAttribute("data-x"))).toBe(c.corners[w.corner]?.currentA);
      }
    }
    // The turn-off chart marks the reported peak, at its time.
    for (const c of result.candidates) {
      const ch = candidateCharts(c).find((x) => x.kind === "turnoff-current");
      const e = c.turnOff?.event;
      if (ch === undefined || e === undefined || !("peakReverseCurrentA" in e)) throw new Error("no turn-off chart");
      const mark = byClass(parseSvg(ch.svg).documentElement as Element, "mark")[0];
      expect(Number(mark?.getAttribute("data-y"))).toBe(e.peakReverseCurrentA);
    }
    expect(checked).toBeGreaterThan(1000);
  });

  it("is deterministic and self-contained (no script, no external reference)", () => {
    const a = renderReviewReport(result, { id });
    const b = renderReviewReport(result, { id });
    expect(a.html).toBe(b.html);
    expect(a.markdown).toBe(b.markdown);
    expect(a.html).not.toMatch(/<script|<link|<img|src=|url\(/i);
    expect(a.html.replaceAll("http://www.w3.org/2000/svg", "")).not.toMatch(/https?:\/\//);
  });

  it("carries the caution, the model and rule-set versions, and the corner table with the worst case marked", () => {
    const rep = renderReviewReport(result, { id });
    const c0 = result.candidates[0];
    if (!c0?.worst.tjC) throw new Error("no worst corner");
    expect(rep.markdown).toContain(result.caution);
    expect(rep.html).toContain(result.caution.replace(/&/g, "&amp;"));
    expect(rep.markdown).toContain(`model version ${result.modelVersion}`);
    expect(rep.markdown).toContain(
      `rule set ${c0.rules.ruleSet.id} version ${c0.rules.ruleSet.version}, ${c0.rules.ruleSet.hash}`,
    );
    // The worst-Tj corner's row has its Tj cell marked; no other Tj cell of that table is.
    expect(rep.markdown).toContain(
      `highest junction temperature: ${Number(c0.worst.tjC.value.toPrecision(4))} °C at corner ${c0.worst.tjC.corner}`,
    );
    const table = rep.markdown.split(`## Rank ${c0.rank} · candidate 1`)[1]?.split("### Curves")[0] ?? "";
    const row = table.split("\n").find((l) => l.startsWith(`| ${c0.worst.tjC?.corner} |`));
    expect(row?.split("|")[12]?.trim()).toBe(`**${Number(c0.worst.tjC.value.toPrecision(4))}** ◆`);
  });

  it("states each candidate's inrush and the switch's cut-off as the result has them", () => {
    const md = renderReviewReport(result, { id }).markdown;
    const sw = result.candidates.find((c) => c.stage.partId === "demo-integrated-ideal-diode-5a-36v");
    const i = sw?.inrush as { drive: string; result: { outcome: string; chargeTimeS: number } } | undefined;
    if (i === undefined) throw new Error("no inrush for the switch");
    expect(md).toContain(
      `inrush (${i.drive}): ${i.result.outcome}: charge ${Number(i.result.chargeTimeS.toPrecision(4))} s`,
    );
    expect(md).toContain("overvoltage cut-off at 33 V");
    // The example's vehicle-12v-b charges at its 24 V jump start (the inrush's default input).
    expect(md).toMatch(/inrush \(current-limit\): [^\n]*; input 24 V/);
    const pair = result.candidates.find((c) => c.stage.partId === "demo-back-to-back-40v-2x5mohm");
    expect(pair?.inrush).toMatchObject({ drive: "uncontrolled", pairDissipation: "both-channels" });
    expect(md).toContain("each of the pair's channels half the drop");
  });

  it("shows the Monte Carlo spread exactly as the result states it", () => {
    const mc = result.monteCarlo;
    if (mc?.tjC === undefined) throw new Error("the example review samples a candidate");
    const md = renderReviewReport(result, { id }).markdown;
    const section = md.split("## Monte Carlo")[1]?.split("## Sources")[0] ?? "";
    expect(section).toContain(`${mc.samples} samples (seed ${mc.seed})`);
    const row = section.split("\n").find((l) => l.startsWith("| junction temperature"));
    const cells = row?.split("|").map((x) => x.trim()) ?? [];
    // mean, std, p1, p50, p99 as the result gives them, at the report's 4 significant digits.
    expect(cells.slice(2, 7)).toEqual(
      [mc.tjC.mean, mc.tjC.std, mc.tjC.p1, mc.tjC.p50, mc.tjC.p99].map((v) => String(Number(v.toPrecision(4)))),
    );
  });

  // docs/references.md (facts of the trade), common practice: a Schottky drops ~0.5 V at 10 A (several watts), so a 2 W loss
  // budget fails; loss-budget is the last rule of the default set, so "first" is the report's doing.
  it("a failing candidate shows its failing rule and the values it used first", async () => {
    const r = await review({
      requirement: {
        supply: { class: "vehicle-24v-f" },
        load: { kind: "constant-current", currentA: 10 },
        ambient: { minC: -40, maxC: 70 },
        transients: [],
        lossBudgetW: 2,
      },
      candidates: [{ stage: { kind: "catalog-part", partId: "demo-schottky-10a-60v" } }],
    });
    const c = r.candidates[0];
    const failing = c?.rules.verdicts.filter((v) => v.outcome === "fail") ?? [];
    expect(failing.map((v) => v.ruleId)).toContain("loss-budget");
    expect(c?.rules.verdicts.findIndex((v) => v.ruleId === "loss-budget")).toBeGreaterThan(5); // late in the set, yet shown first
    const md = renderReviewReport(r, { id: "schottky-10a" }).markdown;
    const section = md.split("## Rank 1 · candidate 1")[1] ?? "";
    const note = section.split("\n").find((l) => l.startsWith("Failing rule"));
    const firstFail = failing[0];
    if (!firstFail) throw new Error("no failing rule");
    expect(note).toContain(`Failing rule ${firstFail.ruleId}: ${firstFail.expression}`);
    const lossW = c?.metrics["lossWorstW"];
    if (typeof lossW !== "number") throw new Error("no loss metric");
    const rows = section.split("\n").filter((l) => l.startsWith("| ") && !l.startsWith("| rule"));
    // The verdict table opens with the failing rules (in rule-set order), each with its values.
    for (const [i, v] of failing.entries())
      expect(rows[i]).toMatch(new RegExp(`^\\| ${v.ruleId} \\| \\*\\*FAIL\\*\\* \\|`));
    const lossRow = rows.find((l) => l.startsWith("| loss-budget |"));
    // Values, threshold and margin with their units (the vocabulary's), at 4 significant digits.
    expect(lossRow).toContain(`lossWorstW = ${Number(lossW.toPrecision(4))} W`);
    expect(lossRow).toContain("threshold <= 2 W,");
    expect(section.indexOf("Failing rule")).toBeLessThan(section.indexOf("| rule |"));
  });

  // A load the source cannot deliver (200 W through 1 Ω from 12 V: the maximum is V²/4R = 36 W,
  // maximum power transfer) leaves every corner without an operating point: the report still
  // renders, with the line broken where the sweep has no point instead of invented numbers.
  it("renders a candidate without any operating point: valid SVG, no invented numbers, the fail first", async () => {
    const r = await review({
      requirement: {
        supply: { class: "custom", minV: 11, nominalV: 12, maxV: 13 },
        sourceResistanceOhm: 1,
        load: { kind: "constant-power", powerW: 200, minVoltageV: 5 },
        loadLevels: [1],
        ambient: { minC: 0, maxC: 40 },
        transients: [],
      },
      candidates: [{ stage: { kind: "catalog-part", partId: "demo-ideal-diode-60v-3mohm" } }],
    });
    const c = r.candidates[0];
    expect(c?.worst.unsolvedCorners).toHaveLength(c?.corners.length ?? -1);
    expect(c?.verdict).toBe("fail");
    const rep = renderReviewReport(r);
    for (const s of rep.svgs) {
      parseSvg(s.svg);
      expect(s.svg).not.toMatch(/NaN|Infinity|undefined/);
    }
    const svgOf = (kind: string) =>
      parseSvg(rep.svgs.find((s) => s.file.endsWith(`${kind}.svg`))?.svg ?? "").documentElement as Element;
    // Ambient swept at full load: no point anywhere, so no line at all.
    expect(byClass(svgOf("tj-vs-ambient"), "series")[0]?.getElementsByTagName("path")).toHaveLength(0);
    // Load swept: only the light loads the source can deliver are drawn.
    const stable =
      c?.curves?.load.filter((p) => p.outcome === "solved" || p.outcome === "over-temperature").length ?? 0;
    expect(stable).toBeGreaterThan(0);
    expect(stable).toBeLessThan(c?.curves?.load.length ?? 0);
    expect(
      pathPoints(
        byClass(svgOf("tj-vs-current"), "series")[0]?.getElementsByTagName("path")[0]?.getAttribute("d") ?? "",
      ),
    ).toHaveLength(stable);
    expect(rep.markdown).toContain("corners without an operating point: 0, 1, 2, 3, 4, 5");
    expect(
      rep.markdown
        .split("## Rank 1 · candidate 1")[1]
        ?.split("\n")
        .find((l) => l.startsWith("**")),
    ).toMatch(/^\*\*FAIL\. fail: corner 0/);
  });
});
