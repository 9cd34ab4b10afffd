import { describe, expect, it } from "vitest";
import { type SoaLine, soaCheck } from "../../../domain/checks/soa-lines.js";

// Invented SOA lines, straight on log-log axes as datasheets draw them (common practice,
// docs/references.md "Inrush"): 1 ms from 100 A at 10 V to 10 A at 40 V; 10 ms from 30 A to 3 A.
const lines: SoaLine[] = [
  {
    pulseWidthS: 10e-3,
    points: [
      { vdsV: 10, idA: 30 },
      { vdsV: 40, idA: 3 },
    ],
  },
  {
    pulseWidthS: 1e-3,
    points: [
      { vdsV: 10, idA: 100 },
      { vdsV: 40, idA: 10 },
    ],
  },
];
const pulse = (energyJ: number, peakPowerW: number, vdsAtPeakV: number) => ({
  energyJ,
  peakPowerW,
  vdsAtPeakV,
  currentAtPeakA: peakPowerW / vdsAtPeakV,
});

describe("the inrush pulse against datasheet SOA lines", () => {
  it("reads log-log along each line and between lines, derated from the 25 °C case to the start", () => {
    // Width 1 J / 316.23 W = 3.1623 ms, the geometric middle of 1 and 10 ms. At 20 V (the geometric
    // middle of 10 and 40 V on each line): 100/√10 = 31.62 A and 30/√10 = 9.487 A; between the lines
    // √(31.62·9.487) = 17.32 A; at 85 °C on a 175 °C part ×(175 − 85)/(175 − 25) = 0.6 → 10.39 A.
    const r = soaCheck(lines, pulse(1, 316.227766, 20), 175, 85);
    if (!r.assessed) throw new Error(r.reason);
    expect(r.equivalentWidthS).toBeCloseTo(3.16227766e-3, 9);
    expect(r.allowedA).toBeCloseTo(Math.sqrt((100 / Math.sqrt(10)) * (30 / Math.sqrt(10))) * 0.6, 6);
    expect(r.currentA).toBeCloseTo(316.227766 / 20, 9);
  });

  it("takes the shortest line for a shorter pulse, no derating at or below 25 °C, nothing above a line's last voltage", () => {
    const short = soaCheck(lines, pulse(0.01, 100, 10), 175, 25);
    expect(short).toMatchObject({ assessed: true, allowedA: 100 });
    const beyond = soaCheck(lines, pulse(0.01, 100, 50), 175, 25);
    expect(beyond).toMatchObject({ assessed: true, allowedA: 0 });
  });

  it("does not assess a pulse longer than the longest line", () => {
    expect(soaCheck(lines, pulse(1, 10, 10), 175, 25)).toMatchObject({ assessed: false });
  });
});
