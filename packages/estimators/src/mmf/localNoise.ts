/**
 * Inhomogeneous depth. The filter and its variance σ² assume stationary noise; with per-band
 * inverse-variance maps ivar_i(x) the white-noise part of each band varies over the map. The
 * filtered amplitude's variance at x is then
 *   σ²(x) = σ² + Σ_i σ²_w,i (g_i(x) − 1),   g_i(x) = (1/ivar_i(x)) / N_i,
 * where N_i is the window-weighted mean per-pixel white variance (what the data covariance holds)
 * and σ²_w,i = σ⁴ (1/(N_pix Ω²)) Σ_k τ̃² (Qa)_i² N_i / B_i² is band i's white-noise share of σ²
 * (the filter's response to white noise of that band; derivation in docs/matched-filter.md;
 * common practice for a filter whose weights vary slowly with depth, no source).
 */
import type { FitBank } from "./fit.js";
import { profileAt, type ProfileTable } from "./profile.js";

/** Per-band white-noise description of a stack with ivar maps. */
export interface WhiteNoiseModel {
  /** N_i: window-weighted mean per-pixel white variance of each band (K²). */
  readonly meanVariance: Float64Array;
  /** g_i(x) = (1/ivar_i(x))/N_i per band (1 where unknown). */
  readonly varianceRatio: readonly Float64Array[];
}

/**
 * Build the {@link WhiteNoiseModel} from ivar maps (null entries: band treated as homogeneous).
 * Pixels with ivar ≤ 0 or not finite get ratio 1 (they are inpainted and flagged elsewhere).
 */
export function whiteNoiseModel(ivar: readonly (Float64Array | null)[], window: Float64Array): WhiteNoiseModel {
  const nb = ivar.length;
  const meanVariance = new Float64Array(nb);
  const varianceRatio = ivar.map((iv, i) => {
    const out = new Float64Array(window.length).fill(1);
    if (iv === null) return out;
    let s = 0;
    let w = 0;
    for (let p = 0; p < iv.length; p++) {
      const v = iv[p] as number;
      if (!(v > 0) || !Number.isFinite(v)) continue;
      const w2 = (window[p] as number) ** 2;
      s += w2 / v;
      w += w2;
    }
    const n = w > 0 ? s / w : 0;
    meanVariance[i] = n;
    if (n > 0) {
      for (let p = 0; p < iv.length; p++) {
        const v = iv[p] as number;
        if (v > 0 && Number.isFinite(v)) out[p] = 1 / v / n;
      }
    }
    return out;
  });
  return { meanVariance, varianceRatio };
}

/** σ²_w,i for every band at profile scale `thetaRad` and SED `sed` (see module doc), given σ. */
export function whiteNoiseShares(bank: FitBank, table: ProfileTable, thetaRad: number, sed: Float64Array, sigma: number, meanVariance: Float64Array): Float64Array {
  const nb = bank.nBands;
  const nN = bank.grid.nNodes;
  // u_i(node) = (Q a)_i² / B_i², evaluated at the nodes
  const u = new Float64Array(nN * nb);
  for (let n = 0; n < nN; n++) {
    for (let i = 0; i < nb; i++) {
      let qa = 0;
      for (let j = 0; j < nb; j++) qa += (bank.qNodes[(n * nb + i) * nb + j] as number) * (sed[j] as number);
      const b = bank.beamNodes[n * nb + i] as number;
      u[n * nb + i] = b > 1e-8 ? (qa * qa) / (b * b) : 0;
    }
  }
  // Σ over modes of a smooth function of ℓ, done on the node grid with each node's share of the
  // modes (the modes' linear-interpolation weights): exact for functions linear between nodes
  const acc = new Float64Array(nb);
  const th2 = thetaRad * thetaRad;
  const share = nodeModeWeights(bank);
  for (let n = 0; n < nN; n++) {
    const wn = share[n] as number;
    if (wn === 0) continue;
    const g = profileAt(table, (bank.grid.nodeElls[n] as number) * thetaRad) * th2;
    if (g === 0) continue;
    const w = wn * g * g;
    for (let i = 0; i < nb; i++) acc[i] += w * (u[n * nb + i] as number);
  }
  const s4 = sigma ** 4 / (bank.nPix * bank.pixelSr * bank.pixelSr);
  return acc.map((a, i) => a * s4 * (meanVariance[i] as number));
}

/** σ(x)/σ at pixel p: sqrt(1 + Σ_i σ²_w,i (g_i(p) − 1)/σ²), floored at 0.05. */
export function localSigmaFactor(shares: Float64Array, sigma: number, model: WhiteNoiseModel, p: number): number {
  let d = 0;
  for (let i = 0; i < shares.length; i++) d += (shares[i] as number) * (((model.varianceRatio[i] as Float64Array)[p] as number) - 1);
  return Math.sqrt(Math.max(1 + d / (sigma * sigma), 0.0025));
}

const shares = new WeakMap<object, Float64Array>();

/** Each node's Hermitian-weighted share of the Fourier modes (linear-interpolation weights). */
function nodeModeWeights(bank: FitBank): Float64Array {
  let w = shares.get(bank.grid);
  if (w !== undefined) return w;
  w = new Float64Array(bank.grid.nNodes);
  const { index, frac } = bank.grid;
  const hw = bank.layout.hermitianWeight;
  for (let m = 0; m < bank.layout.modeCount; m++) {
    const n = index[m] as number;
    const t = frac[m] as number;
    w[n] += (hw[m] as number) * (1 - t);
    w[n + 1] += (hw[m] as number) * t;
  }
  shares.set(bank.grid, w);
  return w;
}
