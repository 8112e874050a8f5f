/**
 * The band-by-band noise + foreground covariance in the flat-sky Fourier plane, binned in ell.
 *
 * Normalisation: the flat-sky angular cross-power of @umbra/maps' `crossPowerBinned` (unnormalised
 * forward FFT, packages/maps/src/fourier/types.ts): for maps m_i with transforms M_i[k],
 *   C_ij(ℓ) = Ω_pix ⟨Re(M_i[k] M_j*[k])⟩_{|k| in bin} / (N_pix · ⟨W²⟩)      (sr · K_CMB²),
 * so white noise of per-pixel variance σ² has C = σ² Ω_pix. ⟨W²⟩ is the mean square of the
 * apodisation window (the usual pseudo-spectrum normalisation; common practice, no source).
 */

/**
 * A binned, beam-deconvolved band covariance C̃_ij(ℓ) (the covariance of the maps divided by their
 * beams in Fourier space) with its quality figures. The covariance of the maps themselves is
 * B_i(ℓ) C̃_ij(ℓ) B_j(ℓ).
 */
export interface BandCovariance {
  /** Number of bands (matrix side). */
  readonly nBands: number;
  /** Bin edges in ell (length nBins + 1). */
  readonly ellEdges: Float64Array;
  /** Mean ell of the modes in each bin (length nBins). */
  readonly ellCentres: Float64Array;
  /** C_ij per bin, row-major nBins × nBands × nBands, sr · K_CMB² (see module doc). */
  readonly values: Float64Array;
  /** Hermitian-weighted number of Fourier modes in each bin (full-plane count). */
  readonly modeCounts: Float64Array;
  /** Condition number (largest / smallest eigenvalue) of each bin's correlation matrix after regularisation. */
  readonly conditionNumbers: Float64Array;
  /** Diagonal loading added to each bin (fraction of each diagonal element; 0 when none was needed). */
  readonly loading: Float64Array;
}
