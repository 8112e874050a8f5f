/**
 * The filter bank: everything the multi-frequency matched filter needs that does not depend on
 * the cluster, computed once per map stack.
 *
 * The filter works in beam-deconvolved band space. With P̃(ℓ) the beam-deconvolved band covariance
 * (../noise/types.ts, divided by the pixel solid angle so that white noise has P̃ = per-pixel
 * variance / B²) and, optionally, SEDs u_k to deproject, the per-node "inverse noise" is
 *   Q = P̃⁻¹ − P̃⁻¹U (Uᵀ P̃⁻¹ U)⁻¹ Uᵀ P̃⁻¹,   U = [u_k]
 * (P̃⁻¹ alone without deprojection). Q is the weight of a generalised least-squares fit with the
 * deprojected components free in every mode, i.e. zero response to them (constrained matched
 * filter; Remazeilles, Delabrouille & Cardoso 2011, MNRAS 410, 2481, eq. 16 in harmonic form;
 * Melin, Bartlett & Delabrouille 2006, A&A 459, 341, eq. 5 for the unconstrained filter). Since
 * P = diag(B) P̃ diag(B), this is the same filter as Ψ ∝ P⁻¹(a∘B)τ̃ written for the maps:
 * (a∘B)ᵀ P⁻¹ M = aᵀ P̃⁻¹ (M/B). The bank stores Q at each node (linearly interpolated per mode,
 * which keeps a common sky component's near-cancellation exact) and the pre-whitened spectra
 * E[k] = Q(ℓ_k) (M[k]/B(ℓ_k)) with the beams evaluated exactly per mode. A cluster fit then
 * needs only sums over modes.
 */
import { Matrix, inverse, CholeskyDecomposition } from "ml-matrix";
import { UmbraError } from "@umbra/core";
import type { FlatGeometry, SpectrumLayout } from "@umbra/maps";
import type { BandCovariance } from "../noise/types.js";
import { deconvolveBeams } from "../noise/estimate.js";
import { buildModeGrid, type ModeGrid } from "./modeGrid.js";

/** A band's beam transfer function B(ℓ) (1 at ℓ = 0). */
export type BeamTransfer = (ells: Float64Array) => Float64Array;

/** Inputs of {@link buildFilterBank}. */
export interface FilterBankInputs {
  readonly layout: SpectrumLayout;
  readonly geometry: FlatGeometry;
  /** Multipole of each stored mode (ellOfModes of @umbra/maps). */
  readonly ells: Float64Array;
  /** Forward transforms of the (apodised) band maps in K_CMB, interleaved re/im, one per band. */
  readonly spectra: readonly Float64Array[];
  /** Beam transfer of each band. */
  readonly beams: readonly BeamTransfer[];
  /** Band covariance P_ij(ℓ) of everything but the clusters. */
  readonly covariance: BandCovariance;
  /** SEDs (K_CMB per unit amplitude, one value per band) to null in every mode; empty for none. */
  readonly deproject?: readonly Float64Array[];
  /** Node spacing in ell (default: 1/8 of the smaller fundamental mode spacing; interpolation leaks ~1e-5 of a deprojected signal at 1/2). */
  readonly nodeStepEll?: number;
}

/** The cluster-independent part of the matched filter (see module doc). */
export interface FilterBank {
  readonly nBands: number;
  readonly layout: SpectrumLayout;
  readonly geometry: FlatGeometry;
  /** nx·ny. */
  readonly nPix: number;
  /** Pixel solid angle dx·dy in sr. */
  readonly pixelSr: number;
  readonly ells: Float64Array;
  readonly grid: ModeGrid;
  /** B_i at each node: nNodes × nBands. */
  readonly beamNodes: Float64Array;
  /** Q (beam-deconvolved inverse noise, see module doc) at each node: nNodes × nBands × nBands. */
  readonly qNodes: Float64Array;
  /** Pre-whitened spectra E = Q (M/B), one per band. */
  readonly whitened: readonly Float64Array[];
  /** Number of deprojected SEDs. */
  readonly nDeprojected: number;
  /** The covariance, beams and deprojected SEDs the bank was built from (for rebuilding). */
  readonly covariance: BandCovariance;
  readonly beams: readonly BeamTransfer[];
  readonly deproject: readonly Float64Array[];
}

/**
 * Linear interpolation of the binned beam-deconvolved covariance onto ell (clamped to the end
 * bins), converted to the per-pixel convention by `scale` = 1/Ω_pix. Entry-wise linear
 * interpolation keeps "common component C(ℓ)·aaᵀ + noise" exactly of that form.
 */
function covarianceAt(cov: BandCovariance, ell: number, scale: number, out: Float64Array): void {
  const c = cov.ellCentres;
  const nb2 = cov.nBands * cov.nBands;
  const nBins = c.length;
  let lo = 0;
  let t = 0;
  if (ell >= (c[nBins - 1] as number)) {
    lo = nBins - 1;
  } else if (ell > (c[0] as number)) {
    let a = 0;
    let b = nBins - 1;
    while (b - a > 1) {
      const mid = (a + b) >> 1;
      if ((c[mid] as number) <= ell) a = mid;
      else b = mid;
    }
    lo = a;
    t = (ell - (c[a] as number)) / ((c[a + 1] as number) - (c[a] as number));
  }
  const v = cov.values;
  for (let q = 0; q < nb2; q++) {
    const p0 = v[lo * nb2 + q] as number;
    out[q] = scale * (t === 0 ? p0 : p0 * (1 - t) + (v[(lo + 1) * nb2 + q] as number) * t);
  }
}

/** Q = P̃⁻¹ − P̃⁻¹U(UᵀP̃⁻¹U)⁻¹UᵀP̃⁻¹ for one node (see module doc). */
function inverseNoise(p: Float64Array, nb: number, u: Matrix | null, ell: number): Matrix {
  const P = new Matrix(nb, nb);
  for (let i = 0; i < nb; i++) {
    for (let j = 0; j <= i; j++) {
      const v = 0.5 * ((p[i * nb + j] as number) + (p[j * nb + i] as number));
      if (!Number.isFinite(v)) throw new UmbraError("BAD_DATA", `band covariance is not finite at ell = ${ell.toFixed(1)} (bands ${i}, ${j})`);
      P.set(i, j, v);
      P.set(j, i, v);
    }
  }
  const chol = new CholeskyDecomposition(P);
  if (!chol.isPositiveDefinite()) {
    throw new UmbraError("BAD_DATA", `band covariance is not positive definite at ell = ${ell.toFixed(1)}`);
  }
  const Pinv = chol.solve(Matrix.eye(nb, nb));
  if (u === null) return Pinv;
  const PiU = Pinv.mmul(u);
  const UtPiU = u.transpose().mmul(PiU);
  let G: Matrix;
  try {
    G = inverse(UtPiU);
  } catch {
    throw new UmbraError("BAD_DATA", `deprojected SEDs are degenerate at ell = ${ell.toFixed(1)} (fewer bands than constraints, or collinear SEDs)`);
  }
  return Pinv.sub(PiU.mmul(G).mmul(PiU.transpose()));
}

/** Build the {@link FilterBank} (see module doc). Throws BAD_DATA when P is not positive definite. */
export function buildFilterBank(inp: FilterBankInputs): FilterBank {
  const nb = inp.spectra.length;
  const { layout, geometry } = inp;
  if (nb === 0) throw new UmbraError("BAD_DATA", "no bands to filter");
  if (inp.beams.length !== nb) throw new UmbraError("INTERNAL", `${inp.beams.length} beams for ${nb} bands`);
  if (inp.covariance.nBands !== nb) throw new UmbraError("INTERNAL", `covariance has ${inp.covariance.nBands} bands, stack has ${nb}`);
  if (inp.ells.length !== layout.modeCount) throw new UmbraError("INTERNAL", `ells has ${inp.ells.length} modes, layout ${layout.modeCount}`);
  const deproject = inp.deproject ?? [];
  if (deproject.length >= nb) {
    throw new UmbraError("BAD_OPTION", `cannot deproject ${deproject.length} SEDs with ${nb} bands: at least one band must be left for the cluster`);
  }
  for (const s of inp.spectra) if (s.length !== layout.spectrumLength) throw new UmbraError("INTERNAL", "spectrum length disagrees with layout");
  const fundamental = Math.min((2 * Math.PI) / (geometry.nx * geometry.dxRad), (2 * Math.PI) / (geometry.ny * geometry.dyRad));
  const step = inp.nodeStepEll ?? fundamental / 8;
  const grid = buildModeGrid(inp.ells, step);
  const nN = grid.nNodes;
  const beamNodes = new Float64Array(nN * nb);
  for (let i = 0; i < nb; i++) {
    const b = (inp.beams[i] as BeamTransfer)(grid.nodeElls);
    for (let n = 0; n < nN; n++) beamNodes[n * nb + i] = b[n] as number;
  }
  const qNodes = new Float64Array(nN * nb * nb);
  const p = new Float64Array(nb * nb);
  let U: Matrix | null = null;
  if (deproject.length > 0) {
    U = new Matrix(nb, deproject.length);
    for (let k = 0; k < deproject.length; k++) for (let i = 0; i < nb; i++) U.set(i, k, (deproject[k] as Float64Array)[i] as number);
  }
  const scale = 1 / (geometry.dxRad * geometry.dyRad);
  for (let n = 0; n < nN; n++) {
    const ell = grid.nodeElls[n] as number;
    covarianceAt(inp.covariance, ell, scale, p);
    const Q = inverseNoise(p, nb, U, ell);
    for (let i = 0; i < nb; i++) for (let j = 0; j < nb; j++) qNodes[(n * nb + i) * nb + j] = Q.get(i, j);
  }
  const whitened = whitenWith(qNodes, grid, nb, layout.modeCount, deconvolveBeams(inp.spectra, inp.beams, inp.ells));
  return {
    nBands: nb,
    layout,
    geometry,
    nPix: geometry.nx * geometry.ny,
    pixelSr: geometry.dxRad * geometry.dyRad,
    ells: inp.ells,
    grid,
    beamNodes,
    qNodes,
    whitened,
    nDeprojected: deproject.length,
    covariance: inp.covariance,
    beams: inp.beams,
    deproject,
  };
}

/** E = Q(ℓ)·S per mode, in place on the deconvolved spectra `s` (Q interpolated between nodes). */
function whitenWith(qNodes: Float64Array, grid: ModeGrid, nb: number, nm: number, s: Float64Array[]): Float64Array[] {
  const re = new Float64Array(nb);
  const im = new Float64Array(nb);
  const nb2 = nb * nb;
  for (let m = 0; m < nm; m++) {
    for (let i = 0; i < nb; i++) {
      const x = s[i] as Float64Array;
      re[i] = x[2 * m] as number;
      im[i] = x[2 * m + 1] as number;
    }
    const o0 = (grid.index[m] as number) * nb2;
    const o1 = o0 + nb2;
    const t = grid.frac[m] as number;
    for (let i = 0; i < nb; i++) {
      let ar = 0;
      let ai = 0;
      for (let j = 0; j < nb; j++) {
        const q = i * nb + j;
        const k = (qNodes[o0 + q] as number) * (1 - t) + (qNodes[o1 + q] as number) * t;
        ar += k * (re[j] as number);
        ai += k * (im[j] as number);
      }
      const w = s[i] as Float64Array;
      w[2 * m] = ar;
      w[2 * m + 1] = ai;
    }
  }
  return s;
}

/**
 * The same bank applied to other data: pre-whitened spectra of `spectra` (same layout, K_CMB),
 * e.g. the data minus a model of the clusters. The filter weights are unchanged.
 */
export function rewhitenBank(bank: FilterBank, spectra: readonly Float64Array[]): FilterBank {
  const w = whitenWith(bank.qNodes, bank.grid, bank.nBands, bank.layout.modeCount, deconvolveBeams(spectra, bank.beams, bank.ells));
  return { ...bank, whitened: w };
}
