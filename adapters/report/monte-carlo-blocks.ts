import type { Block } from "./doc.js";
import { num, type Review } from "./format.js";

type Mc = NonNullable<Review["monteCarlo"]>;
const FIGURES = [
  ["tjC", "junction temperature (°C)"],
  ["lossW", "loss (W)"],
  ["dropV", "forward drop (V)"],
  ["loadV", "load voltage (V)"],
] as const;

/** The Monte Carlo spread as the review result states it: percentiles and the share failing each rule. */
export function monteCarloBlocks(r: Review): Block[] {
  const mc: Mc | undefined = r.monteCarlo;
  if (mc === undefined) return [];
  const label = r.candidates[mc.candidate]?.label ?? `candidate ${mc.candidate + 1}`;
  const rows = FIGURES.flatMap(([key, name]) => {
    const d = mc[key];
    return d === undefined
      ? []
      : [
          [name, d.mean, d.std, d.p1, d.p50, d.p99, d.min, d.max].map((v) => ({
            text: typeof v === "string" ? v : num(v),
          })),
        ];
  });
  const shares = Object.entries(mc.shareFailingByRule).map(
    ([id, s]) => `${id}: fails in ${num(s * 100, 3)} % of samples`,
  );
  const warns = Object.entries(mc.shareWarningByRule).map(
    ([id, s]) => `${id}: warns in ${num(s * 100, 3)} % of samples`,
  );
  return [
    { kind: "heading", level: 2, text: "Monte Carlo" },
    {
      kind: "para",
      text: `${mc.samples} samples (seed ${mc.seed}) of ${label} at ${num(mc.supplyV)} V and ${num(mc.ambientC)} °C; ${num(mc.shareWithoutOperatingPoint * 100, 3)} % of samples have no operating point.`,
    },
    {
      kind: "table",
      cls: "monte-carlo",
      caption: "Spread over the samples with an operating point",
      headers: ["figure", "mean", "std", "p1", "p50", "p99", "min", "max"],
      rows,
    },
    {
      kind: "list",
      items: shares.length + warns.length > 0 ? [...shares, ...warns] : ["no rule fails or warns on any sample"],
    },
  ];
}
