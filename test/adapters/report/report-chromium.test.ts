import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { chromium } from "playwright-core";
import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../../adapters/batch/run-batch.js";
import { projectRoot } from "../../../adapters/project-root.js";
import { renderBridgeAcReport } from "../../../adapters/report/bridge-report.js";
import { renderReviewReport } from "../../../adapters/report/review-report.js";
import { bridgeAcOutput } from "../../../contracts/bridge.js";
import { reviewOutput } from "../../../contracts/review.js";
import { demoContext } from "../../helpers/app.js";
import { toolAvailable } from "../../helpers/external-tool.js";

const hasChromium = toolAvailable("chromium");
const chromiumPath = () => execFileSync("sh", ["-c", "command -v chromium"], { encoding: "utf8" }).trim();
const ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

/** Mean and variance of the luminance (ITU-R BT.601 weights) and the share of pixels off the page tone. */
function pixelStats(png: Buffer) {
  const img = PNG.sync.read(png);
  const n = img.width * img.height;
  let sum = 0;
  let sum2 = 0;
  let inked = 0;
  for (let i = 0; i < n; i += 1) {
    const l = 0.299 * (img.data[4 * i] ?? 0) + 0.587 * (img.data[4 * i + 1] ?? 0) + 0.114 * (img.data[4 * i + 2] ?? 0);
    sum += l;
    sum2 += l * l;
    if (l < 160) inked += 1;
  }
  const mean = sum / n;
  return { width: img.width, height: img.height, variance: sum2 / n - mean * mean, inkedShare: inked / n };
}

describe("report in headless Chromium", () => {
  // Chromium as the oracle of "it renders": a browser engine lays the page out and paints it.
  it.skipIf(!hasChromium)(
    "renders the review and the bridge pages without console errors; every chart is laid out; the screenshot is not blank; a failing candidate's first verdict is its failing rule",
    async () => {
      const line = JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as {
        id: string;
        input: unknown;
      };
      const invoke = procedureInvoker(demoContext())("review");
      if (invoke === undefined) throw new Error("review procedure missing");
      // With curves: every chart kind of the review, the turn-off reverse current included.
      const result = reviewOutput.parse(await invoke({ ...(line.input as object), curves: true }));
      const rep = renderReviewReport(result, { id: line.id });
      const dir = mkdtempSync(join(tmpdir(), "backstop-report-"));
      const htmlFile = join(dir, "report.html");
      writeFileSync(htmlFile, rep.html);
      const bridgeLine = JSON.parse(
        readFileSync(join(projectRoot(), "examples", "requests", "bridgeAc.json"), "utf8"),
      ) as { id: string; input: object };
      const bridgeInvoke = procedureInvoker(demoContext())("bridgeAc");
      if (bridgeInvoke === undefined) throw new Error("bridgeAc procedure missing");
      const bridgeRep = renderBridgeAcReport(
        bridgeAcOutput.parse(await bridgeInvoke({ ...bridgeLine.input, waveform: true })),
        { id: bridgeLine.id },
      );
      const bridgeFile = join(dir, "bridge.html");
      writeFileSync(bridgeFile, bridgeRep.html);
      const browser = await chromium.launchPersistentContext(join(dir, "profile"), {
        executablePath: chromiumPath(),
        headless: true,
        args: ARGS,
        viewport: { width: 1360, height: 1400 },
      });
      try {
        const page = await browser.newPage();
        const problems: string[] = [];
        page.on("console", (m) => {
          if (m.type() === "error" || m.type() === "warning") problems.push(`${m.type()}: ${m.text()}`);
        });
        page.on("pageerror", (e) => problems.push(`pageerror: ${e.message}`));
        page.on("requestfailed", (r) => problems.push(`request failed: ${r.url()}`));
        await page.goto(pathToFileURL(htmlFile).href, { waitUntil: "load" });
        const charts = page.locator("svg.bs-chart");
        const boxes = await Promise.all((await charts.all()).map((c) => c.boundingBox()));
        const failingSection = page.locator('section.candidate[data-verdict="fail"]').first();
        const firstRow = failingSection.locator("table.verdicts tbody tr").first();
        const layout = {
          charts: await charts.count(),
          laidOut: boxes.filter((b) => b !== null && b.width >= 600 && b.height >= 300).length,
          failingFirstRule: await firstRow.getAttribute("data-rule"),
          failingFirstOutcome: await firstRow.getAttribute("data-outcome"),
          failingFirstValues: await firstRow.locator("td").nth(2).textContent(),
          failingId: await failingSection.getAttribute("id"),
        };
        const shot = await page.screenshot({ fullPage: false });
        writeFileSync(join(tmpdir(), "backstop-report-screenshot.png"), shot);
        expect(problems).toEqual([]);
        expect(layout.charts).toBe(rep.svgs.length);
        expect(layout.laidOut).toBe(rep.svgs.length);
        // The page's first failing section, whichever candidate it is (sections follow the ranking).
        const failing = result.candidates.find(
          (c) => c.verdict === "fail" && `candidate-${c.index}` === layout.failingId,
        );
        const rule = failing?.rules.verdicts.find((v) => v.outcome === "fail");
        expect(rule, "the example review has a failing candidate").toBeDefined();
        expect(layout.failingId).toBe(`candidate-${failing?.index}`);
        expect(layout.failingFirstRule).toBe(rule?.ruleId);
        expect(layout.failingFirstOutcome).toBe("fail");
        for (const k of Object.keys(rule?.values ?? {})) expect(layout.failingFirstValues).toContain(k);
        // The bridge page, in the same browser.
        await page.goto(pathToFileURL(bridgeFile).href, { waitUntil: "load" });
        const bridgeBoxes = await Promise.all((await page.locator("svg.bs-chart").all()).map((c) => c.boundingBox()));
        expect(problems).toEqual([]);
        expect(bridgeBoxes.filter((b) => b !== null && b.width >= 600 && b.height >= 300).length).toBe(
          bridgeRep.svgs.length,
        );
        expect(await page.locator("table.elements").count()).toBe(2);
        const stats = pixelStats(shot);
        expect(stats.width).toBe(1360);
        // Blank (one tone) has zero variance; the first screen of this report measured variance ~1500 and
        // ~5 % of its pixels in ink (text, tables, rules), so these floors leave room for fonts.
        expect(stats.variance).toBeGreaterThan(200);
        expect(stats.inkedShare).toBeGreaterThan(0.02);
      } finally {
        await browser.close();
        rmSync(dir, { recursive: true, force: true });
      }
    },
    60_000,
  );
});
