/**
 * Apodisation windows (tapers) that bring a map smoothly to zero at its border or around masked
 * regions before a Fourier transform, and the window moments that correct power spectra for them.
 */
import { UmbraError } from "@umbra/core";
import { distanceToRemoved } from "./distance-transform.js";
import { checkDimension } from "./rfft2-f64.js";

/** Window shapes: `cosine` (pixel-centred sin² taper, never exactly 0) or `tukey` (scipy.signal.windows.tukey, 0 on the edge pixels). */
export type WindowKind = "cosine" | "tukey";

function checkWidth(widthPix: number): void {
  if (!(widthPix >= 0) || !Number.isFinite(widthPix)) {
    throw new UmbraError("BAD_VALUE", `apodisation width ${widthPix} pixels must be finite and ≥ 0`, { field: "widthPix", value: widthPix });
  }
}

/**
 * 1-D taper of length n. `cosine`: d = min(i + ½, n − i − ½) (distance of the pixel centre from
 * the edge), w = sin²(π d /(2W)) for d < W, else 1. `tukey`: the Tukey (tapered cosine) window
 * (Harris 1978, Proc. IEEE 66, 51, its Tukey-window section; from memory) with taper length W samples, equal to
 * scipy.signal.windows.tukey(n, alpha = 2W/(n − 1)): w = ½(1 − cos(π d/W)) with d = min(i, n−1−i),
 * W capped at (n−1)/2 (a Hann window).
 */
export function taper1d(n: number, widthPix: number, kind: WindowKind): Float64Array {
  checkDimension("n", n);
  checkWidth(widthPix);
  const w = new Float64Array(n).fill(1);
  if (widthPix === 0) return w;
  if (kind === "cosine") {
    for (let i = 0; i < n; i++) {
      const d = Math.min(i + 0.5, n - i - 0.5);
      if (d < widthPix) w[i] = Math.sin((Math.PI * d) / (2 * widthPix)) ** 2;
    }
  } else if (kind === "tukey") {
    if (n < 2) return w;
    const width = Math.min(widthPix, (n - 1) / 2);
    for (let i = 0; i < n; i++) {
      const d = Math.min(i, n - 1 - i);
      if (d < width) w[i] = 0.5 * (1 - Math.cos((Math.PI * d) / width));
    }
  } else {
    throw new UmbraError("BAD_OPTION", `unknown window kind '${String(kind)}' (use cosine or tukey)`, { field: "kind", value: kind });
  }
  return w;
}

/** Separable 2-D window w(x, y) = w_x(x)·w_y(y) over nx × ny pixels (row-major), tapering `widthPix` pixels from each edge; see {@link taper1d}. */
export function apodisationWindow(nx: number, ny: number, widthPix: number, kind: WindowKind = "cosine"): Float64Array {
  const wx = taper1d(nx, widthPix, kind);
  const wy = taper1d(ny, widthPix, kind);
  const out = new Float64Array(nx * ny);
  for (let y = 0; y < ny; y++) {
    const a = wy[y] as number;
    for (let x = 0; x < nx; x++) out[y * nx + x] = a * (wx[x] as number);
  }
  return out;
}

/**
 * Taper a binary mask (kept where `mask` ≠ 0 and not NaN) by distance to the nearest removed
 * pixel: w = 0 on removed pixels, w = ½(1 − cos(π d/W)) for d < W and 1 beyond, where d is the
 * exact Euclidean distance in pixels (see `distanceToRemoved`) and W = `widthPix`. With
 * `edgeAsRemoved` (default true) the map border tapers too.
 */
export function apodiseMask(mask: ArrayLike<number>, nx: number, ny: number, widthPix: number, edgeAsRemoved = true): Float64Array {
  checkDimension("nx", nx);
  checkDimension("ny", ny);
  checkWidth(widthPix);
  const d = distanceToRemoved(mask, nx, ny, edgeAsRemoved);
  for (let i = 0; i < d.length; i++) {
    const di = d[i] as number;
    d[i] = di === 0 ? 0 : di >= widthPix ? 1 : 0.5 * (1 - Math.cos((Math.PI * di) / widthPix));
  }
  return d;
}

/** mean(w^p) over all pixels: p = 2 is the power fraction w2 that divides a pseudo-power spectrum of an apodised map; p = 4 enters its variance. */
export function windowMoment(window: ArrayLike<number>, p: number): number {
  if (window.length === 0) throw new UmbraError("BAD_VALUE", "empty window", { field: "window" });
  let s = 0;
  for (let i = 0; i < window.length; i++) s += Math.abs(window[i] as number) ** p;
  return s / window.length;
}

/** w2 = mean(w²): the fraction of the map's power the window keeps (divide a windowed C_ell by it). */
export function windowPowerFraction(window: ArrayLike<number>): number {
  return windowMoment(window, 2);
}
