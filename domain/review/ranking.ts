/** The verdict order of a candidate: what a release gate reads first. */
export type CandidateVerdict = "pass" | "warn" | "incomplete" | "fail";

const ORDER: Record<CandidateVerdict, number> = { pass: 0, warn: 1, incomplete: 2, fail: 3 };

export interface RankEntry {
  readonly index: number;
  readonly verdict: CandidateVerdict;
  /** Worst-case loss; undefined when a corner has no operating point (ranks last within its verdict). */
  readonly worstLossW?: number;
  readonly cost?: number;
}

/** Order candidates by verdict, then by worst-case loss, then by cost (a needed heatsink counts); stable. */
export function rankCandidates(entries: readonly RankEntry[]): RankEntry[] {
  const key = (x: number | undefined) => (x === undefined ? Number.POSITIVE_INFINITY : x);
  return [...entries].sort(
    (a, b) =>
      ORDER[a.verdict] - ORDER[b.verdict] ||
      key(a.worstLossW) - key(b.worstLossW) ||
      key(a.cost) - key(b.cost) ||
      a.index - b.index,
  );
}
