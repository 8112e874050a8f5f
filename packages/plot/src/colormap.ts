/** Colour maps and map rasters. */
import { encode } from "fast-png";
import { VIRIDIS_RGB } from "./viridis.js";

/** sRGB triple (0–255) of viridis at t ∈ [0, 1] (clamped; NaN → mid grey). */
export function viridis(t: number): [number, number, number] {
  if (Number.isNaN(t)) return [160, 160, 160];
  const i = Math.round(Math.min(1, Math.max(0, t)) * 255) * 3;
  return [VIRIDIS_RGB[i] as number, VIRIDIS_RGB[i + 1] as number, VIRIDIS_RGB[i + 2] as number];
}

/** CSS colour string of viridis at t. */
export function viridisCss(t: number): string {
  const [r, g, b] = viridis(t);
  return `rgb(${r},${g},${b})`;
}

/** Colour limits for a map: the given ones, or robust percentiles (default 0.5 % and 99.5 %) of the finite pixels. */
export function colourLimits(data: ArrayLike<number>, lowerPct = 0.5, upperPct = 99.5): [number, number] {
  const finite: number[] = [];
  const stride = Math.max(1, Math.floor(data.length / 200_000)); // sample large maps
  for (let i = 0; i < data.length; i += stride) {
    const v = data[i] as number;
    if (Number.isFinite(v)) finite.push(v);
  }
  if (finite.length === 0) return [0, 1];
  finite.sort((a, b) => a - b);
  const at = (p: number): number => finite[Math.min(finite.length - 1, Math.max(0, Math.round((p / 100) * (finite.length - 1))))] as number;
  const lo = at(lowerPct);
  const hi = at(upperPct);
  return hi > lo ? [lo, hi] : [lo - 1, lo + 1];
}

/**
 * Encode a map (row-major, x fastest, row 0 at the bottom as in FITS) as an 8-bit RGB PNG in viridis
 * between `vmin` and `vmax`; NaN pixels grey. Rows are flipped so north/up is at the top.
 */
export function mapToPng(data: ArrayLike<number>, nx: number, ny: number, vmin: number, vmax: number): Uint8Array {
  const rgb = new Uint8Array(nx * ny * 3);
  const inv = vmax > vmin ? 1 / (vmax - vmin) : 0;
  for (let iy = 0; iy < ny; iy++) {
    const src = (ny - 1 - iy) * nx;
    const dst = iy * nx * 3;
    for (let ix = 0; ix < nx; ix++) {
      const v = data[src + ix] as number;
      const [r, g, b] = viridis((v - vmin) * inv);
      rgb[dst + 3 * ix] = r;
      rgb[dst + 3 * ix + 1] = g;
      rgb[dst + 3 * ix + 2] = b;
    }
  }
  return encode({ width: nx, height: ny, data: rgb, channels: 3, depth: 8 });
}

/** A `data:` URI for PNG bytes (for embedding a raster in an SVG figure). */
export function pngDataUri(png: Uint8Array): string {
  return `data:image/png;base64,${Buffer.from(png).toString("base64")}`;
}
