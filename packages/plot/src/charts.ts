/** Line/point charts with error bars, and histograms. */
import { el, svgDocument } from "./svg.js";
import { extent, linearScale, logScale, type Scale } from "./scale.js";
import { axesFrame, legend, MARGIN, type AxisSpec, type Figure } from "./figure.js";

/** One data series of an x–y chart. */
export interface XYSeries {
  label?: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Symmetric 1-σ error bars on y. */
  yErr?: ArrayLike<number>;
  /** "line" (default), "points", or "step" (histogram-like). */
  style?: "line" | "points" | "step";
  dashed?: boolean;
}

/** Options of {@link xyChart}. */
export interface XYChartOptions {
  name: string;
  caption: string;
  title?: string;
  x: AxisSpec;
  y: AxisSpec;
  series: readonly XYSeries[];
  /** Horizontal reference lines (e.g. zero bias). */
  hLines?: readonly number[];
  /** Draw y = x (measured vs true plots). */
  diagonal?: boolean;
  widthPx?: number;
  heightPx?: number;
}

/** Series colours: dark-to-light steps of viridis plus distinct dashes/markers, so greyscale still separates them. */
const COLOURS = ["#440154", "#21918c", "#e0a800", "#3b528b", "#5ec962", "#9e2a2b"];
const MARKERS = ["circle", "square", "diamond", "triangle"] as const;

function marker(kind: (typeof MARKERS)[number], x: number, y: number, colour: string): string {
  const r = 3.2;
  switch (kind) {
    case "circle":
      return el("circle", { cx: x, cy: y, r, fill: colour });
    case "square":
      return el("rect", { x: x - r, y: y - r, width: 2 * r, height: 2 * r, fill: colour });
    case "diamond":
      return el("path", { d: `M${x},${y - r - 1}L${x + r + 1},${y}L${x},${y + r + 1}L${x - r - 1},${y}Z`, fill: colour });
    case "triangle":
      return el("path", { d: `M${x},${y - r - 1}L${x + r + 1},${y + r}L${x - r - 1},${y + r}Z`, fill: colour });
  }
}

function makeScale(spec: AxisSpec, values: number[], range: [number, number]): Scale {
  const positive = spec.log === true ? values.filter((v) => v > 0) : values;
  let [lo, hi] = extent(positive, spec.log === true ? 0 : 0.05);
  if (spec.min !== undefined) lo = spec.min;
  if (spec.max !== undefined) hi = spec.max;
  if (spec.log === true) {
    if (!(lo > 0)) lo = hi > 0 ? hi / 100 : 1e-3;
    if (!(hi > lo)) hi = lo * 10;
    // pad 5 % of the span in log space so end points are not drawn on the frame
    const padFactor = (hi / lo) ** 0.05;
    if (spec.min === undefined) lo /= padFactor;
    if (spec.max === undefined) hi *= padFactor;
    return logScale([lo, hi], range);
  }
  return linearScale([lo, hi], range);
}

/** An x–y chart: lines, points, steps and y error bars, with axes, units, legend and caption. */
export function xyChart(o: XYChartOptions): Figure {
  const width = o.widthPx ?? 560;
  const height = o.heightPx ?? 380;
  const xr: [number, number] = [MARGIN.left, width - MARGIN.right];
  const yr: [number, number] = [height - MARGIN.bottom, MARGIN.top];
  const xv: number[] = [];
  const yv: number[] = [];
  for (const s of o.series) {
    for (let i = 0; i < s.x.length; i++) {
      xv.push(s.x[i] as number);
      const y = s.y[i] as number;
      const e = s.yErr === undefined ? 0 : (s.yErr[i] as number);
      yv.push(y);
      if (Number.isFinite(e) && e > 0) yv.push(y - e, y + e);
    }
  }
  for (const h of o.hLines ?? []) yv.push(h);
  const xs = makeScale(o.x, xv, xr);
  const ys = makeScale(o.y, yv, yr);
  const body = axesFrame(xs, ys, o.x.label, o.y.label, o.title);
  const clipId = `clip-${o.name.replace(/[^a-zA-Z0-9_-]/g, "")}`;
  body.push(`<defs><clipPath id="${clipId}"><rect x="${xr[0]}" y="${yr[1]}" width="${xr[1] - xr[0]}" height="${yr[0] - yr[1]}"/></clipPath></defs>`);
  const inner: string[] = [];
  for (const h of o.hLines ?? []) inner.push(el("line", { x1: xr[0], x2: xr[1], y1: ys(h), y2: ys(h), stroke: "#555", "stroke-dasharray": "4 3" }));
  if (o.diagonal === true) {
    const lo = Math.max(xs.domain[0], ys.domain[0]);
    const hi = Math.min(xs.domain[1], ys.domain[1]);
    if (hi > lo) inner.push(el("line", { x1: xs(lo), y1: ys(lo), x2: xs(hi), y2: ys(hi), stroke: "#555", "stroke-dasharray": "4 3" }));
  }
  const legendEntries: { label: string; swatch: (x: number, y: number) => string }[] = [];
  o.series.forEach((s, si) => {
    const colour = COLOURS[si % COLOURS.length] as string;
    const mk = MARKERS[si % MARKERS.length] as (typeof MARKERS)[number];
    const dash = s.dashed === true || si % 2 === 1 ? "6 3" : undefined;
    const style = s.style ?? "line";
    const pts: string[] = [];
    for (let i = 0; i < s.x.length; i++) {
      const x = s.x[i] as number;
      const y = s.y[i] as number;
      if (!Number.isFinite(x) || !Number.isFinite(y) || (xs.log && x <= 0) || (ys.log && y <= 0)) continue;
      const X = xs(x);
      const Y = ys(y);
      if (style === "step" && pts.length > 0) {
        const prev = pts[pts.length - 1] as string;
        pts.push(`${X},${prev.split(",")[1]}`);
      }
      pts.push(`${X},${Y}`);
      if (s.yErr !== undefined) {
        const e = s.yErr[i] as number;
        if (Number.isFinite(e) && e > 0) {
          const lo = ys.log ? Math.max(y - e, ys.domain[0]) : y - e;
          inner.push(el("line", { x1: X, x2: X, y1: ys(lo), y2: ys(y + e), stroke: colour, "stroke-width": 1.2 }));
        }
      }
      if (style === "points") inner.push(marker(mk, X, Y, colour));
    }
    if (style !== "points" && pts.length > 1) {
      inner.push(el("polyline", { points: pts.join(" "), fill: "none", stroke: colour, "stroke-width": 1.8, "stroke-dasharray": dash }));
    }
    if (s.label !== undefined) {
      legendEntries.push({
        label: s.label,
        swatch: (x, y) =>
          style === "points"
            ? marker(mk, x, y, colour)
            : el("line", { x1: x - 6, x2: x + 6, y1: y, y2: y, stroke: colour, "stroke-width": 2, "stroke-dasharray": dash }),
      });
    }
  });
  body.push(`<g clip-path="url(#${clipId})">${inner.join("")}</g>`);
  body.push(...legend(legendEntries, xr[1], yr[1]));
  return { name: o.name, caption: o.caption, svg: svgDocument(width, height, body, o.title ?? o.caption), widthPx: width, heightPx: height };
}

/** Options of {@link histogramChart}. */
export interface HistogramOptions {
  name: string;
  caption: string;
  title?: string;
  values: ArrayLike<number>;
  /** Bin edges (ascending). */
  edges: ArrayLike<number>;
  x: AxisSpec;
  yLabel?: string;
  /** A probability density to overlay, scaled to the histogram's counts (e.g. the unit normal for pulls). */
  overlayDensity?: (x: number) => number;
  overlayLabel?: string;
  widthPx?: number;
  heightPx?: number;
}

/** Counts of `values` in the bins given by ascending `edges` (values outside are dropped; NaN ignored). */
export function histogramCounts(values: ArrayLike<number>, edges: ArrayLike<number>): Float64Array {
  const nb = edges.length - 1;
  const counts = new Float64Array(Math.max(0, nb));
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    if (!Number.isFinite(v) || v < (edges[0] as number) || v > (edges[nb] as number)) continue;
    let lo = 0;
    let hi = nb;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (v >= (edges[mid] as number)) lo = mid;
      else hi = mid;
    }
    counts[lo] = (counts[lo] as number) + 1;
  }
  return counts;
}

/** A histogram with an optional overlaid density curve (scaled by N·bin width). */
export function histogramChart(o: HistogramOptions): Figure {
  const counts = histogramCounts(o.values, o.edges);
  const nb = counts.length;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let b = 0; b < nb; b++) {
    xs.push(o.edges[b] as number, o.edges[b + 1] as number);
    ys.push(counts[b] as number, counts[b] as number);
  }
  const series: XYSeries[] = [{ label: "counts", x: xs, y: ys, style: "line" }];
  if (o.overlayDensity !== undefined) {
    let n = 0;
    for (const c of counts) n += c;
    const lo = o.edges[0] as number;
    const hi = o.edges[nb] as number;
    const width = (hi - lo) / Math.max(1, nb);
    const cx: number[] = [];
    const cy: number[] = [];
    for (let i = 0; i <= 200; i++) {
      const x = lo + ((hi - lo) * i) / 200;
      cx.push(x);
      cy.push(n * width * o.overlayDensity(x));
    }
    series.push({ label: o.overlayLabel ?? "expected", x: cx, y: cy, dashed: true });
  }
  return xyChart({
    name: o.name,
    caption: o.caption,
    ...(o.title === undefined ? {} : { title: o.title }),
    x: o.x,
    y: { label: o.yLabel ?? "number per bin", min: 0 },
    series,
    ...(o.widthPx === undefined ? {} : { widthPx: o.widthPx }),
    ...(o.heightPx === undefined ? {} : { heightPx: o.heightPx }),
  });
}
