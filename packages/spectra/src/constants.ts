/**
 * Physical constants, SI units, CODATA 2018 recommended values (Tiesinga et al. 2021, Rev. Mod.
 * Phys. 93, 025010), and the CMB monopole temperature. Every spectral formula in this package takes
 * its constants from here and nowhere else.
 */

/** Planck constant h [J s]; exact since the 2019 SI redefinition (CODATA 2018). */
export const PLANCK_H_JS = 6.62607015e-34;
/** Boltzmann constant k_B [J/K]; exact (CODATA 2018). */
export const BOLTZMANN_K_JPK = 1.380649e-23;
/** Speed of light in vacuum c [m/s]; exact (CODATA 2018). */
export const SPEED_OF_LIGHT_MPS = 299792458;
/** Elementary charge e [C]; exact (CODATA 2018). Used to express energies in keV. */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
/** Electron rest energy m_e c² [keV] = 0.51099895000 MeV (CODATA 2018). */
export const ELECTRON_REST_ENERGY_KEV = 510.99895;
/** Thomson cross-section σ_T [m²] = 6.6524587321e-29 m² (CODATA 2018). */
export const THOMSON_CROSS_SECTION_M2 = 6.6524587321e-29;

/** CMB monopole temperature T0 [K] = 2.7255 K (Fixsen 2009, ApJ 707, 916). */
export const T0_K = 2.7255;

/** 1 MJy/sr in SI surface brightness units [W m⁻² Hz⁻¹ sr⁻¹] (1 Jy = 1e-26 W m⁻² Hz⁻¹, IAU definition). */
export const MJY_PER_SR_SI = 1e-20;
/** 1 GHz in Hz. */
export const HZ_PER_GHZ = 1e9;

/** Electron temperature in keV → θe = k_B T_e / (m_e c²) (dimensionless). */
export function thetaFromKeV(kTeKeV: number): number {
  return kTeKeV / ELECTRON_REST_ENERGY_KEV;
}
