/**
 * A minimal hand-drawn SVG scatter plot with vertical error bars, axes, tick labels, axis titles
 * (with units) and an optional horizontal reference line. Deterministic text output.
 */

/** Points of one panel: x, y and the lower/upper ends of each error bar. */
export interface ErrorPlotData {
  title: string;
  xLabel: string;
  yLabel: string;
  x: readonly number[];
  y: readonly number[];
  yLo: readonly number[];
  yHi: readonly number[];
  /** A horizontal reference line (e.g. 0 bias, 1 completeness). */
  reference?: number;
  /** Fixed y range; otherwise from the data and the reference. */
  yRange?: [number, number];
}

const W = 420;
const H = 300;
const L = 60;
const R = 15;
const T = 30;
const B = 45;

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

function fmt(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toPrecision(3).replace(/\.?0+$/, "");
}

function ticks(lo: number, hi: number, n = 5): number[] {
  const span = hi - lo;
  if (!(span > 0)) return [lo];
  const raw = span / n;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step) out.push(Math.round(v / step) * step);
  return out;
}

/** Render one panel as an SVG string (finite points only; NaN points are left out). */
export function errorPlotSvg(d: ErrorPlotData): string {
  const idx = d.x.map((_, i) => i).filter((i) => Number.isFinite(d.x[i]!) && Number.isFinite(d.y[i]!));
  const xs = idx.map((i) => d.x[i]!);
  const lows = idx.map((i) => (Number.isFinite(d.yLo[i]!) ? d.yLo[i]! : d.y[i]!));
  const highs = idx.map((i) => (Number.isFinite(d.yHi[i]!) ? d.yHi[i]! : d.y[i]!));
  let x0 = xs.length ? Math.min(...xs) : 0;
  let x1 = xs.length ? Math.max(...xs) : 1;
  if (x1 === x0) {
    x0 -= 1;
    x1 += 1;
  }
  const pad = 0.05 * (x1 - x0);
  x0 -= pad;
  x1 += pad;
  let [y0, y1] = d.yRange ?? [Math.min(...lows, d.reference ?? Infinity), Math.max(...highs, d.reference ?? -Infinity)];
  if (!Number.isFinite(y0) || !Number.isFinite(y1)) [y0, y1] = [0, 1];
  if (y1 === y0) {
    y0 -= 1;
    y1 += 1;
  }
  const px = (x: number): number => L + ((x - x0) / (x1 - x0)) * (W - L - R);
  const py = (y: number): number => H - B - ((y - y0) / (y1 - y0)) * (H - T - B);
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="11">`);
  parts.push(`<text x="${W / 2}" y="16" text-anchor="middle" font-size="13">${esc(d.title)}</text>`);
  parts.push(`<rect x="${L}" y="${T}" width="${W - L - R}" height="${H - T - B}" fill="none" stroke="#333"/>`);
  for (const t of ticks(x0, x1)) {
    const X = px(t).toFixed(1);
    parts.push(`<line x1="${X}" y1="${H - B}" x2="${X}" y2="${H - B + 4}" stroke="#333"/><text x="${X}" y="${H - B + 16}" text-anchor="middle">${fmt(t)}</text>`);
  }
  for (const t of ticks(y0, y1)) {
    const Y = py(t).toFixed(1);
    parts.push(`<line x1="${L - 4}" y1="${Y}" x2="${L}" y2="${Y}" stroke="#333"/><text x="${L - 6}" y="${Y}" text-anchor="end" dominant-baseline="middle">${fmt(t)}</text>`);
  }
  parts.push(`<text x="${(L + W - R) / 2}" y="${H - 8}" text-anchor="middle">${esc(d.xLabel)}</text>`);
  parts.push(`<text transform="translate(14 ${(T + H - B) / 2}) rotate(-90)" text-anchor="middle">${esc(d.yLabel)}</text>`);
  if (d.reference !== undefined && d.reference >= y0 && d.reference <= y1) {
    const Y = py(d.reference).toFixed(1);
    parts.push(`<line x1="${L}" y1="${Y}" x2="${W - R}" y2="${Y}" stroke="#999" stroke-dasharray="4 3"/>`);
  }
  idx.forEach((i, j) => {
    const X = px(d.x[i]!).toFixed(1);
    parts.push(`<line x1="${X}" y1="${py(lows[j]!).toFixed(1)}" x2="${X}" y2="${py(highs[j]!).toFixed(1)}" stroke="#1f4e99"/>`);
    parts.push(`<circle cx="${X}" cy="${py(d.y[i]!).toFixed(1)}" r="3" fill="#1f4e99"/>`);
  });
  parts.push("</svg>");
  return parts.join("\n");
}
