/**
 * Estimate the beam-deconvolved band covariance C̃_ij(ℓ) of noise + foregrounds from the band
 * spectra themselves: every mode is divided by the band's beam B_i(ℓ) first, then cross-powers are
 * binned in ell (adaptive bins holding at least `minModes` full-plane modes), corrected for the
 * apodisation window's mean square, smoothed across neighbouring bins and kept positive definite
 * by diagonal loading, with the condition number of each bin's correlation matrix reported.
 *
 * Why deconvolved: a sky component common to all bands (the CMB in K_CMB) is then exactly
 * C(ℓ)·a aᵀ for every mode, so averaging over a bin or interpolating between bins keeps it a
 * rank-one term plus the noise: the near-cancellation the filter relies on survives. Binning the
 * beam-convolved cross-power mixes different B_iB_j inside one bin and, with CMB/noise ratios of
 * 1e4 at ℓ ~ 500, inflates the noise left after cancellation (measured: filter errors 10–20 % too
 * large; see docs/matched-filter.md). Smoothing is a [1, 2, 1] (× mode count) average of whole
 * matrices, which keeps both that structure and positive definiteness (common practice, no source).
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
  /** At low ℓ a bin may close once it is this many times its lower edge wide (default 0.5)… */
  readonly maxRelativeWidth?: number;
  /** …provided it holds at least this many full-plane modes (default 12 × the band count). */
  readonly minModesFloor?: number;
  /** Mean of the apodisation window squared, ⟨W²⟩ (default 1: no window). */
  readonly windowMeanSquare?: number;
  /** Passes of [1, 2, 1] smoothing across bins (default 1). */
  readonly smoothPasses?: number;
  /** Largest condition number accepted before diagonal loading (default 1e8). */
  readonly maxCondition?: number;
  /** Band names for error messages. */
  readonly bandNames?: readonly string[];
  /** The beams the spectra were deconvolved with (to normalise bins a band is partly blind in). */
  readonly beams?: readonly ((ells: Float64Array) => Float64Array)[];
}

/** Per band and bin, the Hermitian-weighted fraction of modes with B ≥ MIN_BEAM_TRANSFER. */
function liveFractions(beams: readonly ((ells: Float64Array) => Float64Array)[], ells: Float64Array, w: Float64Array, edges: Float64Array): number[][] {
  const nBins = edges.length - 1;
  const bin = new Int32Array(ells.length).fill(-1);
  const tot = new Float64Array(nBins);
  for (let m = 0; m < ells.length; m++) {
    const l = ells[m] as number;
    if (l < (edges[0] as number) || l >= (edges[nBins] as number)) continue;
    let a = 0;
    let b = nBins;
    while (b - a > 1) {
      const mid = (a + b) >> 1;
      if (l >= (edges[mid] as number)) a = mid;
      else b = mid;
    }
    bin[m] = a;
    tot[a] += w[m] as number;
  }
  return beams.map((beam) => {
    const b = beam(ells);
    const liveW = new Float64Array(nBins);
    for (let m = 0; m < ells.length; m++) {
      const k = bin[m] as number;
      if (k >= 0 && (b[m] as number) >= MIN_BEAM_TRANSFER) liveW[k] += w[m] as number;
    }
    return Array.from(liveW, (x, k) => ((tot[k] as number) > 0 ? x / (tot[k] as number) : 0));
  });
}

/** Deconvolved noise power (sr · K²) given to a band in a bin where it sees nothing. */
export const BLIND_NOISE = 1e100;

/**
 * Beam transfers below this are treated as zero: the band is blind in that mode (its deconvolved
 * noise would be over 1e16 times its in-band level, and such factors break the Cholesky
 * factorisation of the band covariance; measured on a 30 GHz band with a 7 arcmin beam).
 */
export const MIN_BEAM_TRANSFER = 1e-8;

/**
 * Divide each band spectrum by its beam transfer per mode (beams[i](ells)); modes where
 * B < {@link MIN_BEAM_TRANSFER} are set to 0. Returns new spectra.
 */
export function deconvolveBeams(spectra: readonly Float64Array[], beams: readonly ((ells: Float64Array) => Float64Array)[], ells: Float64Array): Float64Array[] {
  return spectra.map((s, i) => {
    const b = (beams[i] as (e: Float64Array) => Float64Array)(ells);
    const out = new Float64Array(s.length);
    for (let m = 0; m < ells.length; m++) {
      const bm = b[m] as number;
      if (!(bm >= MIN_BEAM_TRANSFER)) continue;
      out[2 * m] = (s[2 * m] as number) / bm;
      out[2 * m + 1] = (s[2 * m + 1] as number) / bm;
    }
    return out;
  });
}

/**
 * Adaptive bin edges: grow each bin from the fundamental until it holds `minModes` full-plane
 * modes, or — at low ℓ, where the power (CMB, atmosphere) falls steeply — until it is
 * `maxRelativeWidth` × its lower edge wide and holds at least `minModesFloor` modes. Without that
 * cap the first bin of a small map spans ℓ ≈ 0–1500 and its mean, set by the many modes near its
 * top, underestimates the power at ℓ ≈ 200–500 several times (measured: large-size filters'
 * errors 1.5–3× too small).
 */
export function adaptiveBinEdges(
  ells: Float64Array,
  weights: Float64Array,
  minWidth: number,
  minModes: number,
  maxRelativeWidth = Infinity,
  minModesFloor = minModes,
): Float64Array {
  let lmax = 0;
  for (let m = 0; m < ells.length; m++) if ((ells[m] as number) > lmax) lmax = ells[m] as number;
  // fine cells [(i − ½)w, (i + ½)w): edges at half-integer multiples of the fundamental, so no
  // mode of a square-pixel map lies on an edge (ℓ = w·sqrt(a² + b²) is never a half-integer
  // multiple of w) and the binning does not depend on rounding
  const nFine = Math.floor(lmax / minWidth + 0.5) + 1;
  const counts = new Float64Array(nFine);
  for (let m = 0; m < ells.length; m++) {
    const l = ells[m] as number;
    if (l === 0) continue; // the mean is not a fluctuation
    counts[Math.min(nFine - 1, Math.floor(l / minWidth + 0.5))] += weights[m] as number;
  }
  const edges: number[] = [1e-9];
  let acc = 0;
  let start = 0;
  for (let i = 0; i < nFine; i++) {
    acc += counts[i] as number;
    const width = (i + 1 - start) * minWidth;
    const lo = Math.max((start - 0.5) * minWidth, minWidth);
    if (acc >= minModes || (acc >= minModesFloor && width >= maxRelativeWidth * lo)) {
      edges.push((i + 0.5) * minWidth);
      acc = 0;
      start = i + 1;
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

/** [1, 2, 1] × mode-count average of whole matrices across neighbouring bins; in place. */
function smoothBins(values: Float64Array, counts: Float64Array, nb: number, passes: number): void {
  const nBins = counts.length;
  const nb2 = nb * nb;
  for (let p = 0; p < passes; p++) {
    const src = Float64Array.from(values);
    for (let k = 0; k < nBins; k++) {
      let wsum = 0;
      const acc = new Float64Array(nb2);
      for (let o = -1; o <= 1; o++) {
        const kk = k + o;
        if (kk < 0 || kk >= nBins) continue;
        const w = (o === 0 ? 2 : 1) * (counts[kk] as number);
        wsum += w;
        for (let q = 0; q < nb2; q++) acc[q] += w * (src[kk * nb2 + q] as number);
      }
      for (let q = 0; q < nb2; q++) values[k * nb2 + q] = (acc[q] as number) / wsum;
    }
  }
}

/**
 * Estimate C̃_ij(ℓ) (sr · K_CMB², beam-deconvolved) from the forward transforms `spectra` (one per
 * band, same layout) of maps apodised by a window with mean square `windowMeanSquare`; `spectra`
 * must already be divided by the beams ({@link deconvolveBeams}).
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
  const edges = adaptiveBinEdges(ells, layout.hermitianWeight, minWidth, minModes, opts.maxRelativeWidth ?? 0.5, Math.min(minModes, opts.minModesFloor ?? 12 * nb));
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
  // the binned average ran over every mode; a band blind in part of a bin (deconvolved value 0)
  // must be normalised by the fraction of modes where it (and its partner) can see
  if (opts.beams !== undefined) {
    const live = liveFractions(opts.beams, ells, layout.hermitianWeight, edges);
    for (let k = 0; k < nBins; k++) {
      for (let i = 0; i < nb; i++) {
        for (let j = 0; j < nb; j++) {
          const f = Math.min(live[i]![k]!, live[j]![k]!);
          values[k * nb2 + i * nb + j] = f > 0 ? (values[k * nb2 + i * nb + j] as number) / f : 0;
        }
      }
    }
  }
  // a band with no usable mode in a bin (beam below MIN_BEAM_TRANSFER everywhere in it) is blind
  // there: give it a huge noise so the filter ignores it. A band with no power in any bin where it
  // can see is an error (a constant, all-zero or all-NaN map).
  for (let i = 0; i < nb; i++) {
    let seen = 0;
    for (let k = 0; k < nBins; k++) {
      const d = values[k * nb2 + i * nb + i] as number;
      if (!Number.isFinite(d) || d < 0) {
        const band = opts.bandNames?.[i] ?? String(i);
        throw new UmbraError("BAD_DATA", `band power is not finite at ell ≈ ${(c[k] as number).toFixed(0)}`, { band });
      }
      if (d === 0) {
        for (let j = 0; j < nb; j++) {
          values[k * nb2 + i * nb + j] = 0;
          values[k * nb2 + j * nb + i] = 0;
        }
        values[k * nb2 + i * nb + i] = BLIND_NOISE;
      } else seen++;
    }
    if (seen === 0) {
      const band = opts.bandNames?.[i] ?? String(i);
      throw new UmbraError("BAD_DATA", "no power at any multipole (map constant, all zero or all missing?)", { band });
    }
  }
  smoothBins(values, n, nb, opts.smoothPasses ?? 1);
  const conditionNumbers = new Float64Array(nBins);
  const loading = new Float64Array(nBins);
  for (let k = 0; k < nBins; k++) {
    // the correlation matrix: scale-free, so the condition number means the same at every ℓ
    const a = new Matrix(nb, nb);
    for (let i = 0; i < nb; i++) {
      for (let j = 0; j < nb; j++) {
        const d = Math.sqrt(values[k * nb2 + i * nb + i] as number) * Math.sqrt(values[k * nb2 + j * nb + j] as number);
        a.set(i, j, (values[k * nb2 + i * nb + j] as number) / d);
      }
    }
    let eps = 0;
    let [lo, hi] = eigenRange(a);
    while (!(lo > 0) || hi / lo > maxCond) {
      eps = eps === 0 ? 1e-10 : eps * 10;
      if (eps > 1) throw new UmbraError("NUMERIC", `band covariance at ell ≈ ${(c[k] as number).toFixed(0)} cannot be made positive definite`);
      const b = a.clone();
      for (let i = 0; i < nb; i++) b.set(i, i, a.get(i, i) * (1 + eps));
      [lo, hi] = eigenRange(b);
      if (lo > 0 && hi / lo <= maxCond) {
        for (let i = 0; i < nb; i++) values[k * nb2 + i * nb + i] = (values[k * nb2 + i * nb + i] as number) * (1 + eps);
      }
    }
    conditionNumbers[k] = hi / lo;
    loading[k] = eps;
  }
  return { nBands: nb, ellEdges: edges, ellCentres: c, values, modeCounts: n, conditionNumbers, loading };
}
