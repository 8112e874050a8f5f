/**
 * The noise power spectrum of a y map with known clusters cut out. The clusters' own signal must
 * not count as noise (a covariance or power measured on maps that still hold the clusters
 * overestimates the noise; Zubeldia et al. 2023, MNRAS, make the point for matched filters): every
 * given position is cut out to `holeRadiusArcmin`, the cut and the map border are tapered with a
 * cosine of `taperArcmin` (@umbra/maps apodiseMask), and the pseudo-power is divided by the mask's
 * power fraction ⟨w²⟩ (common practice, no source; the mode coupling of the holes is not undone,
 * which is adequate for the smooth residual spectra of a y map and is checked in the tests against
 * random-aperture scatter).
 */
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import { apodiseMask, crossPowerBinned, getRfft2Plan, windowPowerFraction, type BinnedPower } from "@umbra/maps";
import type { YMapProduct } from "./ymap.js";

/** Options of {@link yMapNoisePower}. */
export interface YMapNoiseOptions {
  /** Pixel positions (0-based) of clusters to cut out, each optionally with its own cut radius (arcmin). */
  positions: readonly { xPix: number; yPix: number; radiusArcmin?: number }[];
  /** Radius of each cut without its own, arcmin. */
  holeRadiusArcmin: number;
  /** The map to measure instead of product.y (e.g. the y map with a fit of every cluster subtracted). */
  map?: Float64Array;
  /** Cosine taper width around cuts and border, arcmin (default 2). */
  taperArcmin?: number;
}

/** Power spectrum (sr, same bins as product.noisePower) of the y map with the given positions cut out. */
export function yMapNoisePower(product: YMapProduct, options: YMapNoiseOptions): BinnedPower {
  const geom = product.geometry;
  const { nx, ny } = geom;
  if (!(options.holeRadiusArcmin >= 0)) throw new UmbraError("BAD_VALUE", `hole radius ${options.holeRadiusArcmin} arcmin must be ≥ 0`, { field: "holeRadiusArcmin" });
  const dxA = geom.dxRad / RAD_PER_ARCMIN;
  const dyA = geom.dyRad / RAD_PER_ARCMIN;
  const y = options.map ?? product.y;
  if (y.length !== nx * ny) throw new UmbraError("INTERNAL", `map of ${y.length} pixels for a ${nx}×${ny} grid`);
  const mask = new Float64Array(nx * ny).fill(1);
  for (let p = 0; p < mask.length; p++) if (!Number.isFinite(y[p] as number)) mask[p] = 0;
  for (const c of options.positions) {
    const r = c.radiusArcmin ?? options.holeRadiusArcmin;
    const x0 = Math.max(0, Math.floor(c.xPix - r / dxA));
    const x1 = Math.min(nx - 1, Math.ceil(c.xPix + r / dxA));
    const y0 = Math.max(0, Math.floor(c.yPix - r / dyA));
    const y1 = Math.min(ny - 1, Math.ceil(c.yPix + r / dyA));
    for (let iy = y0; iy <= y1; iy++) {
      for (let ix = x0; ix <= x1; ix++) {
        if (((ix - c.xPix) * dxA) ** 2 + ((iy - c.yPix) * dyA) ** 2 <= r * r) mask[iy * nx + ix] = 0;
      }
    }
  }
  const widthPix = (options.taperArcmin ?? 2) / Math.min(dxA, dyA);
  const w = apodiseMask(mask, nx, ny, widthPix, true);
  const w2 = windowPowerFraction(w);
  if (!(w2 > 0)) throw new UmbraError("BAD_DATA", "no pixel of the y map is left after cutting out the clusters", { field: "positions" });
  const plan = getRfft2Plan(nx, ny);
  const buf = new Float64Array(nx * ny);
  let mean = 0;
  let wsum = 0;
  for (let p = 0; p < buf.length; p++) {
    const wp = w[p] as number;
    if (wp > 0) {
      mean += wp * (y[p] as number);
      wsum += wp;
    }
  }
  mean /= wsum;
  for (let p = 0; p < buf.length; p++) {
    const wp = w[p] as number;
    buf[p] = wp > 0 ? wp * ((y[p] as number) - mean) : 0;
  }
  const spec = new Float64Array(plan.layout.spectrumLength);
  plan.forward(buf, spec);
  const raw = crossPowerBinned(spec, spec, plan.layout, geom, product.powerBinEdgesEll);
  return { ellCenters: raw.ellCenters, cl: raw.cl.map((v) => v / w2), modeCounts: raw.modeCounts };
}
