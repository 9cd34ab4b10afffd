import { type CandidateVerdict, rankCandidates } from "../review/ranking.js";
import type { StageModel } from "../stages/stage-model.js";
import type { SizingContext } from "./assessment.js";
import { fmt, type SpecItem } from "./spec-item.js";
import { specifyStage } from "./stage-spec.js";

export interface CatalogCandidate {
  readonly partId: string;
  readonly label: string;
  readonly stage: StageModel;
  readonly cost?: number;
  /** The sizing context of this part (its own turn-off timing, the shared requirement and rules). */
  readonly ctx: SizingContext;
}

export interface CatalogMatch {
  readonly rank: number;
  readonly partId: string;
  readonly label: string;
  readonly stageKind: string;
  readonly verdict: CandidateVerdict;
  readonly reason: string;
  /** The first line of the specification the part misses (in specification order), if any. */
  readonly firstMiss?: SpecItem;
  readonly worstLossW?: number;
  readonly cost?: number;
  /** The part's specification with its own value and margin on every line. */
  readonly items: readonly SpecItem[];
}

/** A line's severity when missed: the rule's, or the requirement's. */
function severityOf(i: SpecItem): "fail" | "warn" {
  return i.source?.severity ?? "fail";
}

/** fail: a fail-severity line missed or impossible; warn: only warn lines missed; incomplete: a line not determined. */
export function verdictOfItems(items: readonly SpecItem[]): {
  verdict: CandidateVerdict;
  firstMiss?: SpecItem;
  reason: string;
} {
  const missed = items.filter((i) => i.meets === false || i.outcome === "impossible");
  const failing = missed.find((i) => severityOf(i) === "fail");
  const first = missed[0];
  if (failing !== undefined && first !== undefined)
    return { verdict: "fail", firstMiss: first, reason: `fail: ${describeMiss(first)}` };
  if (first !== undefined) return { verdict: "warn", firstMiss: first, reason: `warn: ${describeMiss(first)}` };
  const gap = items.find((i) => i.outcome === "not-determined");
  if (gap !== undefined)
    return { verdict: "incomplete", reason: `incomplete: ${gap.id} could not be determined (${gap.reason})` };
  return { verdict: "pass", reason: `pass: meets all ${items.filter((i) => i.meets === true).length} limits` };
}

function describeMiss(i: SpecItem): string {
  const by =
    i.source?.kind === "rule"
      ? `rule ${i.source.ruleId}`
      : i.source?.kind === "requirement"
        ? `requirement ${i.source.field}`
        : "the requirement";
  if (i.outcome === "impossible") return `${i.id} cannot be met (${i.reason})`;
  const op = i.bound === "at-most" ? "above" : "below";
  return `${i.id}: ${fmt(i.templateValue ?? Number.NaN)} ${i.unit} is ${op} the ${fmt(i.value ?? Number.NaN)} ${i.unit} limit set by ${by} at ${i.corner ?? "the requirement"}`;
}

/**
 * The approved parts against the specification: each part is sized with itself as the template
 * (its own laws and thermal path), so every line carries the part's value and margin; parts are
 * then ranked as the design review ranks candidates (domain/review/ranking.ts: verdict, then
 * worst-case loss, then cost).
 */
export function matchCatalog(parts: readonly CatalogCandidate[]): CatalogMatch[] {
  const rows = parts.map((p, index) => {
    const spec = specifyStage(p.ctx, p.stage);
    const v = verdictOfItems(spec.items);
    const w = spec.template.review.worst;
    const worstLossW = w.unsolvedCornerIndexes.length === 0 ? w.lossW?.value : undefined;
    return { index, p, spec, v, worstLossW };
  });
  const ranked = rankCandidates(
    rows.map((r) => ({
      index: r.index,
      verdict: r.v.verdict,
      ...(r.worstLossW === undefined ? {} : { worstLossW: r.worstLossW }),
      ...(r.p.cost === undefined ? {} : { cost: r.p.cost }),
    })),
  );
  return ranked.map((e, i) => {
    const r = rows[e.index];
    if (r === undefined) throw new Error("unreachable: ranked index out of range");
    return {
      rank: i + 1,
      partId: r.p.partId,
      label: r.p.label,
      stageKind: r.p.stage.kind,
      verdict: r.v.verdict,
      reason: r.v.reason,
      ...(r.v.firstMiss ? { firstMiss: r.v.firstMiss } : {}),
      ...(r.worstLossW === undefined ? {} : { worstLossW: r.worstLossW }),
      ...(r.p.cost === undefined ? {} : { cost: r.p.cost }),
      items: r.spec.items,
    };
  });
}
