/** The figure type every chart returns, and the axes frame they share. */
import { el, text, px } from "./svg.js";
import { formatTick, type Scale } from "./scale.js";

/** A finished figure: SVG text plus the caption that says what is plotted. */
export interface Figure {
  /** File-name stem, e.g. "pulls" → pulls.svg / pulls.png. */
  name: string;
  /** One or two sentences: what is plotted, in which units, from what data. */
  caption: string;
  svg: string;
  widthPx: number;
  heightPx: number;
}

/** An axis description: label with its unit, optional log scale and fixed limits. */
export interface AxisSpec {
  label: string;
  log?: boolean;
  min?: number;
  max?: number;
}

/** Plot-area margins in pixels. */
export const MARGIN = { left: 70, right: 20, top: 34, bottom: 50 } as const;

/** Axis lines, ticks, tick labels, grid and axis labels for a rectangular plot area. */
export function axesFrame(xs: Scale, ys: Scale, xLabel: string, yLabel: string, title: string | undefined): string[] {
  const [x0, x1] = xs.range;
  const [y0, y1] = ys.range; // y0 = bottom pixel, y1 = top pixel
  const out: string[] = [];
  for (const t of xs.ticks(6)) {
    const x = xs(t);
    out.push(el("line", { x1: x, x2: x, y1: y0, y2: y1, stroke: "#e3e3e3" }));
    out.push(el("line", { x1: x, x2: x, y1: y0, y2: y0 + 5, stroke: "#333" }));
    out.push(text(x, y0 + 18, formatTick(t), { "text-anchor": "middle", fill: "#333" }));
  }
  for (const t of ys.ticks(5)) {
    const y = ys(t);
    out.push(el("line", { x1: x0, x2: x1, y1: y, y2: y, stroke: "#e3e3e3" }));
    out.push(el("line", { x1: x0 - 5, x2: x0, y1: y, y2: y, stroke: "#333" }));
    out.push(text(x0 - 8, y + 4, formatTick(t), { "text-anchor": "end", fill: "#333" }));
  }
  out.push(el("rect", { x: x0, y: y1, width: x1 - x0, height: y0 - y1, fill: "none", stroke: "#333" }));
  out.push(text((x0 + x1) / 2, y0 + 40, xLabel, { "text-anchor": "middle", fill: "#111" }));
  out.push(
    text(0, 0, yLabel, { "text-anchor": "middle", fill: "#111", transform: `translate(${px(x0 - 52)},${px((y0 + y1) / 2)}) rotate(-90)` }),
  );
  if (title !== undefined) out.push(text((x0 + x1) / 2, y1 - 12, title, { "text-anchor": "middle", "font-size": 14, fill: "#111" }));
  return out;
}

/** A small legend box listing series labels with their line/marker swatches. */
export function legend(entries: readonly { label: string; swatch: (x: number, y: number) => string }[], xRight: number, yTop: number): string[] {
  if (entries.length === 0) return [];
  const width = 24 + 7 * Math.max(...entries.map((e) => e.label.length));
  const x = xRight - width - 8;
  const out = [el("rect", { x, y: yTop + 6, width, height: 8 + 16 * entries.length, fill: "#ffffff", "fill-opacity": 0.85, stroke: "#999" })];
  entries.forEach((e, i) => {
    const y = yTop + 20 + 16 * i;
    out.push(e.swatch(x + 10, y - 4));
    out.push(text(x + 22, y, e.label, { fill: "#111", "font-size": 11 }));
  });
  return out;
}
