/**
 * A spherical pressure profile in the dimensionless form used throughout: x = r/R500 and the
 * pressure in units of the characteristic pressure P500, so the same shape serves every mass
 * and redshift (up to the mass dependence some profiles carry).
 */
export interface PressureProfile {
  /** A short label for reports, e.g. "A10 universal". */
  readonly label: string;
  /** P(r)/P500 at x = r/R500 ≥ 0 (dimensionless). May be infinite at x = 0 for a cusp. */
  pressureRatio(x: number): number;
  /**
   * Power-law index of the central cusp (P ∝ x^−cusp as x → 0); 0 when the centre is finite.
   * Must be < 1 for a finite central Compton y.
   */
  readonly cuspSlope: number;
  /** A string that identifies the shape exactly (for caching Fourier tables). */
  readonly key: string;
}
