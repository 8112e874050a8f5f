/** A self-contained HTML report page: headings, paragraphs, tables and figures with captions. */
import { escapeXml } from "./svg.js";
import type { Figure } from "./figure.js";

/** One block of a report. */
export type ReportBlock =
  | { kind: "heading"; text: string }
  | { kind: "paragraph"; text: string }
  | { kind: "table"; columns: readonly string[]; rows: readonly (readonly (string | number)[])[]; caption?: string }
  | { kind: "figure"; figure: Figure; /** file the page links to, relative to the page (e.g. "figures/y-map.svg") */ src: string }
  | { kind: "pre"; text: string };

function cell(v: string | number): string {
  if (typeof v === "number") {
    if (!Number.isFinite(v)) return "nan";
    const a = Math.abs(v);
    return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(3) : Number(v.toPrecision(5)).toString();
  }
  return escapeXml(v);
}

/** Render the report page (UTF-8 HTML5, no scripts, figures referenced as separate SVG files). */
export function renderHtmlReport(title: string, blocks: readonly ReportBlock[]): string {
  const parts: string[] = [];
  for (const b of blocks) {
    switch (b.kind) {
      case "heading":
        parts.push(`<h2>${escapeXml(b.text)}</h2>`);
        break;
      case "paragraph":
        parts.push(`<p>${escapeXml(b.text)}</p>`);
        break;
      case "pre":
        parts.push(`<pre>${escapeXml(b.text)}</pre>`);
        break;
      case "table":
        parts.push(
          `<table>${b.caption === undefined ? "" : `<caption>${escapeXml(b.caption)}</caption>`}<thead><tr>${b.columns
            .map((c) => `<th>${escapeXml(c)}</th>`)
            .join("")}</tr></thead><tbody>${b.rows.map((r) => `<tr>${r.map((v) => `<td>${cell(v)}</td>`).join("")}</tr>`).join("")}</tbody></table>`,
        );
        break;
      case "figure":
        parts.push(
          `<figure id="fig-${escapeXml(b.figure.name)}"><img src="${escapeXml(b.src)}" width="${b.figure.widthPx}" height="${b.figure.heightPx}" alt="${escapeXml(b.figure.caption)}"><figcaption>${escapeXml(b.figure.caption)}</figcaption></figure>`,
        );
        break;
    }
  }
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeXml(title)}</title>
<style>
body{font-family:"DejaVu Sans",Arial,sans-serif;max-width:1180px;margin:2em auto;padding:0 1em;color:#111;line-height:1.45}
h1{font-size:1.6em}h2{font-size:1.2em;margin-top:1.8em;border-bottom:1px solid #ccc}
table{border-collapse:collapse;font-size:.88em;margin:.8em 0}td,th{border:1px solid #ccc;padding:.25em .5em;text-align:right}th{background:#f3f3f3}
caption{caption-side:bottom;font-size:.9em;color:#444;text-align:left;padding-top:.3em}
figure{display:inline-block;margin:.6em 1em .6em 0;vertical-align:top;max-width:100%}figure img{max-width:100%;height:auto;border:1px solid #ddd}
figcaption{font-size:.88em;color:#333;max-width:560px}pre{background:#f6f6f6;padding:.6em;overflow:auto}
</style></head><body><h1>${escapeXml(title)}</h1>
${parts.join("\n")}
</body></html>
`;
}
