/**
 * Paint fitted clusters into band spectra (Fourier space, exact at fractional positions):
 * M_i[k] += s_i · B_i(ℓ) τ̃(ℓ; θ) e^{−2πi k·x0} / Ω_pix with s_i = Σ_c a_c A_ic the fitted SED
 * amplitudes. Used to remove the clusters before re-estimating the covariance (Zubeldia et al.
 * 2023, MNRAS 522, 5123, sec. 3: iterative noise estimation).
 */
import { shiftPhases } from "@umbra/maps";
import type { FitBank } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";

/** One cluster to paint: pixel position, scale and per-band amplitude (K_CMB at the centre before the beam). */
export interface PaintedCluster {
  readonly px: number;
  readonly py: number;
  readonly thetaRad: number;
  readonly bandAmplitudes: Float64Array;
  /**
   * Optional: the amplitudes as `amplitude × sed` with a shared SED array. Clusters sharing one
   * SED object are summed into one spectrum and spread over the bands once (faster).
   */
  readonly shared?: { readonly sed: Float64Array; readonly amplitude: number };
}

/** Add `sign` × every cluster's template to copies of `spectra`; returns the new spectra. */
export function paintClusters(bank: FitBank, table: ProfileTable, spectra: readonly Float64Array[], clusters: readonly PaintedCluster[], sign = 1): Float64Array[] {
  const out = spectra.map((s) => Float64Array.from(s));
  paintModeRange(bank, table, out, clusters, sign, 0, bank.layout.modeCount);
  return out;
}

/**
 * Add `sign` × every cluster's template to `out` (band spectra) over the modes [m0, m1) only.
 * Every mode receives the clusters in list order whatever the range, so painting the modes in
 * pieces (on several threads) gives exactly the numbers of one call over all modes.
 */
export function paintModeRange(bank: FitBank, table: ProfileTable, out: readonly Float64Array[], clusters: readonly PaintedCluster[], sign: number, m0: number, m1: number): void {
  const nb = bank.nBands;
  const { nx, ny } = bank.geometry;
  const { kxIndex, kyIndex } = bank.layout;
  const { index, frac } = bank.grid;
  const bn = bank.beamNodes;
  const ells = bank.ells;
  const gt = table.g;
  const du = table.du;
  const last = gt.length - 1;
  const ex = new Float64Array(2 * nx);
  const ey = new Float64Array(2 * ny);
  // clusters with a shared SED: accumulate y-model spectra per SED, spread over bands at the end
  const groups = new Map<Float64Array, Float64Array>();
  for (const c of clusters) {
    const acc = c.shared !== undefined ? (groups.get(c.shared.sed) ?? (groups.size < 8 ? new Float64Array(2 * (m1 - m0)) : null)) : null;
    if (acc !== null && c.shared !== undefined) groups.set(c.shared.sed, acc);
    shiftPhases(nx, c.px, -1, "half", ex);
    shiftPhases(ny, c.py, -1, "full", ey);
    // a shared-SED cluster goes into its SED's accumulator; the others straight into every band
    const scale = ((sign * c.thetaRad * c.thetaRad) / bank.pixelSr) * (acc !== null && c.shared !== undefined ? c.shared.amplitude : 1);
    const theta = c.thetaRad;
    for (let m = m0; m < m1; m++) {
      // profileAt (../mmf/profile.ts) written out: the call costs more than the interpolation here
      const x = ((ells[m] as number) * theta) / du;
      const j = Math.floor(x);
      if (j >= last) continue;
      const f = x - j;
      const g = ((gt[j] as number) * (1 - f) + (gt[j + 1] as number) * f) * scale;
      if (g === 0) continue;
      const kx = kxIndex[m] as number;
      let ky = kyIndex[m] as number;
      if (ky < 0) ky += ny;
      const xr = ex[2 * kx] as number;
      const xi = ex[2 * kx + 1] as number;
      const yr = ey[2 * ky] as number;
      const yi = ey[2 * ky + 1] as number;
      const pr = (xr * yr - xi * yi) * g;
      const pi = (xr * yi + xi * yr) * g;
      if (acc !== null) {
        acc[2 * (m - m0)] += pr;
        acc[2 * (m - m0) + 1] += pi;
        continue;
      }
      const n0 = (index[m] as number) * nb;
      const t = frac[m] as number;
      for (let i = 0; i < nb; i++) {
        const b = ((bn[n0 + i] as number) * (1 - t) + (bn[n0 + nb + i] as number) * t) * (c.bandAmplitudes[i] as number);
        const s = out[i] as Float64Array;
        s[2 * m] += b * pr;
        s[2 * m + 1] += b * pi;
      }
    }
  }
  for (const [sed, acc] of groups) {
    for (let m = m0; m < m1; m++) {
      const n0 = (index[m] as number) * nb;
      const t = frac[m] as number;
      const ar = acc[2 * (m - m0)] as number;
      const ai = acc[2 * (m - m0) + 1] as number;
      for (let i = 0; i < nb; i++) {
        const b = ((bn[n0 + i] as number) * (1 - t) + (bn[n0 + nb + i] as number) * t) * (sed[i] as number);
        const s = out[i] as Float64Array;
        s[2 * m] += b * ar;
        s[2 * m + 1] += b * ai;
      }
    }
  }
}
