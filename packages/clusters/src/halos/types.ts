/**
 * The cosmology a halo calculation needs. Any object with these members works (the cluster
 * package's cosmology objects do), so the mass function does not depend on how the background is
 * computed.
 */
export interface HaloCosmology {
  /** Dimensionless Hubble constant, H0 / (100 km/s/Mpc). */
  readonly h: number;
  /** Matter density parameter today (baryons + cold dark matter). */
  readonly omegaM0: number;
  /** Baryon density parameter today. */
  readonly omegaB0: number;
  /** rms linear density fluctuation in spheres of 8 h⁻¹ Mpc at z = 0. */
  readonly sigma8?: number;
  /** Scalar spectral index of the primordial power spectrum. */
  readonly ns?: number;
  /** CMB temperature today in K (defaults to 2.7255 K, Fixsen 2009, ApJ 707, 916). */
  readonly tcmbK?: number;
  /** E(z) = H(z)/H0. */
  efunc(z: number): number;
  /** Line-of-sight comoving distance in Mpc. */
  comovingDistanceMpc(z: number): number;
  /** Critical density at z in M☉/Mpc³. */
  criticalDensityMsunPerMpc3(z: number): number;
}
