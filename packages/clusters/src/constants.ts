/**
 * Constants used by the cluster models, each with its source. SI unless the name says otherwise.
 * The microphysical CODATA 2018 constants (c, k_B, e, σ_T, m_e c², T0) come from the one constants
 * module of `@umbra/spectra`; this module adds the gravitational and astronomical ones with the
 * values astropy 5.2.1 uses (CODATA 2018 and IAU 2015 B3), so distance and density comparisons
 * against it are exact to the last digit of the constants.
 */
import {
  BOLTZMANN_K_JPK,
  ELECTRON_REST_ENERGY_KEV,
  ELEMENTARY_CHARGE_C,
  SPEED_OF_LIGHT_MPS,
  T0_K,
  THOMSON_CROSS_SECTION_M2,
} from "@umbra/spectra";

/** Speed of light in vacuum, m/s (exact; CODATA 2018, Tiesinga et al. 2021, RMP 93, 025010). */
export const C_M_PER_S = SPEED_OF_LIGHT_MPS;
/** Speed of light in km/s. */
export const C_KM_PER_S = C_M_PER_S / 1000;
/** Newtonian constant of gravitation, m³ kg⁻¹ s⁻² (CODATA 2018). */
export const G_SI = 6.6743e-11;
/** Stefan–Boltzmann constant, W m⁻² K⁻⁴ (CODATA 2018, derived from exact h, k, c). */
export const SIGMA_SB_SI = 5.6703744191844314e-8;
/** Boltzmann constant in eV/K (exact in SI 2019: k / e). */
export const K_B_EV_PER_K = BOLTZMANN_K_JPK / ELEMENTARY_CHARGE_C;
/** Thomson cross-section, m² (CODATA 2018). */
export const SIGMA_T_M2 = THOMSON_CROSS_SECTION_M2;
/** Electron rest energy m_e c², keV (CODATA 2018). */
export const ME_C2_KEV = ELECTRON_REST_ENERGY_KEV;
/** Nominal solar mass, kg: IAU 2015 Resolution B3 nominal GM☉ = 1.3271244e20 m³/s² divided by CODATA 2018 G. */
export const MSUN_KG = 1.988409870698051e30;
/** Megaparsec in metres: 1 pc = 648000/π au, au = 149597870700 m (IAU 2012 B2, IAU 2015 B2). */
export const MPC_M = 3.085677581491367e22;
/** Megaparsec in centimetres. */
export const MPC_CM = MPC_M * 100;
/** Seconds in a gigayear of Julian years (365.25 d; IAU). */
export const GYR_S = 3.15576e16;
/**
 * 7/8 · (4/11)^(4/3): energy density of one massless neutrino species relative to photons
 * (e.g. Komatsu et al. 2011, ApJS 192, 18, eq. 26 context); the same digits as astropy.
 */
export const NU_PER_PHOTON = 0.22710731766;
/** T_ν/T_γ = (4/11)^(1/3) after e± annihilation (e.g. Weinberg 2008, Cosmology, eq. 3.1.21). */
export const TNU_PER_TCMB = 0.7137658555036082;
/** CMB temperature today, K (Fixsen 2009, ApJ 707, 916). */
export const TCMB0_K = T0_K;
