/**
 * Detection of bright point sources (radio sources) in single bands with the single-band matched
 * filter for a beam-shaped source: S/N(x) = N(x)/sqrt(Var N), N = IFFT[(M/B)/P̃], Var N =
 * (1/N_pix) Σ_k 1/P̃ (per-pixel units; P̃ the band's beam-deconvolved power from the cleaned
 * covariance). Only positive peaks count (emission). Used to flag clusters whose photometry a
 * source may bias; umbra does not subtract sources (see docs/matched-filter.md).
 */
import type { Rfft2Plan } from "@umbra/maps";
import { MIN_BEAM_TRANSFER } from "../noise/estimate.js";
import type { BandCovariance } from "../noise/types.js";
import { findPeaks } from "../search/peaks.js";

/** One detected point source. */
export interface PointSource {
  readonly bandIndex: number;
  readonly px: number;
  readonly py: number;
  readonly snr: number;
}

/** Linear interpolation of the diagonal element `i` of the binned covariance at ell (clamped). */
function diagAt(cov: BandCovariance, i: number, ell: number): number {
  const c = cov.ellCentres;
  const nb = cov.nBands;
  const n = c.length;
  const at = (k: number): number => cov.values[k * nb * nb + i * nb + i] as number;
  if (ell <= (c[0] as number)) return at(0);
  if (ell >= (c[n - 1] as number)) return at(n - 1);
  let a = 0;
  let b = n - 1;
  while (b - a > 1) {
    const m = (a + b) >> 1;
    if ((c[m] as number) <= ell) a = m;
    else b = m;
  }
  const t = (ell - (c[a] as number)) / ((c[a + 1] as number) - (c[a] as number));
  return at(a) * (1 - t) + at(a + 1) * t;
}

/**
 * Point sources above `snrMin` in band `bandIndex`. `spectrum` is the band's forward transform,
 * `beamOnModes` its beam per mode, `allowed` where peaks may be (1) or null for everywhere.
 */
export function detectPointSources(
  plan: Rfft2Plan,
  ells: Float64Array,
  spectrum: Float64Array,
  beamOnModes: Float64Array,
  cov: BandCovariance,
  bandIndex: number,
  pixelSr: number,
  snrMin: number,
  allowed: Uint8Array | null,
): PointSource[] {
  const { layout } = plan;
  const f = new Float64Array(layout.spectrumLength);
  let v = 0;
  for (let m = 0; m < layout.modeCount; m++) {
    const b = beamOnModes[m] as number;
    const l = ells[m] as number;
    if (!(b >= MIN_BEAM_TRANSFER) || l === 0) continue;
    const p = diagAt(cov, bandIndex, l) / pixelSr;
    if (!(p > 0)) continue;
    f[2 * m] = (spectrum[2 * m] as number) / b / p;
    f[2 * m + 1] = (spectrum[2 * m + 1] as number) / b / p;
    v += (layout.hermitianWeight[m] as number) / p;
  }
  const npix = plan.nx * plan.ny;
  const sd = Math.sqrt(v / npix);
  const map = new Float64Array(npix);
  plan.inverse(f, map);
  for (let p = 0; p < npix; p++) map[p] = (map[p] as number) / sd;
  return findPeaks(map, plan.nx, plan.ny, snrMin, allowed).map((pk) => ({ bandIndex, px: pk.px, py: pk.py, snr: pk.snr }));
}
