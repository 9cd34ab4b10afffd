import { escapeHtml, mdCell, mdText } from "./format.js";
import type { ReportChart } from "./review-charts.js";

/** A small document model, so Markdown and HTML show the same content in the same order. */
export interface Cell {
  readonly text: string;
  /** Emphasised (the worst corner of a column, a failing outcome). */
  readonly mark?: boolean;
  /** Bold, without the worst-case sign (a failing outcome). */
  readonly strong?: boolean;
}
export type Block =
  | { readonly kind: "heading"; readonly level: 1 | 2 | 3; readonly text: string; readonly id?: string }
  | {
      readonly kind: "para";
      readonly text: string;
      readonly tone?: "caution" | "verdict-fail" | "verdict-warn" | "verdict-pass" | "verdict-other" | "note";
    }
  | { readonly kind: "list"; readonly items: readonly string[] }
  | {
      readonly kind: "table";
      readonly caption?: string;
      readonly headers: readonly string[];
      readonly rows: readonly (readonly Cell[])[];
      readonly rowTags?: readonly string[];
      readonly cls: string;
    }
  | { readonly kind: "charts"; readonly charts: readonly ReportChart[] }
  | { readonly kind: "section-start"; readonly id: string; readonly verdict: string }
  | { readonly kind: "section-end" };

const WORST = "◆";

/** Markdown (GitHub-flavoured tables); charts as image links to the SVG files under `svgDir` (null: named only). */
export function toMarkdown(blocks: readonly Block[], svgDir: string | null): string {
  const out: string[] = [];
  for (const b of blocks) {
    switch (b.kind) {
      case "heading":
        out.push(`${"#".repeat(b.level)} ${mdText(b.text)}`, "");
        break;
      case "para":
        out.push(
          b.tone === "caution"
            ? `> **Caution.** ${mdText(b.text)}`
            : b.tone?.startsWith("verdict")
              ? `**${mdText(b.text)}**`
              : mdText(b.text),
          "",
        );
        break;
      case "list":
        out.push(...b.items.map((i) => `- ${mdText(i)}`), "");
        break;
      case "table": {
        if (b.caption) out.push(`*${mdText(b.caption)}*`, "");
        out.push(`| ${b.headers.map(mdCell).join(" | ")} |`, `|${b.headers.map(() => "---").join("|")}|`);
        for (const r of b.rows)
          out.push(
            `| ${r.map((c) => (c.mark ? `**${mdCell(c.text)}** ${WORST}` : c.strong ? `**${mdCell(c.text)}**` : mdCell(c.text))).join(" | ")} |`,
          );
        out.push("");
        break;
      }
      case "charts":
        if (svgDir === null)
          out.push(
            ...b.charts.map((c) => `- ${mdText(c.title)} (${mdText(c.spec.subtitle ?? "")}): in the HTML report`),
            "",
          );
        else
          for (const c of b.charts)
            out.push(`![${mdCell(c.title)}](${svgDir === "" ? "" : `${svgDir}/`}${c.file})`, "");
        break;
      case "section-start":
      case "section-end":
        break;
    }
  }
  return `${out.join("\n").trimEnd()}\n`;
}

/** The body of the HTML report; charts inline as SVG elements. */
export function toHtmlBody(blocks: readonly Block[]): string {
  const out: string[] = [];
  for (const b of blocks) {
    switch (b.kind) {
      case "heading":
        out.push(`<h${b.level}${b.id ? ` id="${escapeHtml(b.id)}"` : ""}>${escapeHtml(b.text)}</h${b.level}>`);
        break;
      case "para":
        out.push(
          `<p${b.tone ? ` class="${b.tone}"` : ""}>${b.tone === "caution" ? "<strong>Caution.</strong> " : ""}${escapeHtml(b.text)}</p>`,
        );
        break;
      case "list":
        out.push(`<ul>${b.items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>`);
        break;
      case "table": {
        const head = `<thead><tr>${b.headers.map((h) => `<th>${escapeHtml(h)}</th>`).join("")}</tr></thead>`;
        const rows = b.rows.map((r, i) => {
          const tag = b.rowTags?.[i];
          const cells = r
            .map((c) =>
              c.mark
                ? `<td class="mark">${escapeHtml(c.text)} <span aria-label="worst">${WORST}</span></td>`
                : c.strong
                  ? `<td><strong>${escapeHtml(c.text)}</strong></td>`
                  : `<td>${escapeHtml(c.text)}</td>`,
            )
            .join("");
          return `<tr${tag ? ` ${tag}` : ""}>${cells}</tr>`;
        });
        out.push(
          `<div class="scroll"><table class="${b.cls}">${b.caption ? `<caption>${escapeHtml(b.caption)}</caption>` : ""}${head}<tbody>${rows.join("")}</tbody></table></div>`,
        );
        break;
      }
      case "charts":
        out.push(`<div class="charts">${b.charts.map((c) => `<figure>${c.svg}</figure>`).join("")}</div>`);
        break;
      case "section-start":
        out.push(`<section class="candidate" id="${escapeHtml(b.id)}" data-verdict="${escapeHtml(b.verdict)}">`);
        break;
      case "section-end":
        out.push("</section>");
        break;
    }
  }
  return out.join("\n");
}
