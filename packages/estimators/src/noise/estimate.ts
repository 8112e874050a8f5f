/**
 * Estimate the band covariance C_ij(ℓ) of noise + foregrounds from the band spectra themselves:
 * cross-power binned in ell (adaptive bins holding at least `minModes` full-plane modes), corrected
 * for the apodisation window's mean square, smoothed across neighbouring bins, and kept positive
 * definite by diagonal loading with the condition number reported per bin.
 *
 * Smoothing acts on log-amplitudes and correlation coefficients separately:
 * C = D^{1/2} R D^{1/2} with D = diag(C); log D and R are averaged over bins with weights [1, 2, 1]
 * (times mode counts). A weighted mean of correlation matrices is positive semi-definite and the
 * exponential of a mean log is positive, so smoothing never breaks definiteness, and a power law
 * in ℓ (linear in log) is not biased by it (common practice, no source).
 */
import { Matrix, EigenvalueDecomposition } from "ml-matrix";
import { UmbraError } from "@umbra/core";
import { crossPowerBinned, type FlatGeometry, type SpectrumLayout } from "@umbra/maps";
import type { BandCovariance } from "./types.js";

/** Options of {@link estimateBandCovariance}. */
export interface CovarianceOptions {
  /** Smallest bin width in ell (default: the larger fundamental mode spacing 2π/(n·d)). */
  readonly minBinWidthEll?: number;
  /** Least number of full-plane modes in a bin (default 200). */
  readonly minModes?: number;
  /** Mean of the apodisation window squared, ⟨W²⟩ (default 1: no window). */
  readonly windowMeanSquare?: number;
  /** Passes of [1, 2, 1] smoothing across bins (default 1). */
  readonly smoothPasses?: number;
  /** Largest condition number accepted before diagonal loading (default 1e8). */
  readonly maxCondition?: number;
  /** Band names for error messages. */
  readonly bandNames?: readonly string[];
}

/** Adaptive bin edges: start at the fundamental, widen each bin until it holds `minModes`. */
export function adaptiveBinEdges(ells: Float64Array, weights: Float64Array, minWidth: number, minModes: number): Float64Array {
  let lmax = 0;
  for (let m = 0; m < ells.length; m++) if ((ells[m] as number) > lmax) lmax = ells[m] as number;
  const nFine = Math.floor(lmax / minWidth) + 1;
  const counts = new Float64Array(nFine);
  for (let m = 0; m < ells.length; m++) {
    const l = ells[m] as number;
    if (l === 0) continue; // the mean is not a fluctuation
    counts[Math.min(nFine - 1, Math.floor(l / minWidth))] += weights[m] as number;
  }
  const edges: number[] = [1e-9];
  let acc = 0;
  for (let i = 0; i < nFine; i++) {
    acc += counts[i] as number;
    if (acc >= minModes) {
      edges.push((i + 1) * minWidth);
      acc = 0;
    }
  }
  if (acc > 0) {
    if (edges.length > 1) edges[edges.length - 1] = lmax * (1 + 1e-12) + 1e-9;
    else edges.push(lmax * (1 + 1e-12) + 1e-9);
  }
  return Float64Array.from(edges);
}

/** Smallest and largest eigenvalue of a symmetric matrix. */
function eigenRange(a: Matrix): [number, number] {
  const ev = new EigenvalueDecomposition(a, { assumeSymmetric: true }).realEigenvalues;
  return [Math.min(...ev), Math.max(...ev)];
}

/** Smooth log-diagonals and correlations across bins (see module doc); in place. */
function smoothBins(values: Float64Array, counts: Float64Array, nb: number, passes: number): void {
  const nBins = counts.length;
  const nb2 = nb * nb;
  for (let p = 0; p < passes; p++) {
    const logd = new Float64Array(nBins * nb);
    const corr = new Float64Array(nBins * nb2);
    for (let k = 0; k < nBins; k++) {
      for (let i = 0; i < nb; i++) logd[k * nb + i] = Math.log(values[k * nb2 + i * nb + i] as number);
      for (let i = 0; i < nb; i++) {
        for (let j = 0; j < nb; j++) {
          const d = Math.sqrt((values[k * nb2 + i * nb + i] as number) * (values[k * nb2 + j * nb + j] as number));
          corr[k * nb2 + i * nb + j] = (values[k * nb2 + i * nb + j] as number) / d;
        }
      }
    }
    for (let k = 0; k < nBins; k++) {
      let wsum = 0;
      const ld = new Float64Array(nb);
      const cr = new Float64Array(nb2);
      for (let o = -1; o <= 1; o++) {
        const kk = k + o;
        if (kk < 0 || kk >= nBins) continue;
        const w = (o === 0 ? 2 : 1) * (counts[kk] as number);
        wsum += w;
        for (let i = 0; i < nb; i++) ld[i] += w * (logd[kk * nb + i] as number);
        for (let q = 0; q < nb2; q++) cr[q] += w * (corr[kk * nb2 + q] as number);
      }
      for (let i = 0; i < nb; i++) {
        for (let j = 0; j < nb; j++) {
          const di = Math.exp((ld[i] as number) / wsum);
          const dj = Math.exp((ld[j] as number) / wsum);
          values[k * nb2 + i * nb + j] = i === j ? di : ((cr[i * nb + j] as number) / wsum) * Math.sqrt(di * dj);
        }
      }
    }
  }
}

/**
 * Estimate C_ij(ℓ) (sr · K_CMB²) from the forward transforms `spectra` (one per band, same
 * layout) of maps apodised by a window with mean square `windowMeanSquare`.
 * Throws BAD_DATA when a band has no power (all-zero map) or too few modes for one bin.
 */
export function estimateBandCovariance(
  spectra: readonly Float64Array[],
  layout: SpectrumLayout,
  geometry: FlatGeometry,
  ells: Float64Array,
  opts: CovarianceOptions = {},
): BandCovariance {
  const nb = spectra.length;
  if (nb === 0) throw new UmbraError("BAD_DATA", "no band spectra to estimate a covariance from");
  const minWidth = opts.minBinWidthEll ?? Math.max((2 * Math.PI) / (geometry.nx * geometry.dxRad), (2 * Math.PI) / (geometry.ny * geometry.dyRad));
  const minModes = opts.minModes ?? 200;
  const w2 = opts.windowMeanSquare ?? 1;
  if (!(w2 > 0 && w2 <= 1)) throw new UmbraError("BAD_VALUE", `window mean square ${w2} must be in (0, 1]`, { field: "windowMeanSquare" });
  const maxCond = opts.maxCondition ?? 1e8;
  const edges = adaptiveBinEdges(ells, layout.hermitianWeight, minWidth, minModes);
  const nBins = edges.length - 1;
  if (nBins < 1) throw new UmbraError("BAD_DATA", `map too small: fewer than ${minModes} Fourier modes for one covariance bin`);
  const nb2 = nb * nb;
  const values = new Float64Array(nBins * nb2);
  let centres: Float64Array | null = null;
  let counts: Float64Array | null = null;
  for (let i = 0; i < nb; i++) {
    for (let j = i; j < nb; j++) {
      const bp = crossPowerBinned(spectra[i] as Float64Array, spectra[j] as Float64Array, layout, geometry, edges);
      centres ??= bp.ellCenters;
      counts ??= bp.modeCounts;
      for (let k = 0; k < nBins; k++) {
        const v = (bp.cl[k] as number) / w2;
        values[k * nb2 + i * nb + j] = v;
        values[k * nb2 + j * nb + i] = v;
      }
    }
  }
  const c = centres as Float64Array;
  const n = counts as Float64Array;
  for (let k = 0; k < nBins; k++) {
    for (let i = 0; i < nb; i++) {
      const d = values[k * nb2 + i * nb + i] as number;
      if (!(d > 0) || !Number.isFinite(d)) {
        const band = opts.bandNames?.[i] ?? String(i);
        throw new UmbraError("BAD_DATA", `no power at ell ≈ ${(c[k] as number).toFixed(0)} (map constant, all zero or NaN?)`, { band });
      }
    }
  }
  smoothBins(values, n, nb, opts.smoothPasses ?? 1);
  const conditionNumbers = new Float64Array(nBins);
  const loading = new Float64Array(nBins);
  for (let k = 0; k < nBins; k++) {
    const a = new Matrix(nb, nb);
    for (let i = 0; i < nb; i++) for (let j = 0; j < nb; j++) a.set(i, j, values[k * nb2 + i * nb + j] as number);
    let eps = 0;
    let [lo, hi] = eigenRange(a);
    while (!(lo > 0) || hi / lo > maxCond) {
      eps = eps === 0 ? 1e-10 : eps * 10;
      if (eps > 1) throw new UmbraError("NUMERIC", `band covariance at ell ≈ ${(c[k] as number).toFixed(0)} cannot be made positive definite`);
      const b = a.clone();
      for (let i = 0; i < nb; i++) b.set(i, i, a.get(i, i) * (1 + eps));
      [lo, hi] = eigenRange(b);
      if (lo > 0 && hi / lo <= maxCond) {
        for (let i = 0; i < nb; i++) values[k * nb2 + i * nb + i] = b.get(i, i);
      }
    }
    conditionNumbers[k] = hi / lo;
    loading[k] = eps;
  }
  return { nBands: nb, ellEdges: edges, ellCentres: c, values, modeCounts: n, conditionNumbers, loading };
}
