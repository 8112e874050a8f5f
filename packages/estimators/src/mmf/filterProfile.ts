/**
 * The matched filter's radial profile in ℓ, per band: what each band contributes at each scale.
 * In the maps' own (beam-convolved) space the filter is Ψ_i(ℓ) = σ² [P⁻¹ (a∘B)]_i τ̃(ℓ) =
 * σ² (Q a)_i τ̃(ℓ) / B_i(ℓ) (Q the beam-deconvolved inverse noise of ./bank.ts; Melin, Bartlett &
 * Delabrouille 2006, A&A 459, 341, eq. 5). Returned on the bank's ℓ nodes, thinned, normalised so
 * the largest |Ψ| over bands and ℓ is 1 (the shape is what a plot needs; σ is given separately).
 */
import type { FilterBank } from "./bank.js";
import { profileAt, type ProfileTable } from "./profile.js";

/** Per-band filter weights on an ℓ grid (normalised, see module doc). */
export interface FilterRadialProfile {
  thetaArcmin: number;
  ell: number[];
  /** weights[band][k] at ell[k]. */
  weights: number[][];
}

/**
 * Ψ_i(ℓ) for profile scale `thetaRad` and tSZ SED `sed` (K_CMB per y, one per band), at up to
 * `points` nodes from the fundamental mode to where the beam-convolved template has fallen below
 * 1e-4 of its peak (or the grid ends).
 */
export function filterRadialProfile(bank: FilterBank, table: ProfileTable, thetaRad: number, sed: Float64Array, points = 200): FilterRadialProfile {
  const nb = bank.nBands;
  const { nodeElls, nNodes } = bank.grid;
  const qa = new Float64Array(nb);
  const raw: { ell: number; w: Float64Array }[] = [];
  const g0 = profileAt(table, 0);
  let last = nNodes - 1;
  for (let n = 1; n < nNodes; n++) {
    const g = profileAt(table, (nodeElls[n] as number) * thetaRad);
    let maxB = 0;
    for (let i = 0; i < nb; i++) maxB = Math.max(maxB, bank.beamNodes[n * nb + i] as number);
    if (Math.abs(g) * maxB < 1e-4 * Math.abs(g0)) {
      last = n;
      break;
    }
  }
  const stride = Math.max(1, Math.floor(last / points));
  let peak = 0;
  for (let n = 1; n <= last; n += stride) {
    const g = profileAt(table, (nodeElls[n] as number) * thetaRad);
    qa.fill(0);
    for (let i = 0; i < nb; i++) for (let j = 0; j < nb; j++) qa[i] = (qa[i] as number) + (bank.qNodes[(n * nb + i) * nb + j] as number) * (sed[j] as number);
    const w = new Float64Array(nb);
    for (let i = 0; i < nb; i++) {
      const b = bank.beamNodes[n * nb + i] as number;
      w[i] = b > 1e-8 ? ((qa[i] as number) * g) / b : 0;
      peak = Math.max(peak, Math.abs(w[i] as number));
    }
    raw.push({ ell: nodeElls[n] as number, w });
  }
  const scale = peak > 0 ? 1 / peak : 0;
  return {
    thetaArcmin: (thetaRad * 180 * 60) / Math.PI,
    ell: raw.map((r) => r.ell),
    weights: Array.from({ length: nb }, (_, i) => raw.map((r) => (r.w[i] as number) * scale)),
  };
}
