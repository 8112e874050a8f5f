/**
 * The multi-frequency matched filter evaluated at one sky position: a generalised least-squares
 * fit of nc components that share one projected profile τ but have their own SEDs (columns of A).
 *
 * Model: M_i[k] = Σ_c a_c A_ic B_i(ℓ) τ̃(ℓ; θs) e^{−2πi k·x0} / Ω_pix + N_i[k]
 * (discrete transform of the pixel-sampled template). With Π the bank's inverse noise,
 *   Φ_cc' = (1/(N_pix Ω_pix²)) Σ_k τ̃² (A_c∘B)ᵀ Π (A_c'∘B)          (Fisher matrix)
 *   b_c   = (1/(N_pix Ω_pix))  Σ_k τ̃ Re[(A_c∘B)ᵀ Π M[k] e^{+2πi k·x0}]
 *   â = Φ⁻¹ b,   Cov(â) = Φ⁻¹.
 * For one component this is the matched multi-frequency filter of Herranz et al. 2002 (MNRAS 336,
 * 1057, eqs. 9–11) and Melin, Bartlett & Delabrouille 2006 (A&A 459, 341, eqs. 4–6):
 * Ψ = σ² P⁻¹F, σ⁻² = Σ Fᵀ P⁻¹ F, here written in the unnormalised-FFT convention of
 * packages/maps/src/fourier/types.ts (derivation in docs/matched-filter.md).
 * Sums run over the full Fourier plane through the stored half plane and its Hermitian weights.
 */
import { Matrix, inverse } from "ml-matrix";
import { UmbraError } from "@umbra/core";
import { shiftPhases } from "@umbra/maps";
import type { FilterBank } from "./bank.js";
import { profileAt, type ProfileTable } from "./profile.js";

/** Result of {@link fitAtPosition}. */
export interface ComponentFit {
  /** Amplitude of each component (y0 for tSZ: the unconvolved central Compton y). */
  readonly amplitudes: Float64Array;
  /** Covariance of the amplitudes, nc × nc row-major. */
  readonly covariance: Float64Array;
}

/** Reusable scratch for repeated fits on one bank (phases along x and y). */
export interface FitScratch {
  readonly ex: Float64Array;
  readonly ey: Float64Array;
}

/**
 * The parts of a {@link FilterBank} that fits and filtered maps read (what a worker thread
 * receives: arrays only, no beam functions).
 */
export type FitBank = Pick<FilterBank, "nBands" | "geometry" | "layout" | "grid" | "ells" | "nPix" | "pixelSr" | "whitened" | "qNodes" | "beamNodes">;

/** Allocate the scratch arrays for {@link fitAtPosition} on `bank`. */
export function createFitScratch(bank: Pick<FitBank, "geometry">): FitScratch {
  return { ex: new Float64Array(2 * bank.geometry.nx), ey: new Float64Array(2 * bank.geometry.ny) };
}

/**
 * Fisher-matrix node table for the SED matrix `seds` (nc columns of nBands values):
 * q_cc'(node) = Σ_ij A_ic Q_ij A_jc'. Returns nNodes × nc × nc.
 */
export function sedNodeTable(bank: Pick<FilterBank, "nBands" | "grid" | "qNodes">, seds: readonly Float64Array[]): Float64Array {
  const nb = bank.nBands;
  const nc = seds.length;
  const nN = bank.grid.nNodes;
  const out = new Float64Array(nN * nc * nc);
  for (let n = 0; n < nN; n++) {
    const o = n * nb * nb;
    for (let c = 0; c < nc; c++) {
      const a = seds[c] as Float64Array;
      for (let d = c; d < nc; d++) {
        const b = seds[d] as Float64Array;
        let s = 0;
        for (let i = 0; i < nb; i++) {
          const ai = a[i] as number;
          if (ai === 0) continue;
          for (let j = 0; j < nb; j++) s += ai * (bank.qNodes[o + i * nb + j] as number) * (b[j] as number);
        }
        out[(n * nc + c) * nc + d] = s;
        out[(n * nc + d) * nc + c] = s;
      }
    }
  }
  return out;
}

/**
 * Fit the components with SEDs `seds` (K_CMB per unit amplitude, one value per band) and the
 * profile `table` of scale `thetaRad` at pixel position (px, py) (0-based, fractional allowed).
 * Throws BAD_DATA when the Fisher matrix is singular (e.g. a component fully deprojected).
 */
export function fitAtPosition(
  bank: FitBank,
  table: ProfileTable,
  thetaRad: number,
  seds: readonly Float64Array[],
  px: number,
  py: number,
  scratch: FitScratch = createFitScratch(bank),
  nodeTable: Float64Array = sedNodeTable(bank, seds),
  combined: readonly Float64Array[] | null = null,
): ComponentFit {
  const nb = bank.nBands;
  const nc = seds.length;
  const { nx, ny } = bank.geometry;
  const { kxIndex, kyIndex, hermitianWeight, modeCount } = bank.layout;
  const { ex, ey } = scratch;
  // conjugate shift phases: the fit correlates the data with the template centred at (px, py)
  shiftPhases(nx, px, 1, "half", ex);
  shiftPhases(ny, py, 1, "full", ey);
  // with `combined` (D_c = Σ_j A_jc E_j per component, see combineSeds) the sum runs over
  // components instead of bands
  const W = combined ?? bank.whitened;
  const nw = W.length;
  const T = new Float64Array(nw);
  const F = new Float64Array(nc * nc);
  const theta2 = thetaRad * thetaRad;
  const { index, frac } = bank.grid;
  const ells = bank.ells;
  const ncc = nc * nc;
  // one component: the Fisher weight aᵀQa per mode, interpolated once per node table
  const qMode = nc === 1 ? perModeTable(bank, nodeTable) : null;
  for (let m = 0; m < modeCount; m++) {
    const g = profileAt(table, (ells[m] as number) * thetaRad) * theta2;
    if (g === 0) continue;
    const w = (hermitianWeight[m] as number) * g;
    const kx = kxIndex[m] as number;
    let ky = kyIndex[m] as number;
    if (ky < 0) ky += ny;
    const xr = ex[2 * kx] as number;
    const xi = ex[2 * kx + 1] as number;
    const yr = ey[2 * ky] as number;
    const yi = ey[2 * ky + 1] as number;
    const pr = xr * yr - xi * yi;
    const pi = xr * yi + xi * yr;
    for (let j = 0; j < nw; j++) {
      const e = W[j] as Float64Array;
      T[j] += w * ((e[2 * m] as number) * pr - (e[2 * m + 1] as number) * pi);
    }
    const wg = w * g;
    if (qMode !== null) {
      F[0] += wg * (qMode[m] as number);
      continue;
    }
    const n0 = (index[m] as number) * ncc;
    const t = frac[m] as number;
    for (let q = 0; q < ncc; q++) F[q] += wg * ((nodeTable[n0 + q] as number) * (1 - t) + (nodeTable[n0 + ncc + q] as number) * t);
  }
  const norm = 1 / (bank.nPix * bank.pixelSr);
  const b = new Float64Array(nc);
  for (let c = 0; c < nc; c++) {
    if (combined !== null) {
      b[c] = (T[c] as number) * norm;
      continue;
    }
    const a = seds[c] as Float64Array;
    let s = 0;
    for (let j = 0; j < nb; j++) s += (a[j] as number) * (T[j] as number);
    b[c] = s * norm;
  }
  const fisher = new Matrix(nc, nc);
  for (let c = 0; c < nc; c++) for (let d = 0; d < nc; d++) fisher.set(c, d, (F[c * nc + d] as number) * norm / bank.pixelSr);
  let cov: Matrix;
  try {
    cov = inverse(fisher);
  } catch {
    throw new UmbraError("BAD_DATA", "matched-filter Fisher matrix is singular (a fitted component is deprojected or has no signal)");
  }
  const amplitudes = new Float64Array(nc);
  const covariance = new Float64Array(nc * nc);
  for (let c = 0; c < nc; c++) {
    let s = 0;
    for (let d = 0; d < nc; d++) {
      s += cov.get(c, d) * (b[d] as number);
      covariance[c * nc + d] = cov.get(c, d);
    }
    amplitudes[c] = s;
    if (!(cov.get(c, c) > 0)) throw new UmbraError("BAD_DATA", `matched-filter variance of component ${c} is not positive`);
  }
  return { amplitudes, covariance };
}

/** D_c = Σ_j A_jc E_j for each component: the whitened spectra combined per SED (for the fast path of fitAtPosition). */
export function combineSeds(bank: FilterBank, seds: readonly Float64Array[]): Float64Array[] {
  return seds.map((a) => {
    const out = new Float64Array(bank.layout.spectrumLength);
    for (let j = 0; j < bank.nBands; j++) {
      const aj = a[j] as number;
      if (aj === 0) continue;
      const e = bank.whitened[j] as Float64Array;
      for (let q = 0; q < out.length; q++) out[q] += aj * (e[q] as number);
    }
    return out;
  });
}

const perMode = new WeakMap<Float64Array, Float64Array>();

/** A one-component node table interpolated to every mode (cached per table). */
function perModeTable(bank: FitBank, nodeTable: Float64Array): Float64Array {
  let q = perMode.get(nodeTable);
  if (q === undefined) {
    q = new Float64Array(bank.layout.modeCount);
    const { index, frac } = bank.grid;
    for (let m = 0; m < q.length; m++) {
      const n = index[m] as number;
      const t = frac[m] as number;
      q[m] = (nodeTable[n] as number) * (1 - t) + (nodeTable[n + 1] as number) * t;
    }
    perMode.set(nodeTable, q);
  }
  return q;
}
