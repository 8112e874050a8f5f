/**
 * Cosmology parameters and the background-cosmology object. Densities are today's values in units
 * of the critical density; distances in Mpc; times in Gyr; masses in M☉ (IAU nominal).
 */

/** What defines a Friedmann–Lemaître–Robertson–Walker background. */
export interface CosmologyParams {
  /** Hubble constant, km s⁻¹ Mpc⁻¹. */
  H0KmSMpc: number;
  /** Non-relativistic matter today: cold dark matter + baryons (massive neutrinos are separate). */
  omegaM0: number;
  /** Dark energy today. Omit for a flat universe (then 1 − matter − radiation − neutrinos). */
  omegaDE0?: number;
  /** Baryons today (needed only by the mass function; default 0). */
  omegaB0?: number;
  /** Dark-energy equation of state w(a) = w0 + wa (1 − a) (Chevallier & Polarski 2001; Linder 2003). Defaults −1 and 0. */
  w0?: number;
  wa?: number;
  /** CMB temperature today in K; 0 (the default) means no radiation at all. */
  tcmb0K?: number;
  /** Effective number of neutrino species (default 3.046, Mangano et al. 2005, Nucl. Phys. B 729, 221). */
  nEff?: number;
  /** Masses of the massive neutrino species in eV (default none); each massive one replaces one massless species. */
  massiveNuEV?: readonly number[];
  /** Amplitude and tilt of the linear power spectrum, for the mass function (optional). */
  sigma8?: number;
  ns?: number;
  /** A short label for reports. */
  label?: string;
}

/** A background cosmology: parameters plus distance and density functions of redshift. */
export interface Cosmology {
  readonly label: string;
  /** H0 / (100 km s⁻¹ Mpc⁻¹). */
  readonly h: number;
  /** H0 / (70 km s⁻¹ Mpc⁻¹), the h70 of cluster papers. */
  readonly h70: number;
  readonly H0KmSMpc: number;
  readonly omegaM0: number;
  readonly omegaB0: number;
  readonly omegaDE0: number;
  readonly omegaK0: number;
  /** Photons + massless neutrinos today. */
  readonly omegaR0: number;
  /** Photons today. */
  readonly omegaGamma0: number;
  /** All neutrinos today (massless + massive), as astropy's Onu0. */
  readonly omegaNu0: number;
  readonly w0: number;
  readonly wa: number;
  /** CMB temperature today in K (0: no radiation). */
  readonly tcmb0K: number;
  /** CMB temperature when there is radiation (undefined otherwise); for the halo code. */
  readonly tcmbK?: number;
  readonly nEff: number;
  /** Masses of the massive neutrino species, eV. */
  readonly massiveNuEV: readonly number[];
  readonly sigma8?: number;
  readonly ns?: number;
  /** Hubble distance c/H0, Mpc. */
  readonly hubbleDistanceMpc: number;
  /** Hubble time 1/H0, Gyr. */
  readonly hubbleTimeGyr: number;
  /** E(z) = H(z)/H0. */
  efunc(z: number): number;
  /** H(z) in km s⁻¹ Mpc⁻¹. */
  hubbleKmSMpc(z: number): number;
  /** Line-of-sight comoving distance D_C = D_H ∫0^z dz'/E(z'), Mpc. */
  comovingDistanceMpc(z: number): number;
  /** Transverse comoving distance D_M (Hogg 1999, astro-ph/9905116, eq. 16), Mpc. */
  transverseComovingDistanceMpc(z: number): number;
  /** Angular-diameter distance D_A = D_M/(1+z), Mpc. */
  angularDiameterDistanceMpc(z: number): number;
  /** Angular-diameter distance of z2 seen from z1 < z2 (Hogg 1999, eq. 19, any curvature via D_M of the z1–z2 comoving distance), Mpc. */
  angularDiameterDistanceBetweenMpc(z1: number, z2: number): number;
  /** Luminosity distance D_L = (1+z) D_M, Mpc. */
  luminosityDistanceMpc(z: number): number;
  /** Lookback time t_H ∫0^z dz'/((1+z')E(z')), Gyr. */
  lookbackTimeGyr(z: number): number;
  /** Critical density 3H(z)²/(8πG), M☉ Mpc⁻³. */
  criticalDensityMsunPerMpc3(z: number): number;
  /** Ω_m(z) = Ω_m0 (1+z)³ / E(z)². */
  omegaMz(z: number): number;
  /** Comoving volume element dV_C/dz/dΩ = D_H D_M²/E(z) (Hogg 1999, eq. 28), Mpc³ sr⁻¹. */
  differentialComovingVolumeMpc3PerSr(z: number): number;
}
