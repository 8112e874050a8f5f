/** A grid of small map stamps (rows × columns), each with its own colour scale, e.g. clusters × bands. */
import { el, svgDocument, text } from "./svg.js";
import { colourLimits, mapToPng, pngDataUri } from "./colormap.js";
import { formatTick } from "./scale.js";
import type { Figure } from "./figure.js";

/** One stamp: a small map (row-major, x fastest, row 0 at the bottom). */
export interface Stamp {
  data: ArrayLike<number>;
  nx: number;
  ny: number;
}

/** Options of {@link stampGrid}. */
export interface StampGridOptions {
  name: string;
  caption: string;
  title?: string;
  /** stamps[row][column]; null leaves a cell empty. */
  stamps: readonly (readonly (Stamp | null)[])[];
  rowLabels: readonly string[];
  columnLabels: readonly string[];
  /** Display size of each stamp in pixels (default 96). */
  cellPx?: number;
}

/** A grid of stamps; under each, its colour range (min … max of the robust limits) in the column's unit. */
export function stampGrid(o: StampGridOptions): Figure {
  const cell = o.cellPx ?? 96;
  const left = 150;
  const top = o.title === undefined ? 26 : 46;
  const gap = 22;
  const cols = o.columnLabels.length;
  const rows = o.stamps.length;
  const width = left + cols * (cell + 8) + 10;
  const height = top + rows * (cell + gap) + 10;
  const body: string[] = [];
  if (o.title !== undefined) body.push(text(width / 2, 22, o.title, { "text-anchor": "middle", "font-size": 14 }));
  o.columnLabels.forEach((c, j) => body.push(text(left + j * (cell + 8) + cell / 2, top - 8, c, { "text-anchor": "middle", "font-size": 11 })));
  o.stamps.forEach((row, i) => {
    const y = top + i * (cell + gap);
    body.push(text(left - 8, y + cell / 2 + 4, o.rowLabels[i] ?? "", { "text-anchor": "end", "font-size": 11 }));
    row.forEach((s, j) => {
      if (s === null) return;
      const x = left + j * (cell + 8);
      const [lo, hi] = colourLimits(s.data, 1, 99);
      body.push(el("image", { x, y, width: cell, height: cell, preserveAspectRatio: "none", "xlink:href": pngDataUri(mapToPng(s.data, s.nx, s.ny, lo, hi)) }));
      body.push(el("rect", { x, y, width: cell, height: cell, fill: "none", stroke: "#333" }));
      body.push(text(x + cell / 2, y + cell + 12, `${formatTick(lo)} … ${formatTick(hi)}`, { "text-anchor": "middle", "font-size": 9, fill: "#444" }));
    });
  });
  return { name: o.name, caption: o.caption, svg: svgDocument(width, height, body, o.title ?? o.caption), widthPx: width, heightPx: height };
}
