import { LIMITS, limitMessage } from "../../contracts/limits.js";
import type { ErrorBody } from "../../contracts/outcome.js";

/** How deep a parsed JSON value nests, how many values it holds and how many string characters, each counted only as far as its bound. */
export interface InputShape {
  readonly depth: number;
  readonly nodes: number;
  readonly chars: number;
}

/**
 * The shape of a parsed JSON value, walked with an explicit stack (never recursion: a 10,000-deep
 * input must not overflow the stack here, nor anywhere after this check refuses it). The walk stops
 * once the depth passes `maxDepth`, so a deep input costs no more than its first `maxDepth` levels
 * along each branch it meets.
 */
export function inputShape(value: unknown, maxDepth: number = LIMITS.maxInputDepth): InputShape {
  let depth = 0;
  let nodes = 0;
  let chars = 0;
  const stack: { v: unknown; d: number }[] = [{ v: value, d: 1 }];
  while (stack.length > 0) {
    const { v, d } = stack.pop() as { v: unknown; d: number };
    nodes += 1;
    if (typeof v === "string") chars += v.length;
    if (typeof v !== "object" || v === null) continue;
    if (d > depth) depth = d;
    if (d > maxDepth) break;
    if (Array.isArray(v)) for (const x of v) stack.push({ v: x, d: d + 1 });
    else
      for (const k in v) {
        chars += k.length;
        stack.push({ v: (v as Record<string, unknown>)[k], d: d + 1 });
      }
  }
  return { depth, nodes, chars };
}

/**
 * The refusal of an input nested deeper than the limit (HTTP 422), or undefined; `extra` levels
 * allowed above an input (1 for a bulk array; its shape walked to at least the limit plus `extra`).
 */
export function depthProblem(shape: InputShape, extra = 0): ErrorBody | undefined {
  if (shape.depth <= LIMITS.maxInputDepth + extra) return undefined;
  const message = limitMessage(
    "maxInputDepth",
    `the input nests arrays and objects more than ${LIMITS.maxInputDepth + extra} deep`,
  );
  return { code: "limit-exceeded", message, issues: [{ path: [], message }] };
}
