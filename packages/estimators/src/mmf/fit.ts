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
 *
 * Rings: τ̃, B and the node tables depend on a mode only through its multipole ℓ, so both sums are
 * taken in two steps — first, per ring of modes with the same ℓ (bitwise the same number), the
 * position's phase-weighted data D_u = Σ_{m∈u} h_m Re[W_m e^{+2πi k·x0}] ({@link positionRings}),
 * then b = Σ_u τ̃(ℓ_u θ) D_u and Φ = Σ_u τ̃² Q_u ({@link fitFromRings}). On a square grid of square
 * pixels there are ~5.6× fewer rings than modes, so a fit at a new size of a position whose rings are
 * known costs a small fraction of a pass over the modes (size scans, mass solutions, search re-fits).
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

/** Reusable scratch for repeated fits on one bank (phases along x and y, one position's rings). */
export interface FitScratch {
  readonly ex: Float64Array;
  readonly ey: Float64Array;
  /** Rings of the last position (see {@link positionRings}); grown on demand. */
  rings?: Float64Array;
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

/** The rings of a bank's modes (see the module doc): modes grouped by their multipole. */
export interface EllRings {
  /** Ring of each stored mode. */
  readonly ringOf: Int32Array;
  /** Multipole of each ring, increasing. */
  readonly ell: Float64Array;
  /** Σ of the Hermitian weights of each ring's modes. */
  readonly weight: Float64Array;
}

const ringCache = new WeakMap<Float64Array, EllRings>();

/** The rings of `bank`'s modes: modes with bitwise-equal ℓ share a ring, rings in increasing ℓ (cached per ells array). */
export function ellRings(bank: Pick<FitBank, "ells" | "layout">): EllRings {
  const ells = bank.ells;
  let r = ringCache.get(ells);
  if (r === undefined) {
    // the distinct values in increasing order (a typed-array sort is numeric), then each mode's ring
    // by binary search: several times faster than a Map keyed by the values
    const sorted = Float64Array.from(ells).sort();
    let nU = 0;
    for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) sorted[nU++] = sorted[i] as number;
    const ell = sorted.slice(0, nU);
    const ringOf = new Int32Array(ells.length);
    const weight = new Float64Array(nU);
    const hw = bank.layout.hermitianWeight;
    for (let m = 0; m < ells.length; m++) {
      const l = ells[m] as number;
      let lo = 0;
      let hi = nU - 1;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if ((ell[mid] as number) < l) lo = mid + 1;
        else hi = mid;
      }
      ringOf[m] = lo;
      weight[lo] += hw[m] as number;
    }
    r = { ringOf, ell, weight };
    ringCache.set(ells, r);
  }
  return r;
}

/**
 * Tell {@link ellRings} the rings of `ells` (computed elsewhere, e.g. by the thread that posted the
 * bank): building them costs ~0.65 s at 2048², copying them a few milliseconds.
 */
export function seedEllRings(ells: Float64Array, rings: EllRings): void {
  if (rings.ringOf.length !== ells.length) throw new UmbraError("INTERNAL", `rings for ${rings.ringOf.length} modes given for ${ells.length}`);
  ringCache.set(ells, rings);
}

const fisherRingCache = new WeakMap<Float64Array, Float64Array>();

/**
 * Per ring u, the Fisher weights Q_u,cc' = (Σ_{m∈u} h_m) q_cc'(ℓ_u), q interpolated from the node
 * table `nodeTable` of nc components ({@link sedNodeTable}); nRings × nc × nc, cached per table.
 */
function fisherRings(bank: FitBank, nodeTable: Float64Array, nc: number): Float64Array {
  let q = fisherRingCache.get(nodeTable);
  if (q === undefined) {
    const rings = ellRings(bank);
    const ncc = nc * nc;
    const nU = rings.ell.length;
    q = new Float64Array(nU * ncc);
    const step = bank.grid.step;
    const last = bank.grid.nNodes - 2;
    for (let u = 0; u < nU; u++) {
      // the node and fraction of buildModeGrid (./modeGrid.ts) for this ring's ℓ
      const x = (rings.ell[u] as number) / step;
      const i = Math.min(Math.floor(x), last);
      const t = x - i;
      const w = rings.weight[u] as number;
      for (let c = 0; c < ncc; c++) q[u * ncc + c] = w * ((nodeTable[i * ncc + c] as number) * (1 - t) + (nodeTable[(i + 1) * ncc + c] as number) * t);
    }
    fisherRingCache.set(nodeTable, q);
  }
  return q;
}

/**
 * One position's rings: D[u·nw + j] = Σ_{m∈u} h_m Re[W_j,m e^{+2πi k_m·x0}] for each whitened
 * spectrum W_j (`spectra`: the bank's per band, or per component from {@link combineSeds}) at pixel
 * position (px, py) (0-based, fractional allowed). One pass over the modes; written into `out` when
 * it is long enough (nRings × nw).
 */
export function positionRings(bank: FitBank, spectra: readonly Float64Array[], px: number, py: number, scratch: FitScratch = createFitScratch(bank), out?: Float64Array): Float64Array {
  const { nx, ny } = bank.geometry;
  const { ringOf, ell } = ellRings(bank);
  const nw = spectra.length;
  const size = ell.length * nw;
  const D = out !== undefined && out.length >= size ? out : new Float64Array(size);
  D.fill(0, 0, size);
  const { ex, ey } = scratch;
  // conjugate shift phases: the fit correlates the data with the template centred at (px, py)
  shiftPhases(nx, px, 1, "half", ex);
  shiftPhases(ny, py, 1, "full", ey);
  const { kxIndex, kyIndex, hermitianWeight } = bank.layout;
  for (let j = 0; j < nw; j++) ringSums(kxIndex, kyIndex, hermitianWeight, ringOf, ex, ey, ny, spectra[j] as Float64Array, D, nw, j);
  return D;
}

/** D[ringOf[m]·nw + j] += h_m Re[e_m p_m] over all modes, p the shift phase of (ex, ey). */
function ringSums(kxIndex: Int32Array, kyIndex: Int32Array, hw: Float64Array, ringOf: Int32Array, ex: Float64Array, ey: Float64Array, ny: number, e: Float64Array, D: Float64Array, nw: number, j: number): void {
  const n = ringOf.length;
  for (let m = 0; m < n; m++) {
    const kx = kxIndex[m] as number;
    let ky = kyIndex[m] as number;
    if (ky < 0) ky += ny;
    const xr = ex[2 * kx] as number;
    const xi = ex[2 * kx + 1] as number;
    const yr = ey[2 * ky] as number;
    const yi = ey[2 * ky + 1] as number;
    const pr = xr * yr - xi * yi;
    const pi = xr * yi + xi * yr;
    D[(ringOf[m] as number) * nw + j] += (hw[m] as number) * ((e[2 * m] as number) * pr - (e[2 * m + 1] as number) * pi);
  }
}

/**
 * The fit at profile scale `thetaRad` from a position's rings (`rings` from {@link positionRings}
 * over `combined` when given, else over the bank's whitened spectra); see {@link fitAtPosition}.
 * Costs one pass over the rings, not over the modes.
 */
export function fitFromRings(
  bank: FitBank,
  table: ProfileTable,
  thetaRad: number,
  seds: readonly Float64Array[],
  rings: Float64Array,
  nodeTable: Float64Array = sedNodeTable(bank, seds),
  combined: readonly Float64Array[] | null = null,
): ComponentFit {
  const nc = seds.length;
  const ncc = nc * nc;
  const nw = combined?.length ?? bank.nBands;
  const ellU = ellRings(bank).ell;
  const Q = fisherRings(bank, nodeTable, nc);
  const T = new Float64Array(nw);
  const F = new Float64Array(ncc);
  const theta2 = thetaRad * thetaRad;
  // profileAt inlined: rings come in increasing ℓ, so the first ring past the table ends the sum
  const gt = table.g;
  const du = table.du;
  const last = gt.length - 1;
  if (nw === 1 && ncc === 1) {
    let t0 = 0;
    let f0 = 0;
    for (let u = 0; u < ellU.length; u++) {
      const x = ((ellU[u] as number) * thetaRad) / du;
      const i = Math.floor(x);
      if (i >= last) break;
      const t = x - i;
      const g = ((gt[i] as number) * (1 - t) + (gt[i + 1] as number) * t) * theta2;
      if (g === 0) continue;
      t0 += g * (rings[u] as number);
      f0 += g * g * (Q[u] as number);
    }
    T[0] = t0;
    F[0] = f0;
    return solveComponents(bank, seds, combined, T, F);
  }
  for (let u = 0; u < ellU.length; u++) {
    const g = profileAt(table, (ellU[u] as number) * thetaRad) * theta2;
    if (g === 0) {
      if (Math.floor(((ellU[u] as number) * thetaRad) / du) >= last) break;
      continue;
    }
    for (let j = 0; j < nw; j++) T[j] += g * (rings[u * nw + j] as number);
    const gg = g * g;
    for (let q = 0; q < ncc; q++) F[q] += gg * (Q[u * ncc + q] as number);
  }
  return solveComponents(bank, seds, combined, T, F);
}

/**
 * Fit the components with SEDs `seds` (K_CMB per unit amplitude, one value per band) and the
 * profile `table` of scale `thetaRad` at pixel position (px, py) (0-based, fractional allowed).
 * `combined` ({@link combineSeds} of `seds`) makes the pass over the modes cheaper. Equal to
 * {@link fitFromRings} of {@link positionRings}, number for number.
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
  const rings = positionRings(bank, combined ?? bank.whitened, px, py, scratch, scratch.rings);
  scratch.rings = rings;
  return fitFromRings(bank, table, thetaRad, seds, rings, nodeTable, combined);
}

/**
 * The amplitudes and covariance from the accumulated sums of a fit: T (one per whitened spectrum,
 * or per component with `combined`) and the Fisher sums F (nc × nc). Throws BAD_DATA when the
 * Fisher matrix is singular or a variance is not positive.
 */
function solveComponents(bank: FitBank, seds: readonly Float64Array[], combined: readonly Float64Array[] | null, T: Float64Array, F: Float64Array): ComponentFit {
  const nb = bank.nBands;
  const nc = seds.length;
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
