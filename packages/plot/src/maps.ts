/** Map figures: a map in viridis with a colour bar, offset axes in arcmin and marked positions. */
import { el, svgDocument, text } from "./svg.js";
import { linearScale } from "./scale.js";
import { axesFrame, type Figure } from "./figure.js";
import { colourLimits, mapToPng, pngDataUri, viridisCss } from "./colormap.js";
import { formatTick } from "./scale.js";

/** A position to mark on a map, in 0-based pixel coordinates. */
export interface MapMarker {
  ix: number;
  iy: number;
  label?: string;
  /** Circle radius in pixels of the map (default 6 display pixels). */
  radiusPix?: number;
}

/** Options of {@link mapChart}. */
export interface MapChartOptions {
  name: string;
  caption: string;
  title?: string;
  data: ArrayLike<number>;
  nx: number;
  ny: number;
  /** Pixel side in arcmin: axes show offsets from the map centre in arcmin; without it, pixel indices. */
  pixelArcmin?: number;
  /** Colour-bar label with unit, e.g. "Compton y" or "T [µK_CMB]". */
  colourbarLabel: string;
  vmin?: number;
  vmax?: number;
  markers?: readonly MapMarker[];
  /** Display size of the map's longer side in pixels (default 420). */
  displayPx?: number;
}

/** A map in viridis with a colour bar and axis offsets (arcmin) from the centre; markers as open circles. */
export function mapChart(o: MapChartOptions): Figure {
  const display = o.displayPx ?? 420;
  const aspect = o.ny / o.nx;
  const w = aspect <= 1 ? display : display / aspect;
  const h = aspect <= 1 ? display * aspect : display;
  const left = 70;
  const top = 34;
  const width = left + w + 110;
  const height = top + h + 52;
  const [lim0, lim1] = colourLimits(o.data);
  const vmin = o.vmin ?? lim0;
  const vmax = o.vmax ?? lim1;
  const unit = o.pixelArcmin;
  const xDomain: [number, number] = unit === undefined ? [-0.5, o.nx - 0.5] : [(-o.nx / 2) * unit, (o.nx / 2) * unit];
  const yDomain: [number, number] = unit === undefined ? [-0.5, o.ny - 0.5] : [(-o.ny / 2) * unit, (o.ny / 2) * unit];
  const xs = linearScale(xDomain, [left, left + w]);
  const ys = linearScale(yDomain, [top + h, top]);
  const png = mapToPng(o.data, o.nx, o.ny, vmin, vmax);
  const body: string[] = [
    el("image", { x: left, y: top, width: w, height: h, preserveAspectRatio: "none", "xlink:href": pngDataUri(png), style: "image-rendering:pixelated" }),
  ];
  const axisLabel = unit === undefined ? ["x [pixel]", "y [pixel]"] : ["offset x [arcmin]", "offset y [arcmin]"];
  body.push(...axesFrame(xs, ys, axisLabel[0] as string, axisLabel[1] as string, o.title).filter((s) => !s.includes('stroke="#e3e3e3"')));
  const pixToX = (ix: number): number => left + ((ix + 0.5) / o.nx) * w;
  const pixToY = (iy: number): number => top + h - ((iy + 0.5) / o.ny) * h;
  for (const m of o.markers ?? []) {
    const r = m.radiusPix === undefined ? 6 : Math.max(3, (m.radiusPix / o.nx) * w);
    const cx = pixToX(m.ix);
    const cy = pixToY(m.iy);
    body.push(el("circle", { cx, cy, r, fill: "none", stroke: "#ffffff", "stroke-width": 2.2 }));
    body.push(el("circle", { cx, cy, r, fill: "none", stroke: "#d62728", "stroke-width": 1.2 }));
    if (m.label !== undefined) body.push(text(cx + r + 2, cy - r, m.label, { fill: "#ffffff", stroke: "#000", "stroke-width": 0.4, "font-size": 10 }));
  }
  // colour bar
  const cbx = left + w + 18;
  const steps = 64;
  for (let i = 0; i < steps; i++) {
    const y = top + h - ((i + 1) / steps) * h;
    body.push(el("rect", { x: cbx, y, width: 14, height: h / steps + 0.5, fill: viridisCss((i + 0.5) / steps) }));
  }
  body.push(el("rect", { x: cbx, y: top, width: 14, height: h, fill: "none", stroke: "#333" }));
  const cs = linearScale([vmin, vmax], [top + h, top]);
  for (const t of cs.ticks(5)) {
    body.push(el("line", { x1: cbx + 14, x2: cbx + 18, y1: cs(t), y2: cs(t), stroke: "#333" }));
    body.push(text(cbx + 21, cs(t) + 4, formatTick(t), { fill: "#333", "font-size": 10 }));
  }
  body.push(text(0, 0, o.colourbarLabel, { "text-anchor": "middle", transform: `translate(${cbx + 88},${top + h / 2}) rotate(-90)`, fill: "#111" }));
  return { name: o.name, caption: o.caption, svg: svgDocument(width, height, body, o.title ?? o.caption), widthPx: width, heightPx: height };
}
