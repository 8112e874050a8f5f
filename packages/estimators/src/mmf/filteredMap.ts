/**
 * The single-component matched filter applied to the whole map at one profile size: the map of
 * the fitted central amplitude ŷ(x) at every pixel and its (position-independent) error σ.
 * Same estimator as ./fit.ts with one SED column a:
 *   ŷ(x) = σ² · IFFT[ τ̃(ℓ) Σ_j a_j E_j / Ω_pix ](x),   σ⁻² = (1/(N_pix Ω_pix²)) Σ_k τ̃² aᵀQa
 * (Melin, Bartlett & Delabrouille 2006, A&A 459, 341, eqs. 4–6), with the inverse FFT's 1/N_pix of
 * packages/maps/src/fourier/types.ts.
 */
import { UmbraError } from "@umbra/core";
import type { Rfft2Plan } from "@umbra/maps";
import type { FilterBank } from "./bank.js";
import type { FitBank } from "./fit.js";
import { profileAt, type ProfileTable } from "./profile.js";
import { sedNodeTable } from "./fit.js";

/** D[k] = Σ_j a_j E_j[k]: the pre-whitened spectra combined with one SED (K_CMB per unit amplitude). */
export function combineWhitened(bank: FilterBank, sed: Float64Array): Float64Array {
  const out = new Float64Array(bank.layout.spectrumLength);
  for (let j = 0; j < bank.nBands; j++) {
    const a = sed[j] as number;
    if (a === 0) continue;
    const e = bank.whitened[j] as Float64Array;
    for (let q = 0; q < out.length; q++) out[q] += a * (e[q] as number);
  }
  return out;
}

/** A single-SED filter ready to apply at many sizes. */
export interface SedFilter {
  readonly sed: Float64Array;
  /** Combined whitened spectrum D. */
  readonly combined: Float64Array;
  /** aᵀQa at each node. */
  readonly nodeTable: Float64Array;
}

/** Prepare {@link SedFilter} for `sed`. */
export function prepareSedFilter(bank: FilterBank, sed: Float64Array): SedFilter {
  return { sed, combined: combineWhitened(bank, sed), nodeTable: sedNodeTable(bank, [sed]) };
}

/** σ of the central amplitude for profile scale `thetaRad` (units of the SED's amplitude). */
export function filterSigma(bank: FitBank, table: ProfileTable, thetaRad: number, filter: SedFilter): number {
  const { hermitianWeight, modeCount } = bank.layout;
  const { index, frac } = bank.grid;
  const theta2 = thetaRad * thetaRad;
  let phi = 0;
  for (let m = 0; m < modeCount; m++) {
    const g = profileAt(table, (bank.ells[m] as number) * thetaRad) * theta2;
    if (g === 0) continue;
    const n = index[m] as number;
    const t = frac[m] as number;
    phi += (hermitianWeight[m] as number) * g * g * ((filter.nodeTable[n] as number) * (1 - t) + (filter.nodeTable[n + 1] as number) * t);
  }
  phi /= bank.nPix * bank.pixelSr * bank.pixelSr;
  if (!(phi > 0)) throw new UmbraError("BAD_DATA", "matched filter has no response to the cluster SED (fully deprojected or zero beam)");
  return 1 / Math.sqrt(phi);
}

/**
 * Fill `out` (nx·ny) with ŷ(x) for scale `thetaRad`; returns σ. `scratch` is a spectrum-sized buffer.
 */
export function filteredMap(
  bank: FitBank,
  plan: Rfft2Plan,
  table: ProfileTable,
  thetaRad: number,
  filter: SedFilter,
  out: Float64Array,
  scratch: Float64Array = new Float64Array(bank.layout.spectrumLength),
): number {
  const sigma = filterSigma(bank, table, thetaRad, filter);
  const s2 = sigma * sigma;
  const theta2 = thetaRad * thetaRad;
  const d = filter.combined;
  const f = s2 / bank.pixelSr;
  for (let m = 0; m < bank.layout.modeCount; m++) {
    const g = profileAt(table, (bank.ells[m] as number) * thetaRad) * theta2 * f;
    scratch[2 * m] = g * (d[2 * m] as number);
    scratch[2 * m + 1] = g * (d[2 * m + 1] as number);
  }
  plan.inverse(scratch, out);
  return sigma;
}
