import type { CandidateReview } from "../review/candidate-review.js";

/** The corner that sets a forward metric of a review, in words and as its conditions. */
export function cornerOf(
  r: CandidateReview,
  metric: string,
): { corner: string; conditions?: Record<string, number | string>; currentA?: number; tjC?: number } {
  const w =
    metric === "tjWorstC"
      ? r.worst.tjC
      : metric === "lossWorstW"
        ? r.worst.lossW
        : metric === "dropWorstV"
          ? r.worst.dropV
          : metric === "loadVMinV"
            ? r.worst.loadMinV
            : r.worst.lossW;
  // A start-up profile can set the junction or the load voltage beyond every steady corner.
  for (const p of r.startUp.profiles) {
    if (metric === "tjWorstC" && w !== undefined && p.result.maxTjC > w.value)
      return {
        corner: `start-up profile at ${p.ambientC} °C ambient (peak junction ${p.result.maxTjC.toFixed(2)} °C)`,
      };
    if (metric === "loadVMinV" && w !== undefined && p.result.minLoadV < w.value)
      return {
        corner: `start-up profile at ${p.ambientC} °C ambient (lowest load voltage ${p.result.minLoadV.toFixed(3)} V)`,
      };
  }
  const c = w === undefined ? undefined : r.corners[w.cornerIndex];
  if (w === undefined || c === undefined) return { corner: "no corner has an operating point" };
  const k = c.conditions;
  const point = "point" in c.result ? c.result.point : undefined;
  return {
    corner: `corner ${w.cornerIndex}: supply ${k.supply} ${k.supplyV} V, ambient ${k.ambient} ${k.ambientC} °C, load ×${k.loadScale}, ${k.tolerance}`,
    conditions: {
      index: w.cornerIndex,
      supply: k.supply,
      supplyV: k.supplyV,
      ambient: k.ambient,
      ambientC: k.ambientC,
      loadScale: k.loadScale,
      tolerance: k.tolerance,
    },
    ...(point ? { currentA: point.currentA, tjC: point.tjC } : {}),
  };
}
