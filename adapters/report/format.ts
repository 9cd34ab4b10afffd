import type { ReviewOutput } from "../../contracts/review.js";

export type Review = ReviewOutput;
export type Candidate = ReviewOutput["candidates"][number];
export type Verdict = Candidate["rules"]["verdicts"][number];
export type Corner = Candidate["corners"][number];

/** A number for people: 4 significant digits, no exponent for ordinary magnitudes, true minus sign. */
export function num(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "–";
  if (v === 0) return "0";
  const a = Math.abs(v);
  const s = a >= 1e-3 && a < 1e7 ? Number(v.toPrecision(digits)).toString() : v.toExponential(digits - 1);
  return s.replace("-", "−");
}

/** Value or flag as read by a rule. */
export function valueText(v: number | boolean): string {
  return typeof v === "boolean" ? String(v) : num(v);
}

/** A file-name-safe slug: letters, digits, dot, dash, underscore; never empty. */
export function slug(s: string): string {
  const t = s
    .replace(/[^A-Za-z0-9._-]+/g, "-")
    .replace(/^[-.]+|-+$/g, "")
    .slice(0, 120);
  return t === "" ? "report" : t;
}

export function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/**
 * Plain text as Markdown inline text: the characters that would start emphasis, code, a link or an
 * image, a table cell, raw HTML (`<` before a tag's first character) or an entity are
 * backslash-escaped, and a line break becomes a space. Every text of a report is plain (labels, ids
 * and names come from the caller), so none can inject markup. A table cell is this.
 */
export function mdCell(s: string): string {
  return s
    .replace(/\r?\n|\r/g, " ")
    .replace(/[\\`*_[\]|]|<(?=[A-Za-z/!?])|&(?=#?[A-Za-z0-9]+;)/g, "\\$&")
    .replace(/~~/g, "\\~\\~");
}

/** {@link mdCell}, and a start that would make a block (a list item, a quote, a heading) escaped: a paragraph's or heading's text. */
export function mdText(s: string): string {
  return mdCell(s).replace(/^(\s*)([-+*>#]|\d+[.)])(?=\s|$)/, "$1\\$2");
}
