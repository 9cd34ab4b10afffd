import type { ProfileResult, ProfileSample } from "../../domain/checks/start-up.js";
import type { CandidateReview } from "../../domain/review/candidate-review.js";

/**
 * A review candidate's start-up as answered. Each start-up profile keeps every figure of its result
 * (among them what the rules and a gate read: the lowest load voltage and highest Tj, which
 * metrics-of-review.ts takes into loadVMinV and tjWorstC; the body-diode, dropout and thermal
 * shutdown times; the thermal model), its number of
 * samples, and the samples at its lowest load voltage and at its highest Tj (the first of equals).
 * The samples themselves come only with `points` (the review's `curves`, which reports ask for): a
 * built-in profile of two cranks is 441 samples an ambient, and they were 594 of the example
 * review's 943 kB of JSON (bench/review-size.ts).
 */
export function startUpOutput(s: CandidateReview["startUp"], points: boolean) {
  return { ...s, profiles: s.profiles.map((p) => ({ ambientC: p.ambientC, result: profileOutput(p.result, points) })) };
}

function profileOutput(r: ProfileResult, points: boolean) {
  const { samples, ...figures } = r;
  return {
    ...(points ? { samples } : {}),
    ...figures,
    sampleCount: samples.length,
    lowestLoad: firstExtreme(
      samples,
      (s) => s.loadV,
      (a, b) => a < b,
    ),
    hottest: firstExtreme(
      samples,
      (s) => s.tjC,
      (a, b) => a > b,
    ),
  };
}

/** The first sample whose figure no other beats (a profile has at least one sample: start-up.ts). */
function firstExtreme(
  samples: readonly ProfileSample[],
  figure: (s: ProfileSample) => number,
  beats: (a: number, b: number) => boolean,
): ProfileSample {
  let best = samples[0];
  if (best === undefined) throw new Error("unreachable: a start-up profile without samples");
  for (const s of samples) if (beats(figure(s), figure(best))) best = s;
  return best;
}
