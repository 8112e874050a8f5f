/**
 * Write a report folder: `index.html` plus `figures/<name>.svg` and `.png` for every figure, each
 * file written atomically. The page links the SVGs; PNGs are there for slides and notebooks.
 */
import { mkdir } from "node:fs/promises";
import { join } from "node:path";
import { renderHtmlReport, svgToPng, type Figure, type ReportBlock } from "@umbra/plot";
import { writeFileAtomic } from "@umbra/maps";

/** A report block; figures are given as {@link Figure}s and placed under `figures/`. */
export type ReportInput = Exclude<ReportBlock, { kind: "figure" }> | { kind: "figure"; figure: Figure };

/** Write `dir/index.html` and the figures; returns the page's path. */
export async function writeReport(dir: string, title: string, blocks: readonly ReportInput[], opts: { png?: boolean } = {}): Promise<string> {
  const figDir = join(dir, "figures");
  await mkdir(figDir, { recursive: true });
  const out: ReportBlock[] = [];
  for (const b of blocks) {
    if (b.kind !== "figure") {
      out.push(b);
      continue;
    }
    const f = b.figure;
    await writeFileAtomic(join(figDir, `${f.name}.svg`), f.svg);
    if (opts.png !== false) await writeFileAtomic(join(figDir, `${f.name}.png`), svgToPng(f.svg));
    out.push({ kind: "figure", figure: f, src: `figures/${f.name}.svg` });
  }
  const page = join(dir, "index.html");
  await writeFileAtomic(page, renderHtmlReport(title, out));
  return page;
}
