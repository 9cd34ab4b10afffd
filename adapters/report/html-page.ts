import { escapeHtml } from "./format.js";

/**
 * Inline style of the report: paper tones and ink, verdicts told apart by border pattern
 * (double, dashed, solid) as well as tone, so a greyscale print reads the same.
 */
const STYLE = `
:root { color-scheme: light; }
body { margin: 0; background: #efece4; color: #1d1f24; font: 14px/1.45 "DejaVu Sans", "Liberation Sans", Arial, sans-serif; }
main { max-width: 1340px; margin: 0 auto; padding: 24px 28px 48px; background: #fbfaf6; }
h1 { font-size: 24px; margin: 0 0 12px; letter-spacing: 0.01em; }
h2 { font-size: 18px; margin: 32px 0 8px; padding-top: 12px; border-top: 2px solid #3b3f46; }
h3 { font-size: 15px; margin: 20px 0 6px; }
p.caution { border: 1px solid #3b3f46; border-left-width: 6px; padding: 8px 12px; background: #f3efe3; }
p.verdict-fail { border: 4px double #9b1c1c; padding: 6px 10px; font-weight: bold; }
p.verdict-warn { border: 2px dashed #6b4a12; padding: 6px 10px; font-weight: bold; }
p.verdict-pass { border: 1px solid #2f5a3a; padding: 6px 10px; font-weight: bold; }
p.verdict-other { border: 2px dotted #3b3f46; padding: 6px 10px; font-weight: bold; }
p.note { background: #f6e9e4; padding: 6px 10px; border-left: 6px solid #9b1c1c; }
.scroll { overflow-x: auto; }
table { border-collapse: collapse; margin: 6px 0 14px; font-size: 12.5px; }
caption { text-align: left; font-style: italic; padding: 4px 0; }
th, td { border: 1px solid #bdb8ab; padding: 3px 7px; text-align: left; vertical-align: top; }
th { background: #e6e2d6; }
td.mark { font-weight: bold; background: #ece3d0; }
tr.verdict.fail td:first-child { border-left: 5px solid #9b1c1c; }
tr.verdict.warn td:first-child { border-left: 5px dashed #6b4a12; }
tr.verdict.not-applicable { color: #5d6066; }
.charts { display: grid; grid-template-columns: repeat(auto-fill, minmax(640px, 1fr)); gap: 12px; }
figure { margin: 0; border: 1px solid #d6d1c4; background: #fdfcf8; width: 640px; justify-self: start; }
figure svg { display: block; }
@media print { body { background: #ffffff; } main { max-width: none; } figure { break-inside: avoid; } }
`;

/** One self-contained HTML document: inline style, inline SVG, no script, no external reference. */
export function htmlPage(title: string, body: string): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
${body}
</main>
</body>
</html>
`;
}
